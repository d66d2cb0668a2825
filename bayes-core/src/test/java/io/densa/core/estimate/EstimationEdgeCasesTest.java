package io.densa.core.estimate;

import static io.densa.core.estimate.EstimationTestSupport.edges;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
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
        assertFinite(SmoothingSplineEstimator.withDefaults(SPACE).fit(EDGES, c));
    }

    /**
     * Multiplicative zero replacement with counts near 6e7 and a tiny δ used to report a converged
     * fit with log-likelihood −∞ (the fitted density underflowed in an occupied bin).
     */
    @Test
    void multiplicativeReplacementWithLargeCountsHasFiniteLogLikelihood() {
        double[] c = {4216247, 15526871, 29694526, 15531565, 55125777, 38065573, 52593749, 0, 0, 0, 0, 0, 0, 0, 0,
            57069961, 1315168, 0, 0, 14093509};
        assertFinite(SmoothingSplineEstimator.withDefaults(SPACE)
                .withZeroReplacement(ZeroReplacement.multiplicative(2.025468424977529E-273)).fit(EDGES, c));
    }

    /**
     * λ = 0: with the reference prior the marginal likelihood is defined and finite; without it the
     * marginal likelihood is undefined there, and AIC = −2ℓ + 2 edf (Akaike 1974) is reported instead,
     * as the reason says; the smoothing spline's GCV is finite.
     */
    @Test
    void zeroSmoothingReportsTheCriterionHonestly() {
        double[] c = new double[20];
        Arrays.fill(c, 5);
        c[7] = 12;
        assertFinite(PenalizedLikelihoodEstimator.withDefaults(SPACE).withSmoothing(0).fit(EDGES, c));
        EstimationDiagnostics d = PenalizedLikelihoodEstimator.withDefaults(SPACE).withSmoothing(0).withReferencePrior(0)
                .fit(EDGES, c).diagnostics();
        assertTrue(d.converged());
        assertEquals(SmoothingCriterion.AIC, d.criterion());
        assertEquals(-2 * d.logLikelihood() + 2 * d.effectiveDegreesOfFreedom(), d.criterionValue(), 0.0);
        assertTrue(d.reason().startsWith("the marginal likelihood is undefined at lambda = 0 without the reference"
                + " prior") && d.reason().endsWith("AIC is reported instead"), d.reason());
        assertFinite(SmoothingSplineEstimator.withDefaults(SPACE).withSmoothing(0).fit(EDGES, c));
    }

    // ---- fuzz findings (reproductions from the fuzz of issue 9 §4), edges E and two small spaces

    private static final double[] E = {0, 0.1, 0.25, 0.5, 0.6, 0.9, 1};
    private static final BayesSpace SPL = BayesSpace.splines(0, 1, 3, 2);
    private static final BayesSpace STEPS = BayesSpace.steps(0, 1, 4);

    /** Every number finite, covariance diagonal ≥ 0 (the status may be anything). */
    private static void assertFiniteAnyStatus(UnitEstimate u) {
        EstimationDiagnostics d = u.diagnostics();
        for (double c : u.density().coordinates()) {
            assertTrue(Double.isFinite(c), d.toString());
        }
        assertTrue(Double.isFinite(d.criterionValue()) && Double.isFinite(d.smoothing())
                && Double.isFinite(d.estimationVariance()) && Double.isFinite(d.logLikelihood())
                && Double.isFinite(d.effectiveDegreesOfFreedom()) && d.effectiveDegreesOfFreedom() >= 0, d.toString());
        double[] cov = d.covariance();
        int k = u.density().coordinates().length;
        for (int i = 0; i < k; i++) {
            assertTrue(cov[i * k + i] >= 0, d.toString());
        }
        for (double v : cov) {
            assertTrue(Double.isFinite(v), d.toString());
        }
    }

    private static void assertTooLarge(org.junit.jupiter.api.function.Executable fit) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, fit);
        assertTrue(e.getMessage().matches("unit row 0: total (count|weight) .* is too large; the total must be at most"
                + " 2\\^53 = 9.007199254740992E15.*"), e.getMessage());
    }

    /**
     * PL-1, PL-3, SS-2: totals beyond 2⁵³ (criterion, λ or log-likelihood used to overflow) are
     * refused naming the unit; the bound 2⁵³ is the largest integer up to which every count is a
     * double (IEEE 754 binary64: 53-bit significand).
     */
    @Test
    void totalsBeyondTwoToThe53AreRefused() {
        PenalizedLikelihoodEstimator frac = PenalizedLikelihoodEstimator.withDefaults(SPL).withParallel(false)
                .withFractionalCounts(true);
        assertTooLarge(() -> frac.fit(E, new double[] {7, 0.5, 0.5, 7, 7, 1e308}));
        assertTooLarge(() -> frac.withCriterion(SmoothingCriterion.AIC)
                .fit(E, new double[] {4, 0.5, 1e308, 4.9e-324, 26, 4.9e-324}));
        assertTooLarge(() -> PenalizedLikelihoodEstimator.withDefaults(STEPS).withFractionalCounts(true)
                .fit(E, new double[] {3, 0.5, 20, 15, 30, 1e308}));
        assertTooLarge(() -> frac.fit(E, new double[] {1e308, 1e308, 1e308, 1e308, 1e308, 1e308})); // sum overflows
        assertTooLarge(() -> PenalizedLikelihoodEstimator.withDefaults(SPL).fitSample(new double[] {0.2, 0.5, 0.7},
                new double[] {1e-236, 1.7976931348623157E308, 1}));
        assertTooLarge(() -> SmoothingSplineEstimator.withDefaults(SPL).fit(E, new double[] {7, 0.5, 0.5, 7, 7, 1e308}));
        // just below the bound is accepted and finite
        double big = 0x1p53 / 8;
        assertFinite(PenalizedLikelihoodEstimator.withDefaults(SPL).withFractionalCounts(true)
                .fit(E, new double[] {big, big / 2, big, big, big / 4, big}));
    }

    /**
     * PL-1 (λ = 0 with the default prior): the marginal likelihood is finite; PL-4 (AICc on subnormal
     * counts, N ≤ edf + 1 at every λ): refused with the reason; the same counts with the default
     * criterion give finite numbers.
     */
    @Test
    void undefinedCriterionIsRefusedAndSubnormalCountsAreFinite() {
        assertFinite(PenalizedLikelihoodEstimator.withDefaults(SPL).withParallel(false).withSmoothing(0)
                .fit(E, new int[] {3, 5, 8, 2, 6, 1}));
        double[] tiny = new double[6];
        Arrays.fill(tiny, Double.MIN_VALUE);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> PenalizedLikelihoodEstimator
                .withDefaults(STEPS).withFractionalCounts(true).withCriterion(SmoothingCriterion.AICC).fit(E, tiny));
        assertTrue(e.getMessage().matches("unit #0: AICc is undefined with N = 3.0E-323 <= edf \\+ 1 = .*choose a"
                + " criterion defined there.*"), e.getMessage());
        assertFiniteAnyStatus(PenalizedLikelihoodEstimator.withDefaults(STEPS).withFractionalCounts(true).fit(E, tiny));
    }

    /**
     * PL-2: all events in two adjacent bins. With the default reference prior the fit converges with
     * finite numbers; without it the penalised information is singular: NOT_CONVERGED, and edf,
     * covariance and criterion are those with the default prior added, as the reason says.
     */
    @Test
    void singularInformationGivesFiniteNumbersAndSaysWhy() {
        double[] c = {14, 14, 0, 0, 0, 0};
        PenalizedLikelihoodEstimator cv = PenalizedLikelihoodEstimator.withDefaults(STEPS).withParallel(false)
                .withFractionalCounts(true).withCrossValidation(4, 7L);
        UnitEstimate u = cv.fit(E, c);
        assertFinite(u);
        UnitEstimate noPrior = cv.withReferencePrior(0).fit(E, c);
        assertFiniteAnyStatus(noPrior);
        assertEquals(EstimationDiagnostics.Status.NOT_CONVERGED, noPrior.diagnostics().status());
        assertTrue(noPrior.diagnostics().reason().contains("edf, covariance and criterion are reported with the"
                + " default reference prior (weight 1.0) added"), noPrior.diagnostics().reason());
    }

    /**
     * PL-3 (empty sample under ZeroTotalPolicy.REFERENCE, λ used to be NaN): the reference density
     * with the reference prior's covariance (P(I)/w) I = I here (Lebesgue on [0, 1]); without a prior,
     * and for the smoothing spline, such units are refused.
     */
    @Test
    void emptyUnitHasThePriorCovariance() {
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(SPL).withParallel(false)
                .withZeroTotal(ZeroTotalPolicy.REFERENCE);
        UnitEstimate u = est.fitSample(new double[] {0.2, 0.3}, new double[] {0, 0});
        assertFiniteAnyStatus(u);
        EstimationDiagnostics d = u.diagnostics();
        assertEquals(EstimationDiagnostics.Status.EMPTY_UNIT_REFERENCE, d.status());
        assertArrayEquals(new double[] {1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1}, d.covariance(), 0.0);
        assertEquals(0.25, est.withReferencePrior(4).fitSample(new double[] {0.2}, new double[] {0})
                .diagnostics().covariance()[0], 1e-15);
        assertThrows(IllegalArgumentException.class, () -> est.withReferencePrior(0)
                .fitSample(new double[] {0.2, 0.3}, new double[] {0, 0}));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> SmoothingSplineEstimator.withDefaults(SPL).withZeroTotal(ZeroTotalPolicy.REFERENCE));
        assertTrue(e.getMessage().startsWith("the smoothing spline cannot return units without events"),
                e.getMessage());
    }

    /**
     * PL-5: identical observations (no information across most directions). The sandwich used to
     * come out slightly indefinite (diagonal −5.5e-7, variance −1.96e-4); it is now positive
     * semi-definite: every eigenvalue ≥ −1e-12 × the largest, checked with EJML's symmetric
     * eigen-decomposition (an independent implementation).
     */
    @Test
    void identicalObservationsGivePositiveSemiDefiniteCovariance() {
        for (SmoothingCriterion crit : new SmoothingCriterion[] {SmoothingCriterion.MARGINAL_LIKELIHOOD,
            SmoothingCriterion.AIC, SmoothingCriterion.AICC, SmoothingCriterion.CROSS_VALIDATION}) {
            for (double x : new double[] {0.5, Math.nextDown(1.0), 0.0}) {
                double[] v = new double[10];
                Arrays.fill(v, x);
                UnitEstimate u = PenalizedLikelihoodEstimator.withDefaults(SPL).withParallel(false).withCriterion(crit)
                        .fitSample(v);
                assertFiniteAnyStatus(u);
                org.ejml.interfaces.decomposition.EigenDecomposition_F64<org.ejml.data.DMatrixRMaj> eig =
                        org.ejml.dense.row.factory.DecompositionFactory_DDRM.eig(4, false, true);
                assertTrue(eig.decompose(u.diagnostics().covarianceMatrix()));
                double max = 0, min = Double.POSITIVE_INFINITY;
                for (int i = 0; i < 4; i++) {
                    max = Math.max(max, eig.getEigenvalue(i).getReal());
                    min = Math.min(min, eig.getEigenvalue(i).getReal());
                }
                assertTrue(min >= -1e-12 * max, crit + " x=" + x + ": eigenvalues in [" + min + ", " + max + "]");
            }
        }
    }

    /** SS-1: a subnormal count (4.9e-324) among ordinary ones gives finite coordinates and diagnostics. */
    @Test
    void smoothingSplineSubnormalCountOnSteps() {
        assertFinite(SmoothingSplineEstimator.withDefaults(STEPS).withParallel(false)
                .fit(E, new double[] {2, 3.8e-191, 9, 4.9e-324, 20, 2.38}));
    }

    /** A tolerance below double rounding or an unbounded iteration budget is refused up front. */
    @Test
    void toleranceAndIterationBudgetAreValidated() {
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(SPACE);
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
        CrossValidationFolds.splitCounts(counts, k, new SplittableRandom(3), test, totals);
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
        assertThrows(IllegalArgumentException.class, () -> CrossValidationFolds.splitCounts(
                new double[] {3e9}, k, new SplittableRandom(1), big, new double[k]));
    }

    /** 3 × 10⁸ events: cross-validation no longer holds one int per event. */
    @Test
    void crossValidationOnHundredsOfMillionsOfEvents() {
        double[] c = new double[20];
        for (int j = 0; j < 20; j++) {
            c[j] = Math.round(3e7 * Math.exp(-Math.pow((j - 9.5) / 5, 2)));
        }
        assertFinite(PenalizedLikelihoodEstimator.withDefaults(SPACE).withCrossValidation(5, 9).fit(EDGES, c));
    }

    /** A null id is named by its row instead of a NullPointerException from deep inside. */
    @Test
    void nullIdIsRejectedWithItsRow() {
        int[][] counts = {{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, new int[20]};
        counts[1][3] = 4;
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> PenalizedLikelihoodEstimator.withDefaults(SPACE).fitAll(EDGES, counts, new String[] {"a", null}));
        assertTrue(e.getMessage().startsWith("id of unit row 1 is null"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class,
                () -> SmoothingSplineEstimator.withDefaults(SPACE).fitAll(EDGES, counts, new String[] {null, "b"}));
        assertTrue(e.getMessage().startsWith("id of unit row 0 is null"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> PenalizedLikelihoodEstimator.withDefaults(SPACE)
                .fitAllSamples(new double[][] {{0.5}}, null, new String[] {null}));
    }
}
