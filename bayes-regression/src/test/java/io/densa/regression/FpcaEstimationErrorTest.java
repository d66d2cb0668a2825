package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.SmoothingCriterion;
import java.util.ArrayList;
import java.util.List;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.random.MersenneTwister;
import org.apache.commons.math3.stat.correlation.Covariance;
import org.junit.jupiter.api.Test;

/**
 * {@link Fpca#fit(BatchEstimate)}: the covariance of estimates is the covariance of the densities
 * plus the mean estimation covariance (Fuller (1987), Measurement Error Models, Wiley, §1.2), so
 * the corrected analysis is the eigen-decomposition of S − (1/n) Σ Σ̂_i, checked against Apache
 * Commons Math (sample covariance and symmetric eigen-decomposition) and by simulation.
 */
class FpcaEstimationErrorTest {
    private static final BayesSpace SPACE = BayesSpace.splines(0, 1, 4, 3);

    static EstimationDiagnostics diagnostics(String id, double[] cov, EstimationDiagnostics.Status status) {
        double tr = 0;
        int k = (int) Math.round(Math.sqrt(cov.length));
        for (int j = 0; j < k; j++) {
            tr += cov[j * k + j];
        }
        return new EstimationDiagnostics(id, status, "", 1, true, SmoothingCriterion.AIC, 0, 3, 0, 100, 5, cov, tr, 0);
    }

    /** Truth: coordinates with a dominant direction; estimates: truth plus N(0, Σ_i), Σ_i known. */
    static BatchEstimate simulate(long seed, double[][] truthOut, int n) {
        int k = SPACE.dimension();
        MersenneTwister rng = new MersenneTwister(seed);
        double[][] est = new double[n][k];
        List<EstimationDiagnostics> diag = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            double z1 = rng.nextGaussian();
            double z2 = rng.nextGaussian();
            double noise = 0.2 + 0.3 * rng.nextDouble(); // per-unit error SD
            double[] cov = new double[k * k];
            for (int j = 0; j < k; j++) {
                truthOut[i][j] = (j == 0 ? 2 * z1 : 0) + (j == 1 ? 0.7 * z2 : 0);
                est[i][j] = truthOut[i][j] + noise * rng.nextGaussian();
                cov[j * k + j] = noise * noise;
            }
            diag.add(diagnostics("u" + i, cov, EstimationDiagnostics.Status.CONVERGED));
        }
        return new BatchEstimate(DensitySet.of(SPACE, est), diag);
    }

    @Test
    void correctedEigenvaluesMatchCommonsMath() {
        int n = 40;
        int k = SPACE.dimension();
        BatchEstimate b = simulate(11, new double[n][k], n);
        double[][] c = b.densities().coordinates();
        double[][] s = new Covariance(c).getCovarianceMatrix().getData();
        for (EstimationDiagnostics d : b.diagnostics()) {
            double[] cov = d.covariance();
            for (int i = 0; i < k; i++) {
                for (int j = 0; j < k; j++) {
                    s[i][j] -= cov[i * k + j] / n;
                }
            }
        }
        double[] ref = new EigenDecomposition(new Array2DRowRealMatrix(s)).getRealEigenvalues();
        java.util.Arrays.sort(ref);
        double[] got = Fpca.fit(b).eigenvalues();
        for (int j = 0; j < k; j++) {
            double r = Math.max(0, ref[k - 1 - j]);
            assertEquals(r, got[j], 1e-12 * (1 + Math.abs(r)), "eigenvalue " + j);
        }
        // means and scores are those of the estimates
        assertEquals(0, b.densities().mean().distance(Fpca.fit(b).mean()), 1e-15);
    }

    @Test
    void correctionRecoversTheShareOfTheDensities() {
        int n = 60;
        int k = SPACE.dimension();
        double plainErr = 0;
        double corrErr = 0;
        for (long seed = 1; seed <= 20; seed++) {
            double[][] truth = new double[n][k];
            BatchEstimate b = simulate(seed, truth, n);
            double t = Fpca.fit(DensitySet.of(SPACE, truth)).explainedVariance()[0];
            plainErr += Math.abs(Fpca.fit(b.densities()).explainedVariance()[0] - t) / 20;
            corrErr += Math.abs(Fpca.fit(b).explainedVariance()[0] - t) / 20;
        }
        assertTrue(corrErr < 0.5 * plainErr, "mean |share error| corrected " + corrErr + " vs plain " + plainErr);
    }

    @Test
    void emptyUnitsAddNoError() {
        int k = SPACE.dimension();
        double[] big = new double[k * k];
        for (int j = 0; j < k; j++) {
            big[j * k + j] = 100;
        }
        double[][] c = {{1, 0, 0, 0, 0, 0}, {-1, 0, 0, 0, 0, 0}, {0, 0, 0, 0, 0, 0}};
        c = java.util.Arrays.stream(c).map(r -> java.util.Arrays.copyOf(r, k)).toArray(double[][]::new);
        BatchEstimate b = new BatchEstimate(DensitySet.of(SPACE, c), List.of(
                diagnostics("a", new double[k * k], EstimationDiagnostics.Status.CONVERGED),
                diagnostics("b", new double[k * k], EstimationDiagnostics.Status.CONVERGED),
                diagnostics("empty", big, EstimationDiagnostics.Status.EMPTY_UNIT_REFERENCE)));
        assertEquals(Fpca.fit(b.densities()).eigenvalues()[0], Fpca.fit(b).eigenvalues()[0], 1e-15);
    }
}
