package io.densa.core;

import static io.densa.core.EstimationTestSupport.edges;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Numerical edges of the estimators found by fuzzing: finite input gives finite diagnostics or a
 * clear IllegalArgumentException, never a converged fit with NaN or ∞ in it.
 */
class EstimationEdgeCasesTest {
    private static final BayesSpace SPACE = BayesSpace.splines(0, 1, 4, 5);
    private static final double[] EDGES = edges(0, 1, 20);

    private static void assertFinite(UnitEstimate u) {
        EstimationDiagnostics d = u.diagnostics();
        assertTrue(d.converged(), d.toString());
        for (double c : u.density().coordinates()) {
            assertTrue(Double.isFinite(c), d.toString());
        }
        assertTrue(Double.isFinite(d.criterionValue()) && Double.isFinite(d.estimationVariance())
                && Double.isFinite(d.logLikelihood()) && Double.isFinite(d.effectiveDegreesOfFreedom()), d.toString());
        for (double v : d.covariance()) {
            assertTrue(Double.isFinite(v), d.toString());
        }
    }

    /** A subnormal count (4.9e-324) used to give NaN coordinates, GCV and variance. */
    @Test
    void smoothingSplineWithSubnormalCountIsFinite() {
        double[] c = new double[20];
        Arrays.fill(c, 3);
        c[4] = Double.MIN_VALUE;
        assertFinite(SmoothingSplineEstimator.of(SPACE).fit(EDGES, c));
    }

    /**
     * Multiplicative zero replacement with counts near 6e7 and a tiny δ used to report a converged
     * fit with log-likelihood −∞ (the fitted density underflowed in an occupied bin).
     */
    @Test
    void multiplicativeReplacementWithLargeCountsHasFiniteLogLikelihood() {
        double[] c = {4216247, 15526871, 29694526, 15531565, 55125777, 38065573, 52593749, 0, 0, 0, 0, 0, 0, 0, 0,
            57069961, 1315168, 0, 0, 14093509};
        assertFinite(SmoothingSplineEstimator.of(SPACE)
                .withZeroReplacement(ZeroReplacement.multiplicative(2.025468424977529E-273)).fit(EDGES, c));
    }

    /**
     * λ = 0: with the reference prior the marginal likelihood is defined and finite; without it the
     * criterion is undefined, reported as +∞ with the reason; the smoothing spline's GCV is finite.
     */
    @Test
    void zeroSmoothingReportsTheCriterionHonestly() {
        double[] c = new double[20];
        Arrays.fill(c, 5);
        c[7] = 12;
        assertFinite(PenalizedLikelihoodEstimator.of(SPACE).withSmoothing(0).fit(EDGES, c));
        EstimationDiagnostics d = PenalizedLikelihoodEstimator.of(SPACE).withSmoothing(0).withReferencePrior(0)
                .fit(EDGES, c).diagnostics();
        assertTrue(d.converged());
        assertEquals(Double.POSITIVE_INFINITY, d.criterionValue());
        assertTrue(d.reason().startsWith("marginal likelihood undefined at lambda = 0"), d.reason());
        assertFinite(SmoothingSplineEstimator.of(SPACE).withSmoothing(0).fit(EDGES, c));
    }

    /** A tolerance below double rounding or an unbounded iteration budget is refused up front. */
    @Test
    void toleranceAndIterationBudgetAreValidated() {
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.of(SPACE);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> est.withTolerance(1e-300));
        assertTrue(e.getMessage().matches("tolerance must be in \\[1.0E-15, 0.001\\].*got 1.0E-300"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> est.withTolerance(Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> est.withTolerance(0.5));
        e = assertThrows(IllegalArgumentException.class, () -> est.withMaxIterations(Integer.MAX_VALUE));
        assertTrue(e.getMessage().matches("max iterations must be in \\[1, 10000\\], got 2147483647"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> est.withMaxIterations(0));
        double[] c = new double[20];
        Arrays.fill(c, 4);
        c[3] = 30;
        assertFinite(est.withTolerance(PenalizedLikelihoodEstimator.MIN_TOLERANCE)
                .withMaxIterations(PenalizedLikelihoodEstimator.MAX_ITERATIONS_LIMIT).fit(EDGES, c));
    }

    /**
     * Cross-validation folds of counts are a multinomial split per bin: every event lands in exactly
     * one fold, and each fold's share of a large bin is binomial(n, 1/k) (mean n/k, variance
     * n (1/k)(1 − 1/k), definition of the binomial): within 6 standard deviations.
     */
    @Test
    void countFoldsAreAMultinomialSplit() {
        double[] counts = {0, 1, 7, 1_000_000, 2_000_000_000};
        int k = 5;
        double[][] test = new double[k][counts.length];
        double[] totals = new double[k];
        PenalizedLikelihoodEstimator.splitCounts(counts, k, new SplittableRandom(3), test, totals);
        for (int j = 0; j < counts.length; j++) {
            double s = 0;
            for (int f = 0; f < k; f++) {
                assertTrue(test[f][j] >= 0 && test[f][j] == Math.rint(test[f][j]));
                s += test[f][j];
            }
            assertEquals(counts[j], s, 0.0, "bin " + j);
        }
        for (int j = 3; j < counts.length; j++) {
            double n = counts[j];
            double sd = Math.sqrt(n * 0.2 * 0.8);
            for (int f = 0; f < k; f++) {
                assertEquals(n / k, test[f][j], 6 * sd, "bin " + j + " fold " + f);
            }
        }
        double[][] big = new double[k][1];
        assertThrows(IllegalArgumentException.class, () -> PenalizedLikelihoodEstimator.splitCounts(
                new double[] {3e9}, k, new SplittableRandom(1), big, new double[k]));
    }

    /** 3 × 10⁸ events: cross-validation no longer holds one int per event. */
    @Test
    void crossValidationOnHundredsOfMillionsOfEvents() {
        double[] c = new double[20];
        for (int j = 0; j < 20; j++) {
            c[j] = Math.round(3e7 * Math.exp(-Math.pow((j - 9.5) / 5, 2)));
        }
        assertFinite(PenalizedLikelihoodEstimator.of(SPACE).withCrossValidation(5, 9).fit(EDGES, c));
    }

    /** A null id is named by its row instead of a NullPointerException from deep inside. */
    @Test
    void nullIdIsRejectedWithItsRow() {
        int[][] counts = {{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, new int[20]};
        counts[1][3] = 4;
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> PenalizedLikelihoodEstimator.of(SPACE).fitAll(EDGES, counts, new String[] {"a", null}));
        assertTrue(e.getMessage().startsWith("id of unit row 1 is null"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> SmoothingSplineEstimator.of(SPACE).fitAll(EDGES, counts, new String[] {null, "b"}));
        assertTrue(e.getMessage().startsWith("id of unit row 0 is null"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> PenalizedLikelihoodEstimator.of(SPACE)
                .fitAllSamples(new double[][] {{0.5}}, null, new String[] {null}));
    }
}
