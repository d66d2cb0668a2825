package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;

/** Bad input: each an IllegalArgumentException naming the unit id and bin (or value index). */
class EstimationBadInputTest {
    private static final BayesSpace SPACE = BayesSpace.splines(0, 1, 4, 3);
    private static final double[] EDGES = {0, 0.2, 0.4, 0.6, 0.8, 1.0};
    private static final PenalizedLikelihoodEstimator PL = PenalizedLikelihoodEstimator.withDefaults(SPACE);
    private static final SmoothingSplineEstimator SS = SmoothingSplineEstimator.withDefaults(BayesSpace.splines(0, 1, 2, 0));
    private static final String[] IDS = {"north", "south"};

    private static void fails(String regex, Executable e) {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, e);
        assertTrue(ex.getMessage().matches(regex), "message '" + ex.getMessage() + "' does not match " + regex);
    }

    @Test
    void negativeCount() {
        fails("unit 'south' \\(row 1\\), bin 2 \\[0\\.4, 0\\.6\\): count -1 is negative; counts must be >= 0",
                () -> PL.fitAll(EDGES, new int[][] {{1, 2, 3, 4, 5}, {1, 2, -1, 4, 5}}, IDS));
        fails("unit 'south' \\(row 1\\), bin 2 .*count -1\\.0 is not allowed.*",
                () -> SS.fitAll(EDGES, new double[][] {{1, 2, 3, 4, 5}, {1, 2, -1, 4, 5}}, IDS));
    }

    @Test
    void nanCount() {
        fails("unit 'north' \\(row 0\\), bin 4 \\[0\\.8, 1\\.0\\): count NaN is not allowed; counts must be finite and >= 0",
                () -> PL.fitAll(EDGES, new double[][] {{1, 2, 3, 4, Double.NaN}, {1, 2, 1, 4, 5}}, IDS));
    }

    @Test
    void nonIntegerCount() {
        fails("unit 'north' \\(row 0\\), bin 1 \\[0\\.2, 0\\.4\\): count 2\\.5 is not a whole number.*",
                () -> PL.fitAll(EDGES, new double[][] {{1, 2.5, 3, 4, 5}, {1, 2, 1, 4, 5}}, IDS));
        // allowed as weighted counts, except for cross-validation, which splits events
        PL.withFractionalCounts(true).withSmoothing(0.01).fit(EDGES, new double[] {1, 2.5, 3, 4, 5});
        fails("unit row 0, bin 1 .*count 2\\.5 is not a whole number.*",
                () -> PL.withFractionalCounts(true).withCrossValidation(3, 1).fit(EDGES, new double[] {1, 2.5, 3, 4, 5}));
    }

    @Test
    void edgesNotIncreasingOrOutsideDomain() {
        fails("bin edges must be strictly increasing: edge 2 = 0\\.2 does not exceed edge 1 = 0\\.2",
                () -> PL.fit(new double[] {0, 0.2, 0.2, 1}, new int[] {1, 1, 1}));
        fails("bin edge 3 = 1\\.5 lies outside the domain \\[0\\.0, 1\\.0\\].*",
                () -> PL.fit(new double[] {0, 0.2, 0.4, 1.5}, new int[] {1, 1, 1}));
        fails("bin edge 1 = NaN lies outside the domain.*",
                () -> SS.fit(new double[] {0, Double.NaN, 1}, new int[] {1, 1}));
        fails("unit row 0: 3 counts for 5 bins", () -> PL.fit(EDGES, new int[] {1, 1, 1}));
    }

    @Test
    void zeroTotal() {
        fails("unit 'south' \\(row 1\\): total count is 0 \\(every bin empty\\).*ZeroTotalPolicy\\.REFERENCE",
                () -> PL.fitAll(EDGES, new int[][] {{1, 2, 3, 4, 5}, {0, 0, 0, 0, 0}}, IDS));
        fails("unit 'south' \\(row 1\\): total count is 0.*",
                () -> SS.fitAll(EDGES, new int[][] {{1, 2, 3, 4, 5}, {0, 0, 0, 0, 0}}, IDS));
    }

    @Test
    void valuesOutsideDomainAndEmptySample() {
        fails("unit 'south' \\(row 1\\), value 2 = 1\\.2 lies outside the domain \\[0\\.0, 1\\.0\\].*",
                () -> PL.fitAllSamples(new double[][] {{0.5}, {0.1, 0.2, 1.2}}, null, IDS));
        fails("unit row 0, value 0 = NaN lies outside the domain.*", () -> PL.fitSample(new double[] {Double.NaN}));
        fails("unit 'north' \\(row 0\\): empty sample \\(0 values, total weight 0\\.0\\).*",
                () -> PL.fitAllSamples(new double[][] {{}, {0.3}}, null, IDS));
        fails("unit row 0, value 1: weight -1\\.0 is not allowed.*",
                () -> PL.fitSample(new double[] {0.1, 0.2}, new double[] {1, -1}));
        fails("GCV needs binned counts.*",
                () -> PL.withCriterion(SmoothingCriterion.GCV).fitSample(new double[] {0.1, 0.2}));
    }

    @Test
    void badOptions() {
        fails("smoothing parameter must be finite and >= 0, got NaN", () -> PL.withSmoothing(Double.NaN));
        fails("penalty order must be in \\[1, 3\\].*got 4", () -> PL.withPenaltyOrder(4));
        fails("number of folds must be in \\[2, 50\\], got 1", () -> PL.withCrossValidation(1, 0));
        fails("the smoothing spline needs at least K \\+ 2 = .*", () -> SmoothingSplineEstimator.withDefaults(SPACE)
                .fit(new double[] {0, 0.5, 1}, new int[] {1, 2}));
    }
}
