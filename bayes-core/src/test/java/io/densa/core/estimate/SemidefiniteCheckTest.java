package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * {@link NewtonCovariance#projectPsd} and its rounding test {@link NewtonCovariance#semidefiniteToRounding}
 * on matrices built from a known eigen-decomposition V diag(λ) Vᵀ (V from Gram–Schmidt of random
 * vectors), so that the nearest positive semidefinite matrix is known in closed form: V diag(λ₊) Vᵀ
 * (Higham (1988), Computing a nearest symmetric positive semidefinite matrix, Linear Algebra Appl. 103:
 * the negative eigenvalues set to zero).
 */
class SemidefiniteCheckTest {
    static final int K = 24;

    static double[] orthonormal(long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        double[] v = new double[K * K]; // column j at v[i * K + j]
        for (int j = 0; j < K; j++) {
            for (int i = 0; i < K; i++) {
                v[i * K + j] = rng.nextGaussian();
            }
            for (int pass = 0; pass < 2; pass++) {
                for (int p = 0; p < j; p++) {
                    double dot = 0;
                    for (int i = 0; i < K; i++) {
                        dot += v[i * K + j] * v[i * K + p];
                    }
                    for (int i = 0; i < K; i++) {
                        v[i * K + j] -= dot * v[i * K + p];
                    }
                }
            }
            double n = 0;
            for (int i = 0; i < K; i++) {
                n += v[i * K + j] * v[i * K + j];
            }
            for (int i = 0; i < K; i++) {
                v[i * K + j] /= Math.sqrt(n);
            }
        }
        return v;
    }

    static double[] compose(double[] v, double[] lambda) {
        double[] a = new double[K * K];
        for (int i = 0; i < K; i++) {
            for (int c = 0; c < K; c++) {
                double s = 0;
                for (int e = 0; e < K; e++) {
                    s += v[i * K + e] * lambda[e] * v[c * K + e];
                }
                a[i * K + c] = s;
            }
        }
        for (int i = 0; i < K; i++) { // exact symmetry, as the sandwich writes it
            for (int c = 0; c < i; c++) {
                a[c * K + i] = a[i * K + c];
            }
        }
        return a;
    }

    static double[] spectrum(int rank, double last) {
        double[] l = new double[K];
        for (int e = 0; e < rank; e++) {
            l[e] = Math.pow(10, -4.0 * e / rank); // 1 … 1e-4
        }
        l[K - 1] = last;
        return l;
    }

    @Test
    void rankDeficientSemidefiniteMatricesAreLeftAsTheyAre() {
        for (int rank : new int[] {1, 5, 10, 23}) {
            double[] a = compose(orthonormal(rank), spectrum(rank, 0.0));
            double[] before = a.clone();
            assertTrue(NewtonCovariance.semidefiniteToRounding(a, K), "rank " + rank);
            assertFalse(NewtonCovariance.projectPsd(a, K), "rank " + rank);
            assertArrayEquals(before, a, 0.0);
        }
        // a zero covariance (no information at all) too
        assertTrue(NewtonCovariance.semidefiniteToRounding(new double[K * K], K));
    }

    @Test
    void negativeEigenvaluesAboveRoundingAreProjectedToTheNearestSemidefiniteMatrix() {
        for (double neg : new double[] {-1e-3, -1e-9}) {
            double[] v = orthonormal(7);
            double[] l = spectrum(10, neg);
            double[] a = compose(v, l);
            assertFalse(NewtonCovariance.semidefiniteToRounding(a, K), "eigenvalue " + neg);
            assertTrue(NewtonCovariance.projectPsd(a, K));
            l[K - 1] = 0;
            double[] expected = compose(v, l);
            for (int i = 0; i < K * K; i++) {
                assertEquals(expected[i], a[i], 1e-13, "entry " + i + " for eigenvalue " + neg);
            }
        }
    }

    @Test
    void theRoundingTestIsInvariantToTheOrderOfTheCoordinates() {
        // pivoting: the same matrix with rows and columns reversed gives the same answer
        double[] a = compose(orthonormal(3), spectrum(8, -1e-20));
        double[] r = new double[K * K];
        for (int i = 0; i < K; i++) {
            for (int c = 0; c < K; c++) {
                r[i * K + c] = a[(K - 1 - i) * K + (K - 1 - c)];
            }
        }
        assertTrue(NewtonCovariance.semidefiniteToRounding(a, K));
        assertTrue(NewtonCovariance.semidefiniteToRounding(r, K));
        double[] b = compose(orthonormal(3), spectrum(8, -1e-6));
        for (int i = 0; i < K; i++) {
            for (int c = 0; c < K; c++) {
                r[i * K + c] = b[(K - 1 - i) * K + (K - 1 - c)];
            }
        }
        assertFalse(NewtonCovariance.semidefiniteToRounding(b, K));
        assertFalse(NewtonCovariance.semidefiniteToRounding(r, K));
    }
}
