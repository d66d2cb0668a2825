package io.densa.core.estimate;

import static io.densa.core.estimate.EstimationTestSupport.edges;
import static io.densa.core.estimate.EstimationTestSupport.rng;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.EstimationTestSupport.Truth;
import java.util.List;
import org.apache.commons.math3.random.RandomGenerator;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;
import org.junit.jupiter.api.Test;

/**
 * A simulated batch of 10,000 units (totals 5–500 events over 30 bins, shapes alternating between the
 * normal and mixture test truths, some units sparse with many empty bins): with smoothing chosen per unit by GCV, every
 * fit is finite, converged, a strict maximum (positive-definite penalised information, hence a
 * finite edf), its clr finite on a grid, and its coordinate covariance positive semi-definite (EJML
 * symmetric eigenvalues).
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
        BatchEstimate pl = PenalizedLikelihoodEstimator.withDefaults(space).withCriterion(SmoothingCriterion.GCV)
                .fitAll(e, counts, null);
        BatchEstimate ss = SmoothingSplineEstimator.withDefaults(space).fitAll(e, counts, null);
        for (BatchEstimate b : List.of(pl, ss)) {
            assertEquals(List.of(), b.flaggedRows());
            // a density exp(clr)/Z is positive wherever its clr is finite (checked in log space:
            // pdf values of undersmoothed sparse units can underflow in empty tails)
            DMatrixRMaj clr = b.densities().clr(0.0, 0.25, 0.5, 0.75, 1.0);
            for (double v : clr.data) {
                assertTrue(Double.isFinite(v));
            }
            for (EstimationDiagnostics d : b.diagnostics()) {
                assertTrue(Double.isFinite(d.smoothing()) && d.smoothing() > 0, d.toString());
                assertTrue(Double.isFinite(d.criterionValue()), d.toString());
                assertTrue(d.estimationVariance() > 0 && Double.isFinite(d.estimationVariance()), d.toString());
                // converged with finite edf: the penalised information J = F + 2λΩ was positive
                // definite at the estimate (a strict maximum); the sandwich J⁻¹FJ⁻¹ is positive
                // semi-definite (singular only where the data carry no information)
                assertTrue(Double.isFinite(d.effectiveDegreesOfFreedom()) && d.effectiveDegreesOfFreedom() > 0, d.toString());
                EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(space.dimension(), false, true);
                assertTrue(eig.decompose(d.covarianceMatrix()));
                double max = 0, min = Double.POSITIVE_INFINITY;
                for (int i = 0; i < space.dimension(); i++) {
                    max = Math.max(max, eig.getEigenvalue(i).real);
                    min = Math.min(min, eig.getEigenvalue(i).real);
                }
                assertTrue(min >= -1e-6 * max, // rounding: eps times cond(J)², large for undersmoothed sparse units
                         "covariance not positive semi-definite: min " + min + " max " + max + " " + d);
            }
            for (double c : b.densities().coordinatesRowMajor()) {
                assertTrue(Double.isFinite(c));
            }
        }
    }

    /** A batch has one diagnostics record per density (a hand-made mismatch is refused, naming both counts). */
    @Test
    void batchNeedsOneDiagnosticsRecordPerDensity() {
        BayesSpace space = BayesSpace.splines(0, 1, 4, 4);
        BatchEstimate b = PenalizedLikelihoodEstimator.withDefaults(space).fitAll(edges(0, 1, 10),
                new int[][] {{3, 1, 4, 1, 5, 9, 2, 6, 5, 3}, {2, 7, 1, 8, 2, 8, 1, 8, 2, 8}}, null);
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> new BatchEstimate(b.densities(), b.diagnostics().subList(0, 1)));
        assertTrue(e.getMessage().contains("2 densities but 1 diagnostics"), e.getMessage());
        assertEquals(b, new BatchEstimate(b.densities(), b.diagnostics()));
    }
}
