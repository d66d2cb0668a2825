package io.densa.core;

import static io.densa.core.EstimationTestSupport.edges;
import static io.densa.core.EstimationTestSupport.rng;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.EstimationTestSupport.Truth;
import org.apache.commons.math3.random.RandomGenerator;
import org.apache.commons.math3.stat.correlation.Covariance;
import org.junit.jupiter.api.Test;

/**
 * Calibration of the reported coordinate covariance (sandwich J⁻¹FJ⁻¹ at a fixed λ): over many
 * simulated replicates of one unit, the trace of the empirical covariance of the estimated
 * coordinates (Commons Math {@link Covariance}) must match the mean reported trace within 20 %
 * for dense counts (2,000 events over 50 bins) and raw samples; for sparse counts (40–100 events over
 * 50 bins) it is conservative by 30–40 %.
 * λ is fixed (the covariance is conditional on λ; a per-replicate choice adds variability the
 * formula does not describe), taken from an AIC fit of a pilot replicate.
 */
class EstimationCalibrationTest {
    private static final int REPLICATES = 400;

    /** 2,000 events over 50 bins: within 20 %. */
    @Test
    void denseCountsCovarianceIsCalibrated() {
        double ratio = ratio(2000, false);
        assertTrue(ratio > 0.8 && ratio < 1.2, "reported / empirical trace = " + ratio);
    }

    /**
     * Sparse counts, 100 and 40 events over 50 bins: the first-order sandwich over-reports (observed
     * ratios about 1.3 and 1.4 with these seeds), i.e. it is conservative; asserted as
     * 1 &lt; ratio &lt; 1.6. The over-report is not plug-in noise (the sandwich evaluated at the
     * expected counts is as large) but the curvature approximation itself, which overstates the
     * variability of a strongly penalised fit of a few tens of events. Not within the 20 % we aimed
     * for: downstream weights for very sparse units are conservative.
     */
    @Test
    void sparseCountsCovarianceIsConservative() {
        for (int events : new int[] {100, 40}) {
            double ratio = ratio(events, false);
            assertTrue(ratio > 1.0 && ratio < 1.6, events + " events: reported / empirical trace = " + ratio);
        }
    }

    /** 1,000 raw observations: within 20 %. */
    @Test
    void sampleCovarianceIsCalibrated() {
        double ratio = ratio(1000, true);
        assertTrue(ratio > 0.8 && ratio < 1.2, "reported / empirical trace = " + ratio);
    }

    private static double ratio(int events, boolean sample) {
        Truth truth = EstimationTestSupport.normal();
        BayesSpace space = BayesSpace.splines(0, 1, 4, 8);
        int bins = 50;
        double[] e = edges(0, 1, bins);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.of(space);
        RandomGenerator pilotRng = rng(99);
        double lambda = sample ? est.fitSample(truth.sample(events, pilotRng)).diagnostics().smoothing()
                : est.fit(e, truth.counts(events, bins, pilotRng)).diagnostics().smoothing();
        PenalizedLikelihoodEstimator fixed = est.withSmoothing(lambda);
        RandomGenerator r = rng(12345);
        BatchEstimate b;
        if (sample) {
            double[][] values = new double[REPLICATES][];
            for (int i = 0; i < REPLICATES; i++) {
                values[i] = truth.sample(events, r);
            }
            b = fixed.fitAllSamples(values, null, null);
        } else {
            int[][] counts = new int[REPLICATES][];
            for (int i = 0; i < REPLICATES; i++) {
                counts[i] = truth.counts(events, bins, r);
            }
            b = fixed.fitAll(e, counts, null);
        }
        assertEquals(0, b.flaggedRows().size());
        double[][] coords = b.densities().coordinates();
        double empirical = 0;
        double[][] cov = new Covariance(coords).getCovarianceMatrix().getData();
        for (int i = 0; i < cov.length; i++) {
            empirical += cov[i][i];
        }
        double reported = 0;
        for (double v : b.estimationVariances()) {
            reported += v / REPLICATES;
        }
        double ratio = reported / empirical;
        System.out.printf("calibration %s, %d events, lambda %.4g: reported trace %.5g, empirical %.5g, ratio %.3f%n",
                sample ? "sample" : "counts", events, lambda, reported, empirical, ratio);
        return ratio;
    }
}
