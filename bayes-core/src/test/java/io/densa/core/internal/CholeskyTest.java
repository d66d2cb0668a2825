package io.densa.core.internal;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;

import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.ejml.dense.row.decomposition.chol.CholeskyDecompositionInner_DDRM;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * The Cholesky kernel against EJML (ejml-ddense 0.43.1): the factor equals EJML's inner-product
 * Cholesky ({@code CholeskyDecompositionInner_DDRM}) bit for bit on exactly symmetric input, the
 * solves and inverses agree with {@code CommonOps_DDRM.solve/invert} to 1e-10 relative (the test
 * matrices have condition numbers below about 10⁴), and failures name the first failing column.
 */
class CholeskyTest {
    /** A random symmetric positive definite n × n matrix (B Bᵀ + n I), exactly symmetric. */
    private static double[] spd(int n, long seed) {
        Random r = new Random(seed);
        double[] b = new double[n * n];
        for (int i = 0; i < b.length; i++) {
            b[i] = r.nextGaussian();
        }
        double[] a = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j <= i; j++) {
                double s = 0;
                for (int q = 0; q < n; q++) {
                    s += b[i * n + q] * b[j * n + q];
                }
                a[i * n + j] = s + (i == j ? n : 0);
                a[j * n + i] = a[i * n + j];
            }
        }
        return a;
    }

    private static double[] lowerOf(double[] a, int n) {
        double[] l = a.clone();
        for (int i = 0; i < n; i++) {
            for (int j = i + 1; j < n; j++) {
                l[i * n + j] = 0;
            }
        }
        return l;
    }

    private static void close(double[] expected, double[] actual, double tol) {
        assertEquals(expected.length, actual.length);
        double scale = 0;
        for (double e : expected) {
            scale = Math.max(scale, Math.abs(e));
        }
        for (int i = 0; i < expected.length; i++) {
            assertEquals(expected[i], actual[i], tol * Math.max(1, scale), "entry " + i);
        }
    }

    /** log det from the factor (also on a strided block) against the log of EJML's determinant. */
    @ParameterizedTest
    @ValueSource(ints = {1, 2, 7, 24})
    void logDeterminantAgreesWithEjml(int n) {
        double[] a = spd(n, 300 + n);
        double expected = Math.log(CommonOps_DDRM.det(new DMatrixRMaj(n, n, true, a)));
        double[] l = a.clone();
        assertEquals(-1, Cholesky.factor(l, n, n, 0));
        assertEquals(expected, Cholesky.logDeterminant(l, n, n), 1e-12 * Math.max(1, Math.abs(expected)));
        int s = n + 1;
        double[] strided = new double[n * s];
        for (int i = 0; i < n; i++) {
            System.arraycopy(a, i * n, strided, i * s, n);
        }
        assertEquals(-1, Cholesky.factor(strided, n, s, 0));
        assertEquals(Cholesky.logDeterminant(l, n, n), Cholesky.logDeterminant(strided, n, s), 0.0);
    }

    /**
     * The substitutions work four rows at a time; each unknown must receive the same terms in
     * the same order as in the one-row-at-a-time loops written out here, so the results are equal
     * bit for bit (sizes cover the blocks and every remainder).
     */
    @ParameterizedTest
    @ValueSource(ints = {1, 2, 3, 4, 5, 6, 7, 8, 9, 24, 33, 41})
    void substitutionsEqualTheRowByRowLoopsBitForBit(int n) {
        double[] l = spd(n, 70 + n);
        assertEquals(-1, Cholesky.factor(l, n, n, 0));
        Random r = new Random(n);
        double[] b = new double[n + 3];
        for (int i = 0; i < b.length; i++) {
            b[i] = r.nextGaussian();
        }
        double[] expected = b.clone();
        for (int i = 0; i < n; i++) { // forward, one row at a time
            double v = expected[3 + i];
            for (int p = 0; p < i; p++) {
                v -= l[i * n + p] * expected[3 + p];
            }
            expected[3 + i] = v / l[i * n + i];
        }
        double[] x = b.clone();
        Cholesky.forward(l, n, n, x, 3);
        assertArrayEquals(expected, x);
        double[] column = java.util.Arrays.copyOfRange(b, 3, 3 + n); // one right-hand side by rows
        Cholesky.forwardRows(l, n, column, 1);
        assertArrayEquals(java.util.Arrays.copyOfRange(expected, 3, 3 + n), column);
        for (int i = n - 1; i >= 0; i--) { // back substitution by rows, one row at a time
            double xi = expected[3 + i] / l[i * n + i];
            expected[3 + i] = xi;
            for (int p = 0; p < i; p++) {
                expected[3 + p] -= l[i * n + p] * xi;
            }
        }
        Cholesky.backwardByRows(l, n, n, x, 3);
        assertArrayEquals(expected, x);
    }

    /**
     * The substitutions that multiply by 1/L_ii: the same loops as one row at a time written out
     * here with a product by the reciprocal in place of each division (bit for bit), and within a
     * few units in the last place of the dividing form.
     */
    @ParameterizedTest
    @ValueSource(ints = {1, 2, 3, 4, 5, 6, 7, 8, 9, 24, 33, 41})
    void substitutionsWithInverseDiagonalMultiplyInsteadOfDividing(int n) {
        double[] l = spd(n, 170 + n);
        assertEquals(-1, Cholesky.factor(l, n, n, 0));
        double[] rd = Cholesky.inverseDiagonal(l, n, n);
        for (int i = 0; i < n; i++) {
            assertEquals(1.0 / l[i * n + i], rd[i], 0.0);
        }
        Random r = new Random(n + 5);
        double[] b = new double[n + 2];
        for (int i = 0; i < b.length; i++) {
            b[i] = r.nextGaussian();
        }
        double[] expected = b.clone();
        for (int i = 0; i < n; i++) {
            double v = expected[2 + i];
            for (int p = 0; p < i; p++) {
                v -= l[i * n + p] * expected[2 + p];
            }
            expected[2 + i] = v * rd[i];
        }
        double[] x = b.clone();
        Cholesky.forward(l, rd, n, n, x, 2);
        assertArrayEquals(expected, x);
        double[] divided = b.clone();
        Cholesky.forward(l, n, n, divided, 2);
        for (int i = 2; i < n + 2; i++) {
            assertEquals(divided[i], x[i], 8 * Math.ulp(Math.abs(divided[i]) + 1e-300) + 1e-13 * maxAbs(divided));
        }
        for (int i = n - 1; i >= 0; i--) {
            double xi = expected[2 + i] * rd[i];
            expected[2 + i] = xi;
            for (int p = 0; p < i; p++) {
                expected[2 + p] -= l[i * n + p] * xi;
            }
        }
        Cholesky.backwardByRows(l, rd, n, n, x, 2);
        assertArrayEquals(expected, x);
        Cholesky.backwardByRows(l, n, n, divided, 2);
        for (int i = 2; i < n + 2; i++) {
            assertEquals(divided[i], x[i], 1e-12 * maxAbs(divided));
        }
    }

    private static double maxAbs(double[] v) {
        double m = 0;
        for (double d : v) {
            m = Math.max(m, Math.abs(d));
        }
        return m;
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 2, 3, 7, 9, 12, 16, 24, 41})
    void factorEqualsEjmlInnerCholeskyBitForBit(int n) {
        double[] a = spd(n, n);
        DMatrixRMaj ej = DMatrixRMaj.wrap(n, n, a.clone());
        CholeskyDecompositionInner_DDRM chol = new CholeskyDecompositionInner_DDRM(true);
        assertEquals(true, chol.decompose(ej));
        double[] expected = chol.getT(null).data;
        double[] l = a.clone();
        assertEquals(-1, Cholesky.factor(l, n, n, 0));
        assertArrayEquals(expected, lowerOf(l, n));
        double[] large = Cholesky.factorLarge(DMatrixRMaj.wrap(n, n, a.clone()));
        assertNotNull(large);
        close(expected, large, 1e-14);
    }

    @Test
    void factorWorksOnAStridedBlockAndLeavesTheRestAlone() {
        int n = 5, s = 7;
        double[] a = spd(n, 3);
        double[] big = new double[n * s];
        java.util.Arrays.fill(big, 42.0);
        for (int i = 0; i < n; i++) {
            System.arraycopy(a, i * n, big, i * s, n);
        }
        assertEquals(-1, Cholesky.factor(big, n, s, 0));
        double[] l = a.clone();
        Cholesky.factor(l, n, n, 0);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < s; j++) {
                double expected = j <= i ? l[i * n + j] : j < n ? a[i * n + j] : 42.0;
                assertEquals(expected, big[i * s + j], 0.0, "(" + i + ", " + j + ")");
            }
        }
    }

    @Test
    void failureNamesTheFirstBadColumnAndLeavesItsPivot() {
        // [[4, 2, 0], [2, 1, 0], [0, 0, 1]]: the second pivot is 1 − 2²/4 = 0
        double[] a = {4, 2, 0, 2, 1, 0, 0, 0, 1};
        assertEquals(1, Cholesky.factor(a, 3, 3, 0));
        assertEquals(0.0, a[4], 0.0);
        double[] nan = {1, 0, 0, Double.NaN};
        assertEquals(1, Cholesky.factor(nan, 2, 2, 0));
        double[] inf = {Double.POSITIVE_INFINITY};
        assertEquals(0, Cholesky.factor(inf, 1, 1, 0));
        // a relative pivot floor: the pivot 1e-12 of [[1, 1], [1, 1 + 1e-12]] passes 0 but not 1e-10
        double[] near = {1, 1, 1, 1 + 1e-12};
        assertEquals(-1, Cholesky.factor(near.clone(), 2, 2, 0));
        assertEquals(1, Cholesky.factor(near.clone(), 2, 2, 1e-10));
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 4, 13, 30})
    void solvesAndInversesAgreeWithEjml(int n) {
        double[] a = spd(n, 100 + n);
        double[] l = a.clone();
        Cholesky.factor(l, n, n, 0);
        Random r = new Random(n);
        int w = 3;
        double[] b = new double[n * w];
        for (int i = 0; i < b.length; i++) {
            b[i] = r.nextGaussian();
        }
        DMatrixRMaj x = new DMatrixRMaj(n, w);
        CommonOps_DDRM.solve(DMatrixRMaj.wrap(n, n, a.clone()), DMatrixRMaj.wrap(n, w, b.clone()), x);
        double[] cols = b.clone();
        Cholesky.solveColumns(l, n, cols, w);
        close(x.data, cols, 1e-10);
        double[] first = new double[n];
        for (int i = 0; i < n; i++) {
            first[i] = b[i * w];
        }
        double[] one = new double[n + 2];
        System.arraycopy(first, 0, one, 2, n);
        Cholesky.solve(l, n, n, one, 2);
        for (int i = 0; i < n; i++) {
            assertEquals(x.get(i, 0), one[2 + i], 1e-10 * Math.max(1, Math.abs(x.get(i, 0))));
        }
        // the back substitution by rows of L solves the same system
        double[] byRows = new double[n + 2];
        System.arraycopy(first, 0, byRows, 2, n);
        Cholesky.forward(l, n, n, byRows, 2);
        Cholesky.backwardByRows(l, n, n, byRows, 2);
        for (int i = 0; i < n; i++) {
            assertEquals(x.get(i, 0), byRows[2 + i], 1e-10 * Math.max(1, Math.abs(x.get(i, 0))));
        }
        // L⁻¹ and its columns, L X = B row by row, and (Lᵀ)⁻¹ read through strides
        DMatrixRMaj lm = DMatrixRMaj.wrap(n, n, lowerOf(l, n));
        DMatrixRMaj linvE = new DMatrixRMaj(n, n);
        CommonOps_DDRM.invert(lm.copy(), linvE);
        double[] linv = new double[n * n];
        Cholesky.invertLower(l, n, linv);
        close(linvE.data, linv, 1e-10);
        double[] column = new double[n];
        for (int c = 0; c < n; c++) {
            Cholesky.invertLowerColumn(l, n, c, column);
            for (int i = c; i < n; i++) {
                assertEquals(linv[i * n + c], column[i], 0.0);
            }
        }
        double[] rows = b.clone();
        Cholesky.forwardRows(l, n, rows, w);
        DMatrixRMaj fr = new DMatrixRMaj(n, w);
        CommonOps_DDRM.mult(linvE, DMatrixRMaj.wrap(n, w, b), fr);
        close(fr.data, rows, 1e-10);
        double[] u = new double[n * n];
        Cholesky.invertUpper(l, n, 1, n, u);
        DMatrixRMaj ltInv = new DMatrixRMaj(n, n);
        CommonOps_DDRM.transpose(linvE, ltInv);
        close(ltInv.data, u, 1e-10);
        double[] lt = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                lt[i * n + j] = lm.get(j, i);
            }
        }
        double[] u2 = new double[n * n];
        Cholesky.invertUpper(lt, n, n, 1, u2);
        assertArrayEquals(u, u2);
        // Tᵀc
        double[] c = new double[n + 1];
        for (int i = 0; i <= n; i++) {
            c[i] = r.nextGaussian();
        }
        double[] out = new double[n];
        Cholesky.transposeTimes(lm.data, n, c, 1, out);
        DMatrixRMaj expected = new DMatrixRMaj(n, 1);
        CommonOps_DDRM.multTransA(lm, DMatrixRMaj.wrap(n, 1, java.util.Arrays.copyOfRange(c, 1, n + 1)), expected);
        close(expected.data, out, 1e-12);
    }
}
