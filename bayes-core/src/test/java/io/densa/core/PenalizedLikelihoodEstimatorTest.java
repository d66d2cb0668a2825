package io.densa.core;

import static io.densa.core.EstimationTestSupport.edges;
import static io.densa.core.EstimationTestSupport.ks;
import static io.densa.core.EstimationTestSupport.rng;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.EstimationTestSupport.Truth;
import java.util.List;
import org.apache.commons.math3.random.RandomGenerator;
import org.ejml.data.DMatrixRMaj;
import org.junit.jupiter.api.Test;

class PenalizedLikelihoodEstimatorTest {

    /**
     * Closed form (REFERENCES.md §2, derived there): on [−1, 1] with Lebesgue reference,
     * clr N(0, 0.5²)(x) = −2x² + 2/3, so ∫ (clr'')² dx = ∫ 16 dx = 32 and ∫ (clr')² dx = ∫ 16 x² dx
     * = 32/3. The quadratic lies exactly in cubic-spline and quartic-polynomial spaces.
     */
    @Test
    void penaltyMatchesClosedFormForNormalClr() {
        for (BayesSpace space : List.of(BayesSpace.splines(-1, 1, 4, 7), BayesSpace.polynomials(-1, 1, 4),
                BayesSpace.splines(-1, 1, 5, new double[] {-0.6, -0.1, 0.3, 0.35, 0.8}))) {
            Density f = space.project(x -> Math.exp(-x * x / (2 * 0.25))).density();
            for (int order = 1; order <= 2; order++) {
                DMatrixRMaj omega = PenalizedLikelihoodEstimator.of(space).withPenaltyOrder(order).penalty();
                double[] c = f.coordinates();
                double q = 0;
                for (int i = 0; i < c.length; i++) {
                    for (int j = 0; j < c.length; j++) {
                        q += c[i] * omega.get(i, j) * c[j];
                    }
                }
                double expected = order == 2 ? 32.0 : 32.0 / 3.0;
                assertEquals(expected, q, 1e-9 * expected, space + " order " + order);
            }
        }
    }

    /**
     * Simulation recovery (fixed seeds): B2 distance to the truth's projection onto the space and KS
     * distance to the truth, medians over 5 replicates, shrink over n = 200, 2,000, 20,000, for samples
     * and for 50-bin counts. Medians, because AIC occasionally undersmooths one replicate (a known
     * tendency of AIC for smoothing; common practice), which inflates the B2 distance through the
     * tails.
     */
    @Test
    void recoversKnownDensitiesFromSamplesAndCounts() {
        for (Truth truth : List.of(EstimationTestSupport.normal(), EstimationTestSupport.beta(),
                EstimationTestSupport.gamma(), EstimationTestSupport.mixture())) {
            BayesSpace space = BayesSpace.splines(truth.a, truth.b, 4, 12);
            Density target = space.project(truth.pdfFunction()).density();
            PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.of(space);
            int[] sizes = {200, 2000, 20000};
            int reps = 5;
            double[] dS = new double[3], ksS = new double[3], dC = new double[3], ksC = new double[3];
            for (int s = 0; s < 3; s++) {
                double[][] m = new double[4][reps];
                for (int rep = 0; rep < reps; rep++) {
                    RandomGenerator r = rng(1000 + 10 * s + rep);
                    UnitEstimate fs = est.fitSample(truth.sample(sizes[s], r));
                    UnitEstimate fc = est.fit(edges(truth.a, truth.b, 50), truth.counts(sizes[s], 50, r));
                    assertTrue(fs.diagnostics().converged(), fs.diagnostics().toString());
                    assertTrue(fc.diagnostics().converged(), fc.diagnostics().toString());
                    m[0][rep] = fs.density().distance(target);
                    m[1][rep] = fc.density().distance(target);
                    m[2][rep] = ks(fs.density(), truth);
                    m[3][rep] = ks(fc.density(), truth);
                }
                dS[s] = median(m[0]);
                dC[s] = median(m[1]);
                ksS[s] = median(m[2]);
                ksC[s] = median(m[3]);
            }
            System.out.printf("recovery %-8s samples B2 %s KS %s | counts B2 %s KS %s%n", truth.name,
                    java.util.Arrays.toString(dS), java.util.Arrays.toString(ksS), java.util.Arrays.toString(dC),
                    java.util.Arrays.toString(ksC));
            for (double[] d : List.of(dS, dC, ksS, ksC)) {
                assertTrue(d[1] < d[0] && d[2] < d[1], truth.name + " not shrinking: " + java.util.Arrays.toString(d));
            }
            // bounds at n = 20,000 (stated, generous relative to the observed values)
            assertTrue(ksS[2] < 0.015 && ksC[2] < 0.015, truth.name + " KS at n = 20000");
            assertTrue(dS[2] < 0.25 && dC[2] < 0.25, truth.name + " B2 at n = 20000");
        }
    }

    private static double median(double[] v) {
        double[] c = v.clone();
        java.util.Arrays.sort(c);
        return c[c.length / 2];
    }

    /** fitAll on the common pool equals the serial path bit for bit (coordinates and diagnostics). */
    @Test
    void parallelBatchIsBitIdenticalToSerial() {
        Truth truth = EstimationTestSupport.mixture();
        RandomGenerator r = rng(7);
        int n = 300;
        int[][] counts = new int[n][];
        String[] ids = new String[n];
        for (int i = 0; i < n; i++) {
            counts[i] = truth.counts(20 + r.nextInt(400), 40, r);
            ids[i] = "unit-" + i;
        }
        BayesSpace space = BayesSpace.splines(0, 1, 4, 10);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.of(space);
        BatchEstimate par = est.withParallel(true).fitAll(edges(0, 1, 40), counts, ids);
        BatchEstimate ser = est.withParallel(false).fitAll(edges(0, 1, 40), counts, ids);
        assertArrayEquals(ser.densities().coordinatesRowMajor(), par.densities().coordinatesRowMajor());
        assertEquals(ser.diagnostics(), par.diagnostics());
        assertEquals(List.of(ids), par.densities().ids());
        // a single fit equals the batch row (same index → same arithmetic)
        UnitEstimate one = est.fit(edges(0, 1, 40), counts[0]);
        assertArrayEquals(one.density().coordinates(), par.densities().get(0).coordinates());
    }
}
