package io.densa.core.internal;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The blocked kernels against EJML's {@code CommonOps_DDRM} (ejml-ddense 0.43.1), on shapes that
 * exercise every remainder path (k not a multiple of 8 or 4, m larger than a column tile, n not a
 * multiple of a row block), and the parallel path against the serial one bit for bit.
 * Relative tolerance 1e-13 (same products, different summation order).
 */
class KernelsTest {
    private static double[] random(int len, long seed) {
        Random r = new Random(seed);
        double[] d = new double[len];
        for (int i = 0; i < len; i++) {
            d[i] = r.nextGaussian();
        }
        return d;
    }

    private static void close(double[] expected, double[] actual) {
        assertEquals(expected.length, actual.length);
        for (int i = 0; i < expected.length; i++) {
            assertEquals(expected[i], actual[i], 1e-13 * Math.max(1, Math.abs(expected[i])), "entry " + i);
        }
    }

    @ParameterizedTest
    @CsvSource({"70, 13, 600", "33, 8, 257", "5, 3, 9", "129, 32, 512", "1, 1, 1"})
    void multiplyMatchesEjml(int n, int k, int m) {
        double[] a = random(n * k, 1), b = random(k * m, 2);
        DMatrixRMaj c = new DMatrixRMaj(n, m);
        CommonOps_DDRM.mult(DMatrixRMaj.wrap(n, k, a), DMatrixRMaj.wrap(k, m, b), c);
        double[] out = new double[n * m];
        Kernels.multiply(a, n, k, b, m, out, false);
        close(c.data, out);
        double[] par = new double[n * m];
        Kernels.multiply(a, n, k, b, m, par, true);
        assertArrayEquals(out, par);
    }

    @ParameterizedTest
    @CsvSource({"70, 13", "300, 32", "9, 5", "10001, 7"})
    void gramAndCrossProductsMatchEjml(int n, int k) {
        double[] a = random(n * k, 3);
        DMatrixRMaj am = DMatrixRMaj.wrap(n, k, a);
        double[] center = random(k, 4);
        DMatrixRMaj ac = am.copy();
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                ac.set(i, j, ac.get(i, j) - center[j]);
            }
        }
        DMatrixRMaj ctc = new DMatrixRMaj(k, k);
        CommonOps_DDRM.multTransA(ac, ac, ctc);
        close(ctc.data, Kernels.crossProduct(a, n, k, center, false));
        assertArrayEquals(Kernels.crossProduct(a, n, k, center, false), Kernels.crossProduct(a, n, k, center, true));
        if (n <= 1000) {
            DMatrixRMaj g = new DMatrixRMaj(n, n);
            CommonOps_DDRM.multTransB(am, am, g);
            double[] out = new double[n * n];
            Kernels.gram(a, n, k, out, false);
            close(g.data, out);
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    assertEquals(out[i * n + j], out[j * n + i], 0.0, "exact symmetry");
                }
            }
        }
        double[] sums = new double[k];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                sums[j] += a[i * k + j];
            }
        }
        close(sums, Kernels.columnSums(a, n, k, false));
    }

    /** The fused pass gives columnSums' sums bit for bit, and the largest |entry| found by a plain loop. */
    @org.junit.jupiter.api.Test
    void columnSumsAndMaxAbsInOnePass() {
        Random r = new Random(21);
        for (int k : new int[] {7, 32}) { // on the vector path: vectors and a remainder, vectors only
            for (int n : new int[] {0, 1, 17, 4096, 4097, 30_000}) {
                double[] a = new double[n * k];
                double big = 0;
                for (int i = 0; i < a.length; i++) {
                    a[i] = r.nextGaussian() * Math.exp(4 * r.nextGaussian());
                    big = Math.max(big, Math.abs(a[i]));
                }
                double[] fused = Kernels.columnSumsAndMaxAbs(a, n, k, true);
                assertArrayEquals(Kernels.columnSums(a, n, k, false), java.util.Arrays.copyOf(fused, k), 0.0);
                assertEquals(big, fused[k], 0.0);
                if (n > 1) { // a NaN entry: its column's sum and the maximum are NaN (Math.max), nothing else
                    a[n * k - 2] = Double.NaN;
                    fused = Kernels.columnSumsAndMaxAbs(a, n, k, true);
                    assertArrayEquals(Kernels.columnSums(a, n, k, false), java.util.Arrays.copyOf(fused, k), 0.0);
                    assertTrue(Double.isNaN(fused[k - 2]) && Double.isNaN(fused[k]) && !Double.isNaN(fused[0]));
                }
            }
        }
    }

    /**
     * {@link Kernels.RowSums} against EJML's matrix-vector product and inner product (the same
     * products, another summation order: 1e-13 relative) on a banded and a dense matrix, and its
     * kept sums follow the coefficients' values, not the array: changed in place, they are
     * recomputed; the subtracted term is 2w(Mb) from the gradient and 2wM added to the matrix.
     */
    @org.junit.jupiter.api.Test
    void rowSumsAgreeWithEjmlAndFollowTheCoefficients() {
        int k = 11;
        double[] dense = random(k * k, 41);
        double[] band = dense.clone();
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                if (Math.abs(i - j) > 3) {
                    band[i * k + j] = 0.0;
                }
            }
        }
        for (double[] m : new double[][] {dense, band}) {
            Kernels.RowSums q = new Kernels.RowSums(m, k);
            double[] b = random(k + 1, 42); // one coefficient more than the matrix: ignored
            for (int round = 0; round < 2; round++) {
                DMatrixRMaj mb = new DMatrixRMaj(k, 1);
                DMatrixRMaj bv = new DMatrixRMaj(k, 1, true, java.util.Arrays.copyOf(b, k));
                CommonOps_DDRM.mult(new DMatrixRMaj(k, k, true, m), bv, mb);
                double[] r = q.of(b);
                for (int i = 0; i < k; i++) {
                    assertEquals(mb.get(i), r[i], 1e-13 * (1 + Math.abs(mb.get(i))));
                }
                double form = CommonOps_DDRM.dot(bv, mb);
                assertEquals(form, q.form(b), 1e-13 * (1 + Math.abs(form)));
                double[] grad = new double[k], hess = new double[(k + 1) * (k + 1)];
                q.subtractTerm(0.5, b, grad, hess, k + 1);
                for (int i = 0; i < k; i++) {
                    assertEquals(-mb.get(i), grad[i], 1e-13 * (1 + Math.abs(mb.get(i))));
                    for (int j = 0; j < k; j++) {
                        assertEquals(m[i * k + j], hess[i * (k + 1) + j], 0.0);
                    }
                }
                b[3] += 1.5; // the same array, another value
            }
        }
    }

    /** Parallel blocks that throw: the lowest block's exception, as the serial loop, every time. */
    @org.junit.jupiter.api.Test
    void forEachBlockThrowsTheLowestBlocksException() {
        for (int run = 0; run < 20; run++) {
            for (boolean parallel : new boolean[] {true, false}) {
                IllegalStateException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalStateException.class,
                        () -> Kernels.forEachBlock(64, parallel, b -> {
                            if (b == 5 || b == 40 || b == 63) {
                                throw new IllegalStateException("block " + b);
                            }
                        }));
                assertEquals("block 5", e.getMessage());
            }
        }
    }
}
