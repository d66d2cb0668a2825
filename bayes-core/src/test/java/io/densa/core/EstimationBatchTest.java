package io.densa.core;

import static io.densa.core.EstimationTestSupport.edges;
import static io.densa.core.EstimationTestSupport.rng;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.EstimationTestSupport.Truth;
import java.util.List;
import org.apache.commons.math3.random.RandomGenerator;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;
import org.junit.jupiter.api.Test;

/**
 * A simulated batch of 10,000 units (totals 5–500 events over 30 bins, shapes drawn from the four
 * test truths, some units sparse with many empty bins): with smoothing chosen per unit by GCV, every
 * fit is finite, converged, its density positive on a grid, and its coordinate covariance positive
 * definite (EJML Cholesky).
 */
class EstimationBatchTest {
    @Test
    void gcvChosenFitsArePositiveDefiniteOnTenThousandUnits() {
        List<Truth> truths = List.of(EstimationTestSupport.normal(), EstimationTestSupport.mixture());
        int n = 10_000, bins = 30;
        RandomGenerator r = rng(2024);
        int[][] counts = new int[n][];
        for (int i = 0; i < n; i++) {
            Truth t = truths.get(i % truths.size());
            counts[i] = t.counts(5 + r.nextInt(496), bins, r);
        }
        BayesSpace space = BayesSpace.splines(0, 1, 4, 8);
        double[] e = edges(0, 1, bins);
        long t0 = System.nanoTime();
        BatchEstimate pl = PenalizedLikelihoodEstimator.of(space).withCriterion(SmoothingCriterion.GCV)
                .fitAll(e, counts, null);
        long t1 = System.nanoTime();
        BatchEstimate ss = SmoothingSplineEstimator.of(space).fitAll(e, counts, null);
        long t2 = System.nanoTime();
        System.out.printf("10,000 units, GCV: penalised likelihood %.2f s, smoothing spline %.2f s (%s)%n",
                (t1 - t0) / 1e9, (t2 - t1) / 1e9, Runtime.getRuntime().availableProcessors() + " cpus");
        for (BatchEstimate b : List.of(pl, ss)) {
            assertEquals(List.of(), b.flaggedRows());
            DMatrixRMaj pdf = b.densities().pdf(0.0, 0.25, 0.5, 0.75, 1.0);
            for (double v : pdf.data) {
                assertTrue(v > 0 && Double.isFinite(v));
            }
            for (EstimationDiagnostics d : b.diagnostics()) {
                assertTrue(Double.isFinite(d.smoothing()) && d.smoothing() > 0, d.toString());
                assertTrue(Double.isFinite(d.criterionValue()), d.toString());
                assertTrue(d.estimationVariance() > 0 && Double.isFinite(d.estimationVariance()), d.toString());
                CholeskyDecomposition_F64<DMatrixRMaj> chol = DecompositionFactory_DDRM.chol(space.dimension(), true);
                assertTrue(chol.decompose(d.covarianceMatrix()), "covariance not positive definite: " + d);
            }
            for (double c : b.densities().coordinatesRowMajor()) {
                assertTrue(Double.isFinite(c));
            }
        }
    }
}
