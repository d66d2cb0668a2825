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

    /**
     * out (n × m) = A (n × k) · B where B is given row-major k × m (row j = j-th row of B).
     * Rows of the output are independent, so the result does not depend on parallelism.
     *
     * @param out n·m array, overwritten (must not alias a or b)
     */
    public static void multiply(double[] a, int n, int k, double[] b, int m, double[] out, boolean parallel) {
        int blocks = (n + 63) / 64;
        forEachBlock(blocks, parallel && parallelWorth(2L * n * k * m), blk -> {
            int r0 = blk * 64, r1 = Math.min(n, r0 + 64);
            for (int i = r0; i < r1; i++) {
                int o = i * m;
                Arrays.fill(out, o, o + m, 0.0);
                for (int j = 0; j < k; j++) {
                    double aij = a[i * k + j];
                    if (aij == 0.0) {
                        continue;
                    }
                    int bo = j * m;
                    for (int q = 0; q < m; q++) {
                        out[o + q] += aij * b[bo + q];
                    }
                }
            }
        });
    }

    /**
     * Column sums of A (n × k), summed in fixed blocks of {@link #BLOCK} rows combined in order.
     *
     * @return a fresh k-vector
     */
    public static double[] columnSums(double[] a, int n, int k, boolean parallel) {
        int blocks = (n + BLOCK - 1) / BLOCK;
        double[][] partial = new double[blocks][];
        forEachBlock(blocks, parallel && parallelWorth((long) n * k), blk -> {
            double[] s = new double[k];
            int r0 = blk * BLOCK, r1 = Math.min(n, r0 + BLOCK);
            for (int i = r0; i < r1; i++) {
                int o = i * k;
                for (int j = 0; j < k; j++) {
                    s[j] += a[o + j];
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
     * about a centre c (null for none), in fixed blocks combined in order.
     */
    public static double[] crossProduct(double[] a, int n, int k, double[] center, boolean parallel) {
        int blocks = (n + BLOCK - 1) / BLOCK;
        double[][] partial = new double[blocks][];
        forEachBlock(blocks, parallel && parallelWorth((long) n * k * k), blk -> {
            double[] s = new double[k * k];
            double[] row = new double[k];
            int r0 = blk * BLOCK, r1 = Math.min(n, r0 + BLOCK);
            for (int i = r0; i < r1; i++) {
                int o = i * k;
                if (center == null) {
                    System.arraycopy(a, o, row, 0, k);
                } else {
                    for (int j = 0; j < k; j++) {
                        row[j] = a[o + j] - center[j];
                    }
                }
                for (int j = 0; j < k; j++) {
                    double rj = row[j];
                    int so = j * k;
                    for (int l = 0; l < k; l++) {
                        s[so + l] += rj * row[l];
                    }
                }
            }
            partial[blk] = s;
        });
        double[] sum = new double[k * k];
        for (double[] p : partial) {
            for (int j = 0; j < k * k; j++) {
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
}
