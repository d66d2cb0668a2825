package io.densa.core.estimate;

import static io.densa.core.estimate.EstimationTestSupport.edges;
import static io.densa.core.estimate.EstimationTestSupport.rng;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.EstimationTestSupport.Truth;
import org.apache.commons.math3.random.RandomGenerator;
import org.apache.commons.math3.stat.correlation.Covariance;
import org.junit.jupiter.api.Test;

/**
 * Calibration of the reported coordinate covariance (sandwich J⁻¹MJ⁻¹ at a fixed λ, M the
 * empirical information with the n/(n − edf) factor): over many simulated replicates of
 * one unit, the trace of the empirical covariance of the estimated coordinates (Commons Math
 * {@link Covariance}) must match the mean reported trace within 20 % for dense counts (2,000
 * events over 50 bins), 100 events over 50 bins and raw samples of 1,000 and 100 observations,
 * and within 25 % (lower side) for 40 and 20 events over 50 bins and 40 observations.
 * In these λ is fixed, taken from the default (marginal-likelihood) choice on a pilot
 * replicate, and the reported covariance is the one conditional on λ. A further test lets every
 * replicate choose its own λ, where the reported covariance adds the first-order effect of the
 * uncertainty of λ̂ (observed with AICc per replicate, which has no such term: reported /
 * empirical 0.3 at 2,000 events, 0.2 at 100, 0.28 at 40, dominated by a few replicates whose
 * criterion picked a much smaller λ).
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
     * Sparse counts, 100 events over 50 bins: within 20 % (observed 0.94). 40 and 20 events:
     * observed 0.89 and 0.94 (0.81 and 0.80 before the reference prior), asserted 0.75 &lt; ratio
     * &lt; 1.2. The remaining under-report is the
     * first-order linearisation itself at these λ (the exact first-order variance at the penalised
     * target, with the true score variance, is already 5–20 % below the empirical one when λ is
     * smaller than the AIC choice), plus the Monte Carlo error of a trace from 400 replicates (about
     * ±7 %). The model-based meat F over-reported by 30–40 % here, because a strongly smoothed fit
     * is not the law of the data; see {@link PenalizedLikelihoodEstimator}.
     */
    @Test
    void sparseCountsCovarianceIsCalibrated() {
        double r100 = ratio(100, false);
        assertTrue(r100 > 0.8 && r100 < 1.2, "100 events: reported / empirical trace = " + r100);
        for (int events : new int[] {40, 20}) {
            double ratio = ratio(events, false);
            assertTrue(ratio > 0.75 && ratio < 1.2, events + " events: reported / empirical trace = " + ratio);
        }
    }

    /**
     * Raw samples (empirical information of the sample as meat): 1,000 and 100 observations within
     * 20 % (observed 0.96, 0.94), 40 observations asserted 0.75 &lt; ratio &lt; 1.2 (observed 0.90,
     * 0.81 before the reference prior; the model-based meat gave 1.06, 1.23 and 1.26).
     */
    @Test
    void sampleCovarianceIsCalibrated() {
        for (int n : new int[] {1000, 100}) {
            double ratio = ratio(n, true);
            assertTrue(ratio > 0.8 && ratio < 1.2, n + " observations: reported / empirical trace = " + ratio);
        }
        double r40 = ratio(40, true);
        assertTrue(r40 > 0.75 && r40 < 1.2, "40 observations: reported / empirical trace = " + r40);
    }

    /**
     * λ chosen per replicate by the default marginal likelihood, the reported covariance including
     * the smoothing-parameter uncertainty term (Wood, Pya &amp; Säfken 2016; see
     * {@link PenalizedLikelihoodEstimator}): 2,000 and 100 events within 20 % (observed 0.98,
     * 0.95), 40 events asserted 0.7 &lt; ratio &lt; 1.2 (observed 0.91; 0.81 before the reference
     * prior, 0.51 without the term).
     */
    @Test
    void perReplicateSmoothingCovarianceIsCalibrated() {
        Truth truth = EstimationTestSupport.normal();
        BayesSpace space = BayesSpace.splines(0, 1, 4, 8);
        double[] e = edges(0, 1, 50);
        for (int events : new int[] {2000, 100, 40}) {
            RandomGenerator r = rng(12345);
            int[][] counts = new int[REPLICATES][];
            for (int i = 0; i < REPLICATES; i++) {
                counts[i] = truth.counts(events, 50, r);
            }
            BatchEstimate b = PenalizedLikelihoodEstimator.withDefaults(space).fitAll(e, counts, null);
            assertEquals(0, b.flaggedRows().size());
            int noted = 0;
            for (EstimationDiagnostics d : b.diagnostics()) {
                noted += d.reason().contains("lambda weakly determined") ? 1 : 0;
            }
            // λ is well determined here: no replicate carries the "weakly determined" note
            assertEquals(0, noted, events + " events: replicates noted as weakly determined");
            double ratio = meanReported(b) / empiricalTrace(b);
            double lo = events >= 100 ? 0.8 : 0.7;
            assertTrue(ratio > lo && ratio < 1.2, events + " events: reported / empirical trace = " + ratio);
        }
    }

    /**
     * Sparse daily histograms (365 bins, cubic splines with K = 24), λ chosen per replicate: the
     * criterion can be flat over decades of λ, where its local curvature is near 0 and the
     * first-order term alone reported up to 816 times the empirical variance of one replicate
     * (mean over replicates 3.8; a study of 300 replicates per case, see the CHANGELOG) before the
     * plausible-range bound (see {@link PenalizedLikelihoodEstimator}). Asserted, for 50 and 20
     * events from two smooth seasonal truths (300 replicates each): every replicate's reported
     * trace at most 6 times the empirical trace, and their mean within [0.7, 1.3] of it. Measured:
     * 50 events mean 0.91, largest 3.7; 20 events 1.01 and 3.6 (without the bound 1.01 and 7.1,
     * 1.24 and 15.2: the test fails there). The replicates whose term came from the bound say so in
     * their diagnostics' reason (93 and 113 of 300; none in the normal-truth test above).
     */
    @Test
    void perReplicateSmoothingCovarianceIsBoundedForSparseDailyCounts() {
        BayesSpace space = BayesSpace.splines(0, 365, 4, 21);
        double[] e = edges(0, 365, 365);
        double[][] truths = {{0.4, 200, 0.8, 30}, {1.8, 300, 0.1, 150}};
        int[] events = {50, 20};
        for (int t = 0; t < truths.length; t++) {
            double[] p = seasonal(truths[t]);
            java.util.SplittableRandom r = new java.util.SplittableRandom(2026 + t);
            int reps = 300;
            int[][] counts = new int[reps][365];
            for (int i = 0; i < reps; i++) {
                for (int n = 0; n < events[t]; n++) {
                    double u = r.nextDouble();
                    int j = 0;
                    while (j < 364 && u >= p[j]) {
                        u -= p[j];
                        j++;
                    }
                    counts[i][j]++;
                }
            }
            BatchEstimate b = PenalizedLikelihoodEstimator.withDefaults(space).fitAll(e, counts, null);
            double empirical = empiricalTrace(b);
            double mean = meanReported(b) / empirical;
            double worst = 0;
            for (double v : b.estimationVariances()) {
                worst = Math.max(worst, v / empirical);
            }
            int noted = 0;
            for (EstimationDiagnostics d : b.diagnostics()) {
                noted += d.reason().contains("lambda weakly determined") ? 1 : 0;
            }
            // the diagnostics say where the bound gave the term (measured: 93 of 300 at 50 events, 113 at 20)
            assertTrue(noted >= 30 && noted <= 200,
                    events[t] + " events: " + noted + " replicates noted as weakly determined");
            assertTrue(worst <= 6, events[t] + " events: largest reported / empirical trace = " + worst);
            assertTrue(mean > 0.7 && mean < 1.3, events[t] + " events: mean reported / empirical trace = " + mean);
        }
    }

    /** Bin probabilities of a smooth seasonal law: 0.2 + α/(1 + (d(x, φ)/40)²) + β/(1 + (d(x, ψ)/12)²), d circular. */
    private static double[] seasonal(double[] par) {
        double[] w = new double[365];
        double s = 0;
        for (int j = 0; j < 365; j++) {
            double x = j + 0.5;
            double d1 = Math.abs(x - par[1]);
            d1 = Math.min(d1, 365 - d1) / 40;
            double d2 = Math.abs(x - par[3]);
            d2 = Math.min(d2, 365 - d2) / 12;
            w[j] = 0.2 + par[0] / (1 + d1 * d1) + par[2] / (1 + d2 * d2);
            s += w[j];
        }
        for (int j = 0; j < 365; j++) {
            w[j] /= s;
        }
        return w;
    }

    private static double empiricalTrace(BatchEstimate b) {
        double[][] cov = new Covariance(b.densities().coordinates()).getCovarianceMatrix().getData();
        double t = 0;
        for (int i = 0; i < cov.length; i++) {
            t += cov[i][i];
        }
        return t;
    }

    private static double meanReported(BatchEstimate b) {
        double m = 0;
        for (double v : b.estimationVariances()) {
            m += v / b.size();
        }
        return m;
    }

    private static double ratio(int events, boolean sample) {
        Truth truth = EstimationTestSupport.normal();
        BayesSpace space = BayesSpace.splines(0, 1, 4, 8);
        int bins = 50;
        double[] e = edges(0, 1, bins);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space);
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
        double empirical = empiricalTrace(b);
        double reported = meanReported(b);
        return reported / empirical;
    }
}
