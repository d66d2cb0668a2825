package io.densa.core.internal;

import java.util.Arrays;
import java.util.stream.IntStream;

/**
 * Dense row-major kernels shared by the Densa modules. Not part of the public API: signatures
 * may change between releases.
 *
 * <p>All kernels follow {@code (inputs, out) -> out}; inputs are not modified. Parallel kernels
 * split rows into fixed blocks of {@link #BLOCK} rows, compute each block's partial result
 * independently and combine partials in block order, so results are bit-identical whatever the
 * number of threads (and equal to the serial path, which uses the same blocks).
 *
 * <p>Speed: innermost loops are unit-stride over a
 * {@code double[]} so that the JIT vectorises them; outer loops are blocked so that each output
 * element is loaded and stored once per eight inputs ({@link #multiplyRows},
 * {@link #crossProduct}).
 */
public final class Kernels {
    /** Rows per block in blocked kernels. */
    public static final int BLOCK = 4096;
    private static final long PARALLEL_WORK = 1L << 18;

    private Kernels() {
    }

    /** Whether work of this size is worth the common pool. */
    public static boolean parallelWorth(long flops) {
        return flops >= PARALLEL_WORK;
    }

    /**
     * Runs body(block) for block = 0..blocks−1, in parallel on the common pool when
     * {@code parallel}; each block must write only its own outputs.
     */
    public static void forEachBlock(int blocks, boolean parallel, java.util.function.IntConsumer body) {
        if (parallel && blocks > 1) {
            IntStream.range(0, blocks).parallel().forEach(body);
        } else {
            for (int i = 0; i < blocks; i++) {
                body.accept(i);
            }
        }
    }

    /** Rows per parallel block in {@link #multiply}. */
    private static final int MULT_ROWS = 32;
    /** Output columns per tile: a k × TILE slice of B stays in the L1 cache while a row block uses it. */
    private static final int TILE = 256;

    /**
     * out (n × m) = A (n × k) · B where B is given row-major k × m (row j = j-th row of B).
     * Rows of the output are independent and each is summed in a fixed order, so the result does
     * not depend on parallelism.
     *
     * @param out n·m array, overwritten (must not alias a or b)
     */
    public static void multiply(double[] a, int n, int k, double[] b, int m, double[] out, boolean parallel) {
        int blocks = (n + MULT_ROWS - 1) / MULT_ROWS;
        forEachBlock(blocks, parallel && parallelWorth(2L * n * k * m), blk -> {
            int r0 = blk * MULT_ROWS, r1 = Math.min(n, r0 + MULT_ROWS);
            multiplyRows(a, r0 * k, r1 - r0, k, b, m, out, r0 * m);
        });
    }

    /**
     * Serial kernel: out[outOff + i·m + q] = Σ_j a[aOff + i·k + j] b[j·m + q] for i &lt; rows. Output
     * columns are tiled so that the slice of B in use stays in cache, and eight rows of B are
     * combined per pass so that each output element is loaded and stored k/8 times; the innermost
     * loop is unit-stride over the tile (auto-vectorised by C2).
     */
    public static void multiplyRows(double[] a, int aOff, int rows, int k, double[] b, int m, double[] out,
            int outOff) {
        for (int q0 = 0; q0 < m; q0 += TILE) {
            int q1 = Math.min(m, q0 + TILE);
            for (int i = 0; i < rows; i++) {
                int ai = aOff + i * k;
                int o = outOff + i * m;
                Arrays.fill(out, o + q0, o + q1, 0.0);
                int j = 0;
                for (; j + 8 <= k; j += 8) {
                    double c0 = a[ai + j], c1 = a[ai + j + 1], c2 = a[ai + j + 2], c3 = a[ai + j + 3];
                    double c4 = a[ai + j + 4], c5 = a[ai + j + 5], c6 = a[ai + j + 6], c7 = a[ai + j + 7];
                    int b0 = j * m, b1 = b0 + m, b2 = b1 + m, b3 = b2 + m, b4 = b3 + m, b5 = b4 + m, b6 = b5 + m,
                            b7 = b6 + m;
                    for (int q = q0; q < q1; q++) {
                        out[o + q] += c0 * b[b0 + q] + c1 * b[b1 + q] + c2 * b[b2 + q] + c3 * b[b3 + q]
                                + c4 * b[b4 + q] + c5 * b[b5 + q] + c6 * b[b6 + q] + c7 * b[b7 + q];
                    }
                }
                for (; j + 4 <= k; j += 4) {
                    double c0 = a[ai + j], c1 = a[ai + j + 1], c2 = a[ai + j + 2], c3 = a[ai + j + 3];
                    int b0 = j * m, b1 = b0 + m, b2 = b1 + m, b3 = b2 + m;
                    for (int q = q0; q < q1; q++) {
                        out[o + q] += c0 * b[b0 + q] + c1 * b[b1 + q] + c2 * b[b2 + q] + c3 * b[b3 + q];
                    }
                }
                for (; j < k; j++) {
                    double c0 = a[ai + j];
                    int b0 = j * m;
                    for (int q = q0; q < q1; q++) {
                        out[o + q] += c0 * b[b0 + q];
                    }
                }
            }
        }
    }

    /**
     * Gram matrix out (n × n) = A Aᵀ of the rows of A (n × k): A is transposed once so that the
     * product runs through {@link #multiply}; exactly symmetric (both triangles use the same sums).
     *
     * @param out n·n array, overwritten
     */
    public static void gram(double[] a, int n, int k, double[] out, boolean parallel) {
        double[] at = new double[k * n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                at[j * n + i] = a[i * k + j];
            }
        }
        multiply(a, n, k, at, n, out, parallel);
    }

    /**
     * Column sums of A (n × k), summed in fixed blocks of {@link #BLOCK} rows combined in order.
     *
     * @return a fresh k-vector
     */
    public static double[] columnSums(double[] a, int n, int k, boolean parallel) {
        return columnSumsOfRows(a, k, null, 0, n, null, parallel);
    }

    /**
     * out = A − 1 vᵀ (subtract v from every row).
     *
     * @param out n·k array, may be a fresh array (not a)
     */
    public static void subtractRow(double[] a, int n, int k, double[] v, double[] out, boolean parallel) {
        int blocks = (n + BLOCK - 1) / BLOCK;
        forEachBlock(blocks, parallel && parallelWorth((long) n * k), blk -> {
            int r0 = blk * BLOCK, r1 = Math.min(n, r0 + BLOCK);
            for (int i = r0; i < r1; i++) {
                int o = i * k;
                for (int j = 0; j < k; j++) {
                    out[o + j] = a[o + j] - v[j];
                }
            }
        });
    }

    /**
     * Cross-product matrix Σ_i (a_i − c)(a_i − c)ᵀ (k × k, row-major, symmetric) of the rows of A
     * about a centre c (null for none), in fixed blocks of {@link #BLOCK} rows combined in order.
     * Within a block eight (centred) rows are folded into the matrix per pass, so each entry is
     * loaded and stored once per eight rows; the innermost loop runs unit-stride over the upper
     * part (l ≥ j) of a row, and the lower triangle is a copy of the upper, so the result is
     * exactly symmetric.
     */
    public static double[] crossProduct(double[] a, int n, int k, double[] center, boolean parallel) {
        return crossProductOfRows(a, k, null, 0, n, center, parallel);
    }

    /**
     * As {@link #crossProduct}, over the rows {@code rows[from..to)} of A (k columns) in that order
     * ({@code rows == null}: the rows from..to−1 themselves), in fixed blocks of {@link #BLOCK}
     * indices combined in order.
     */
    public static double[] crossProductOfRows(double[] a, int k, int[] rows, int from, int to, double[] center,
            boolean parallel) {
        int n = to - from;
        int blocks = (n + BLOCK - 1) / BLOCK;
        double[][] partial = new double[blocks][];
        forEachBlock(blocks, parallel && parallelWorth((long) n * k * k), blk -> {
            double[] s = new double[k * k];
            double[] r = new double[8 * k];
            int r0 = from + blk * BLOCK, r1 = Math.min(to, r0 + BLOCK);
            for (int i = r0; i < r1; i += 8) {
                addEightRows(a, k, rows, i, Math.min(8, r1 - i), center, r, s);
            }
            partial[blk] = s;
        });
        double[] sum = new double[k * k];
        for (double[] p : partial) {
            for (int j = 0; j < k * k; j++) {
                sum[j] += p[j];
            }
        }
        for (int j = 0; j < k; j++) {
            for (int l = 0; l < j; l++) {
                sum[j * k + l] = sum[l * k + j];
            }
        }
        return sum;
    }

    /** Folds up to eight (centred) rows, positions i..i+count−1 of the row list, into the upper triangle of s. */
    private static void addEightRows(double[] a, int k, int[] rows, int i, int count, double[] center, double[] r,
            double[] s) {
        for (int t = 0; t < 8; t++) {
            int o = t >= count ? 0 : (rows == null ? i + t : rows[i + t]) * k;
            for (int j = 0; j < k; j++) {
                r[t * k + j] = t >= count ? 0.0 : center == null ? a[o + j] : a[o + j] - center[j];
            }
        }
        int k1 = k, k2 = 2 * k, k3 = 3 * k, k4 = 4 * k, k5 = 5 * k, k6 = 6 * k, k7 = 7 * k;
        for (int j = 0; j < k; j++) {
            double x0 = r[j], x1 = r[k1 + j], x2 = r[k2 + j], x3 = r[k3 + j];
            double x4 = r[k4 + j], x5 = r[k5 + j], x6 = r[k6 + j], x7 = r[k7 + j];
            int so = j * k;
            // upper triangle only (l ≥ j): half the arithmetic; mirrored after the sum
            for (int l = j; l < k; l++) {
                s[so + l] += x0 * r[l] + x1 * r[k1 + l] + x2 * r[k2 + l] + x3 * r[k3 + l]
                        + x4 * r[k4 + l] + x5 * r[k5 + l] + x6 * r[k6 + l] + x7 * r[k7 + l];
            }
        }
    }

    /**
     * Column sums Σ (a_i − c) of the rows {@code rows[from..to)} of A (k columns) about a centre c
     * (null for none), in fixed blocks of {@link #BLOCK} indices combined in order.
     *
     * @return a fresh k-vector
     */
    public static double[] columnSumsOfRows(double[] a, int k, int[] rows, int from, int to, double[] center,
            boolean parallel) {
        int n = to - from;
        int blocks = (n + BLOCK - 1) / BLOCK;
        double[][] partial = new double[blocks][];
        forEachBlock(blocks, parallel && parallelWorth((long) n * k), blk -> {
            double[] s = new double[k];
            int r0 = from + blk * BLOCK, r1 = Math.min(to, r0 + BLOCK);
            for (int i = r0; i < r1; i++) {
                int o = (rows == null ? i : rows[i]) * k;
                for (int j = 0; j < k; j++) {
                    s[j] += center == null ? a[o + j] : a[o + j] - center[j];
                }
            }
            partial[blk] = s;
        });
        double[] sum = new double[k];
        for (double[] p : partial) {
            for (int j = 0; j < k; j++) {
                sum[j] += p[j];
            }
        }
        return sum;
    }

    /** Squared Euclidean norms of the rows of A (n × k). */
    public static double[] rowNormsSq(double[] a, int n, int k) {
        double[] out = new double[n];
        for (int i = 0; i < n; i++) {
            double s = 0;
            int o = i * k;
            for (int j = 0; j < k; j++) {
                s += a[o + j] * a[o + j];
            }
            out[i] = s;
        }
        return out;
    }

    /**
     * exp(v) as P(v/64)^64 with P the degree-12 Taylor polynomial of exp: relative error below
     * 3·10⁻¹⁰ on [−45, 0] (and below 10⁻¹⁰ up to v = 40, where the remainder of P at 40/64 is
     * ≈ 4·10⁻¹³ per factor); arguments below −45 give e^−45 ≈ 2.9·10⁻²⁰, for sums whose largest
     * term is 1. Branch-free and without integer conversions, so loops over it vectorise (used by
     * the Monte Carlo intervals of kriged densities and by the excess-count bootstrap). P is
     * evaluated in Estrin's scheme (pairs, then powers s², s⁴, s⁸), whose dependency chain is
     * half as long as Horner's, so that vectorised loops overlap more of it (Knuth (1997), The
     * Art of Computer Programming 2, 3rd ed., §4.6.4); the two schemes differ by rounding only.
     */
    public static double expFast(double v) {
        double s = Math.max(v, -45.0) * (1.0 / 64);
        double s2 = s * s;
        double s4 = s2 * s2;
        double s8 = s4 * s4;
        double a0 = 1 + s;
        double a1 = 1.0 / 2 + s * (1.0 / 6);
        double a2 = 1.0 / 24 + s * (1.0 / 120);
        double a3 = 1.0 / 720 + s * (1.0 / 5040);
        double a4 = 1.0 / 40320 + s * (1.0 / 362880);
        double a5 = 1.0 / 3628800 + s * (1.0 / 39916800);
        double b0 = a0 + s2 * a1;
        double b1 = a2 + s2 * a3;
        double b2 = a4 + s2 * a5;
        double p = b0 + s4 * b1 + s8 * (b2 + s4 * (1.0 / 479001600));
        p *= p;
        p *= p;
        p *= p;
        p *= p;
        p *= p;
        return p * p;
    }

    /**
     * A copy of grid points, each checked to be finite and, when lower ≤ upper, inside [lower,
     * upper] (naming the offending index); pass NaN bounds for no domain check.
     *
     * @throws IllegalArgumentException for an empty or null array, a non-finite point or one outside
     */
    public static double[] checkedPoints(double[] xs, double lower, double upper, String name) {
        if (xs == null || xs.length == 0) {
            throw new IllegalArgumentException(name + " must contain at least one point");
        }
        for (int i = 0; i < xs.length; i++) {
            if (!Double.isFinite(xs[i])) {
                throw new IllegalArgumentException(name + "[" + i + "] is not finite: " + xs[i]);
            }
            if (lower <= upper && !(xs[i] >= lower && xs[i] <= upper)) {
                throw new IllegalArgumentException(name + "[" + i + "] = " + xs[i] + " is outside the domain [" + lower
                        + ", " + upper + "]; evaluation points must lie in the domain");
            }
        }
        return xs.clone();
    }
}
