package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.internal.RoughnessPenalty;
import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

/**
 * The covariance step's hand-written triangular algebra against EJML's general inverse and
 * products (an independent general-purpose implementation): edf = tr(J⁻¹F) and the sandwich
 * U J⁻¹ M J⁻¹ Uᵀ, J = F + 2λP + 2Q, M the empirical information times N/(N − edf) (or F), at
 * evaluated coefficients of sparse and dense histograms. The formulas: the sandwich (robust)
 * covariance of an M-estimator, Huber (1967), The behavior of maximum likelihood estimates under
 * nonstandard conditions, Proc. 5th Berkeley Symp. 1; edf = tr(J⁻¹F) for a penalised fit,
 * Hastie &amp; Tibshirani (1990), Generalized Additive Models, §6.8 (both from memory; the
 * check here is of the linear algebra, not of the statistics).
 */
class NewtonCovarianceTest {
    private static DMatrixRMaj mat(double[] a, int k) {
        return new DMatrixRMaj(k, k, true, a.clone());
    }

    @Test
    void sandwichAndEdfMatchAGeneralInverse() {
        BayesSpace space = BayesSpace.cubicSplines(0, 365, 21);
        int k = space.dimension();
        double[] edges = new double[366];
        for (int j = 0; j <= 365; j++) {
            edges[j] = j;
        }
        BinLayout lay = new BinLayout(space, edges, 0);
        double[] pen = RoughnessPenalty.raw(EstimationSupport.rawBasis(space.basis()), 2);
        double[] u = EstimationSupport.upperU(space.basisTransform(), k);
        double[] prior = new double[k * k];
        for (int i = 0; i < k; i++) {
            prior[i * k + i] = 0.25;
        }
        Random rng = new Random(3);
        double worstCov = 0, worstEdf = 0;
        for (int unit = 0; unit < 40; unit++) {
            double[] counts = new double[365];
            double total = 0;
            double level = unit % 2 == 0 ? 0.1 : 20; // sparse and dense histograms
            for (int j = 0; j < 365; j++) {
                counts[j] = Math.floor(level * (1 + Math.sin(j / 40.0 + unit)) + rng.nextDouble());
                total += counts[j];
            }
            double[] beta = new double[k + 1];
            for (int i = 0; i < k; i++) {
                beta[i] = 0.3 * rng.nextGaussian();
            }
            double lambda = Math.pow(10, 1 + 3 * rng.nextDouble());
            for (boolean robust : new boolean[] {true, false}) {
                PenalizedObjective obj = new PenalizedObjective(lay, pen, unit % 4 < 2 ? prior : null);
                obj.useCounts(counts, total);
                obj.evaluate(beta, lambda);
                obj.fisherInformation();
                double[] f = obj.fisher().clone();
                double[] meat = new double[k * k];
                obj.empiricalInformation(meat);
                NewtonCovariance nc = new NewtonCovariance(obj, k, pen, unit % 4 < 2 ? prior : null);
                double[] cov = new double[k * k];
                double edf = nc.sandwich(lambda, u, cov, robust);
                // reference with EJML
                double[] j = new double[k * k];
                for (int i = 0; i < k * k; i++) {
                    j[i] = f[i] + 2 * lambda * pen[i] + (unit % 4 < 2 ? 2 * prior[i] : 0.0);
                }
                DMatrixRMaj jinv = mat(j, k);
                assertTrue(CommonOps_DDRM.invert(jinv));
                DMatrixRMaj jf = new DMatrixRMaj(k, k);
                CommonOps_DDRM.mult(jinv, mat(f, k), jf);
                double edfRef = CommonOps_DDRM.trace(jf);
                double[] m = f;
                if (robust && total > edfRef + 1) {
                    m = meat.clone();
                    for (int i = 0; i < k * k; i++) {
                        m[i] *= total / (total - edfRef);
                    }
                }
                DMatrixRMaj uj = new DMatrixRMaj(k, k);
                CommonOps_DDRM.mult(mat(u, k), jinv, uj);
                DMatrixRMaj ujm = new DMatrixRMaj(k, k);
                CommonOps_DDRM.mult(uj, mat(m, k), ujm);
                DMatrixRMaj ref = new DMatrixRMaj(k, k);
                CommonOps_DDRM.multTransB(ujm, uj, ref);
                double scale = CommonOps_DDRM.elementMaxAbs(ref);
                for (int i = 0; i < k * k; i++) {
                    worstCov = Math.max(worstCov, Math.abs(cov[i] - ref.data[i]) / scale);
                }
                worstEdf = Math.max(worstEdf, Math.abs(edf - edfRef) / Math.max(1, edfRef));
            }
        }
        System.out.println("sandwich vs EJML: cov " + worstCov + ", edf " + worstEdf);
        assertTrue(worstCov < 1e-9, "largest difference from EJML relative to the largest entry: " + worstCov);
        assertTrue(worstEdf < 1e-10, "largest relative edf difference: " + worstEdf);
    }
}
