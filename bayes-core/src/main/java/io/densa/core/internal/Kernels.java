package io.densa.core.internal;

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
 * <p>Speed: the innermost loops of {@link #multiplyRows} and {@link #crossProduct} are those of
 * the active {@link KernelPath} (plain Java by default; explicit SIMD vectors when the JVM runs
 * with the incubating vector module). Within one path, results do not depend on the number of
 * threads.
 */
public final class Kernels {
    /** Rows per block in blocked kernels. */
    public static final int BLOCK = 4096;
    private static final long PARALLEL_WORK = 1L << 18;
    /** The implementation of the hot inner loops, chosen once (see {@link KernelPath}). */
    private static final KernelPath PATH = KernelPath.active();

    private Kernels() {
    }

    /** Whether work of this size is worth the common pool. */
    public static boolean parallelWorth(long flops) {
        return flops >= PARALLEL_WORK;
    }

    /**
     * Runs body(block) for block = 0..blocks−1, in parallel on the common pool when
     * {@code parallel}; each block must write only its own outputs. If blocks throw, the exception
     * of the lowest such block is thrown (in parallel after every block has run), as the serial
     * loop would: the error a batch reports does not depend on the threads.
     */
    public static void forEachBlock(int blocks, boolean parallel, java.util.function.IntConsumer body) {
        if (parallel && blocks > 1) {
            RuntimeException[] thrown = new RuntimeException[blocks];
            IntStream.range(0, blocks).parallel().forEach(b -> {
                try {
                    body.accept(b);
                } catch (RuntimeException e) {
                    thrown[b] = e;
                }
            });
            for (RuntimeException e : thrown) {
                if (e != null) {
                    throw e;
                }
            }
        } else {
            for (int i = 0; i < blocks; i++) {
                body.accept(i);
            }
        }
    }

    /** Rows per parallel block in {@link #multiply}. */
    private static final int MULT_ROWS = 32;

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
     * Serial kernel: out[outOff + i·m + q] = Σ_j a[aOff + i·k + j] b[j·m + q] for i &lt; rows, by the
     * active {@link KernelPath} (output columns tiled so that the slice of B in use stays in cache).
     */
    public static void multiplyRows(double[] a, int aOff, int rows, int k, double[] b, int m, double[] out,
            int outOff) {
        PATH.multiplyRows(a, aOff, rows, k, b, m, out, outOff);
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
     * @param out n·k array: a fresh array or {@code a} itself (each entry is read before it is written)
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
     * Each block's upper triangle is summed by the active {@link KernelPath}; the lower triangle is a
     * copy of the upper, so the result is exactly symmetric.
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
            int r0 = from + blk * BLOCK, r1 = Math.min(to, r0 + BLOCK);
            PATH.addCrossProduct(a, k, rows, r0, r1, center, s);
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

    /**
     * {@link #columnSums} (the same sums, bit for bit) and, in the same pass, the largest absolute
     * entry of A.
     *
     * @return a fresh (k + 1)-vector: the k column sums, then max |a_ij| (0 for n = 0)
     */
    public static double[] columnSumsAndMaxAbs(double[] a, int n, int k, boolean parallel) {
        int blocks = (n + BLOCK - 1) / BLOCK;
        double[][] partial = new double[blocks][];
        forEachBlock(blocks, parallel && parallelWorth((long) n * k), blk -> {
            double[] s = new double[k + 1];
            int r0 = blk * BLOCK;
            PATH.addColumnSumsAndMaxAbs(a, k, r0, Math.min(n, r0 + BLOCK), s);
            partial[blk] = s;
        });
        double[] sum = new double[k + 1];
        for (double[] p : partial) {
            for (int j = 0; j < k; j++) {
                sum[j] += p[j];
            }
            sum[k] = Math.max(sum[k], p[k]);
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
     * Each a + s·b is one fused multiply-add ({@link Math#fma}, one rounding), which vectorised loops
     * execute as one instruction instead of two.
     */
    public static double expFast(double v) {
        double s = Math.max(v, -45.0) * (1.0 / 64);
        double s2 = s * s;
        double s4 = s2 * s2;
        double s8 = s4 * s4;
        double a0 = 1 + s;
        double a1 = Math.fma(s, 1.0 / 6, 1.0 / 2);
        double a2 = Math.fma(s, 1.0 / 120, 1.0 / 24);
        double a3 = Math.fma(s, 1.0 / 5040, 1.0 / 720);
        double a4 = Math.fma(s, 1.0 / 362880, 1.0 / 40320);
        double a5 = Math.fma(s, 1.0 / 39916800, 1.0 / 3628800);
        double b0 = Math.fma(s2, a1, a0);
        double b1 = Math.fma(s2, a3, a2);
        double b2 = Math.fma(s2, a5, a4);
        double p = Math.fma(s8, Math.fma(s4, 1.0 / 479001600, b2), Math.fma(s4, b1, b0));
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

    /**
     * For each row i of a k × k matrix, the first and one past the last column of its nonzero
     * entries (at {2i, 2i + 1}): for banded matrices such as the roughness penalty of B-splines
     * (|i − j| &lt; order), whose products can then skip the zeros with the sums of the full loops
     * (a zero term adds nothing).
     */
    public static int[] rowSupport(double[] m, int k) {
        int[] r = new int[2 * k];
        for (int i = 0; i < k; i++) {
            int lo = 0, hi = k;
            while (lo < hi && m[i * k + lo] == 0.0) {
                lo++;
            }
            while (hi > lo && m[i * k + hi - 1] == 0.0) {
                hi--;
            }
            r[2 * i] = lo;
            r[2 * i + 1] = hi;
        }
        return r;
    }

    /**
     * A K × K matrix M with its {@link #rowSupport}, and its row sums (M b)_i for the last b given,
     * kept: the penalised objective asks for b'Mb at a point and then, once the point is accepted,
     * for its gradient term M b at the same point: one computation of the sums serves both. One
     * per thread.
     */
    public static final class RowSums {
        private final double[] m;
        private final int[] rows;
        private final int k;
        private final double[] sums;
        private final double[] at;
        private boolean known;

        /** For m (K × K, row-major; not copied, not modified). */
        public RowSums(double[] m, int k) {
            this.m = m;
            this.k = k;
            this.rows = rowSupport(m, k);
            sums = new double[k];
            at = new double[k];
        }

        /**
         * Subtracts the term w b'Mb from a function whose gradient and Hessian's negative are
         * grad and hess (K × K in a row stride s): 2w (M b)_i from grad_i, 2w M_ij added to hess
         * over each row's nonzero columns.
         */
        public void subtractTerm(double w, double[] b, double[] grad, double[] hess, int s) {
            double[] r = of(b);
            for (int i = 0; i < k; i++) {
                int o = i * k;
                int row = i * s;
                for (int j = rows[2 * i], hi = rows[2 * i + 1]; j < hi; j++) {
                    hess[row + j] += 2 * w * m[o + j];
                }
                grad[i] -= 2 * w * r[i];
            }
        }

        /** (M b)_i for i &lt; K (the first K entries of b; the array is reused by the next call). */
        public double[] of(double[] b) {
            if (known && java.util.Arrays.equals(at, 0, k, b, 0, k)) {
                return sums;
            }
            for (int i = 0; i < k; i++) {
                double r = 0;
                int o = i * k;
                for (int j = rows[2 * i], hi = rows[2 * i + 1]; j < hi; j++) {
                    r += m[o + j] * b[j];
                }
                sums[i] = r;
            }
            System.arraycopy(b, 0, at, 0, k);
            known = true;
            return sums;
        }

        /** b'Mb: Σ_i b_i (M b)_i, each row summed over its nonzero columns in order. */
        public double form(double[] b) {
            double[] r = of(b);
            double s = 0;
            for (int i = 0; i < k; i++) {
                s += b[i] * r[i];
            }
            return s;
        }
    }
}
