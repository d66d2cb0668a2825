package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;

import io.densa.core.BayesSpace;
import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

/**
 * The marginal likelihood's prior term log det(2λP + 2Q), which the λ search takes from the
 * eigenvalues of the pencil L⁻¹(2P)L⁻ᵀ (2Q = LLᵀ) computed once, against EJML's general determinant
 * (LU; CommonOps_DDRM.det, a general-purpose reference library) of the matrix at each λ, from
 * λ = 0 to 10⁶, for a second-difference penalty (rank K − 2, as a roughness penalty) and a dense
 * positive definite Q.
 */
class PriorLogDeterminantTest {
    @Test
    void pencilEigenvaluesGiveTheLogDeterminantAtEveryLambda() {
        int k = 9;
        double[] p = new double[k * k];
        for (int r = 0; r + 2 < k; r++) { // D'D, D the (k − 2) × k second-difference matrix
            double[] d = new double[k];
            d[r] = 1;
            d[r + 1] = -2;
            d[r + 2] = 1;
            for (int i = 0; i < k; i++) {
                for (int j = 0; j < k; j++) {
                    p[i * k + j] += d[i] * d[j];
                }
            }
        }
        Random rnd = new Random(21);
        double[] a = new double[k * k];
        for (int i = 0; i < a.length; i++) {
            a[i] = rnd.nextGaussian();
        }
        double[] q = new double[k * k];
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                double s = i == j ? 0.5 : 0.0;
                for (int m = 0; m < k; m++) {
                    s += a[m * k + i] * a[m * k + j];
                }
                q[i * k + j] = 0.05 * s;
            }
        }
        PenalizedLikelihoodEstimator.Settings settings =
                PenalizedLikelihoodEstimator.withDefaults(BayesSpace.splines(0, 1, 4, 5)).settings();
        SmoothingSearch search = new SmoothingSearch(settings, k, null, p, q, k - 2);
        for (double lambda : new double[] {0, 1e-3, 0.1, 1, 37, 1e3, 1e6}) {
            DMatrixRMaj m = new DMatrixRMaj(k, k);
            for (int i = 0; i < k * k; i++) {
                m.data[i] = 2 * lambda * p[i] + 2 * q[i];
            }
            double reference = Math.log(CommonOps_DDRM.det(m));
            assertEquals(reference, search.logDetPrior(lambda), 1e-9 * Math.max(1, Math.abs(reference)),
                    "lambda = " + lambda);
        }
    }
}
