package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import org.junit.jupiter.api.Test;

/** Validation and cell merging of {@link DetectionLimits} (the likelihood itself: NewtonPrecisionTest). */
class DetectionLimitsTest {
    private static final BayesSpace SPACE = BayesSpace.splines(0, 10, 4, 6);
    private static final double[] EDGES = {0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10};

    @Test
    void upperLimitMergesTheTopCells() {
        int[] counts = {3, 9, 20, 31, 40, 31, 20, 9, 0, 12};
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(SPACE);
        BatchEstimate b = est.fitAll(EDGES, new int[][] {counts}, null, DetectionLimits.upper(8.5));
        // the same as fitting the merged cells directly: [0,1) … [7,8) and [8, 10] (to rounding: the
        // merged cell integrates over the nodes of its two bins, the direct fit over its own)
        int[] merged = {3, 9, 20, 31, 40, 31, 20, 9, 12};
        double[] cells = {0, 1, 2, 3, 4, 5, 6, 7, 8, 10};
        assertArrayEquals(est.fit(cells, merged).density().coordinates(), b.densities().get(0).coordinates(), 1e-12);
        assertEquals("#0", b.diagnostics().get(0).id());
        assertTrue(b.densities().ids().isEmpty(), "no ids given, none invented");
    }

    @Test
    void idsAndOrderAreKept() {
        int[][] counts = {{0, 0, 0, 30, 40, 31, 20, 9, 2, 1}, {3, 9, 20, 31, 40, 31, 20, 9, 2, 1}};
        BatchEstimate b = PenalizedLikelihoodEstimator.withDefaults(SPACE).fitAll(EDGES, counts, new String[] {"a", "b"},
                DetectionLimits.lower(3, Double.NaN));
        assertEquals("a", b.diagnostics().get(0).id());
        assertEquals("b", b.diagnostics().get(1).id());
        assertEquals(java.util.List.of("a", "b"), b.densities().ids());
        assertFalse(b.diagnostics().get(0).extrapolated(), "the censored cell reaches the domain's end");
    }

    @Test
    void badLimitsAreRejectedNamingTheUnit() {
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(SPACE);
        int[][] counts = {{3, 9, 20, 31, 40, 31, 20, 9, 2, 1}};
        String[] ids = {"site-7"};
        IllegalArgumentException outside = assertThrows(IllegalArgumentException.class,
                () -> est.fitAll(EDGES, counts, ids, DetectionLimits.lower(11)));
        assertTrue(outside.getMessage().contains("site-7") && outside.getMessage().contains("outside"),
                outside.getMessage());
        IllegalArgumentException all = assertThrows(IllegalArgumentException.class,
                () -> est.fitAll(EDGES, counts, ids, new DetectionLimits(new double[] {4.2}, new double[] {4.7})));
        assertTrue(all.getMessage().contains("every bin is censored"), all.getMessage());
        assertThrows(IllegalArgumentException.class, () -> est.fitAll(EDGES, counts, ids, DetectionLimits.lower(1, 2)));
        assertThrows(IllegalArgumentException.class, () -> new DetectionLimits(new double[] {5}, new double[] {4}));
        assertThrows(IllegalArgumentException.class, () -> DetectionLimits.lower(Double.POSITIVE_INFINITY));
    }

    @Test
    void inputsAreNotModified() {
        double[] lo = {2.5};
        DetectionLimits d = DetectionLimits.lower(lo);
        lo[0] = 7;
        assertEquals(2.5, d.lower()[0]);
        int[][] counts = {{3, 9, 20, 31, 40, 31, 20, 9, 2, 1}};
        int[] copy = counts[0].clone();
        PenalizedLikelihoodEstimator.withDefaults(SPACE).fitAll(EDGES, counts, null, d);
        assertArrayEquals(copy, counts[0]);
    }

    /**
     * The limits of empty end runs: a run of at least two empty bins at an end gives a limit at the
     * lower edge of the first occupied bin from that end; a single empty bin, a single occupied bin
     * or no events give none.
     */
    @Test
    void emptyEndsNameTheFirstOccupiedBinFromEachEnd() {
        double[][] counts = {
            {0, 0, 0, 30, 40, 31, 20, 9, 0, 0}, // both ends: lower e_3, upper e_7
            {0, 9, 20, 31, 40, 31, 20, 9, 2, 0}, // single empty bins: none
            {0, 0, 0, 0, 50, 0, 0, 0, 0, 0}, // one occupied bin: none
            {0, 0, 0, 0, 0, 0, 0, 0, 0, 0}, // no events: none
            {0, 0, 5, 31, 40, 31, 20, 9, 2, 1}}; // lower only, e_2
        DetectionLimits d = DetectionLimits.emptyEnds(EDGES, counts);
        assertArrayEquals(new double[] {3, Double.NaN, Double.NaN, Double.NaN, 2}, d.lower());
        assertArrayEquals(new double[] {7, Double.NaN, Double.NaN, Double.NaN, Double.NaN}, d.upper());
        assertThrows(IllegalArgumentException.class, () -> DetectionLimits.emptyEnds(EDGES, new double[][] {{1, 2}}));
    }

    /**
     * The default reading ({@code CENSORED_IF_DENSE}): a unit with at least 10 events per bin and
     * empty end runs is fitted as with the limits of {@link DetectionLimits#emptyEnds} declared (the
     * same bits); a sparser unit as with every bin as recorded; {@code CENSORED} censors both; a
     * circle has no ends; counts given as doubles read as whole-number counts.
     */
    @Test
    void theDefaultCensorsTheEmptyEndsOfDenseUnits() {
        int[] dense = {0, 0, 0, 300, 400, 310, 200, 90, 0, 0}; // 1,300 events over 10 bins
        int[] sparse = {0, 0, 0, 3, 4, 3, 2, 1, 0, 0}; // 13 events
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(SPACE);
        PenalizedLikelihoodEstimator counted = est.withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED);
        PenalizedLikelihoodEstimator censored = est.withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.CENSORED);
        assertEquals(PenalizedLikelihoodEstimator.EmptyEnds.CENSORED_IF_DENSE, est.emptyEnds());
        DetectionLimits runs = new DetectionLimits(new double[] {3}, new double[] {7});
        double[] declared = counted.fitAll(EDGES, new int[][] {dense}, null, runs).densities().get(0).coordinates();
        BatchEstimate both = est.fitAll(EDGES, new int[][] {dense, sparse}, null);
        assertArrayEquals(declared, both.densities().get(0).coordinates(), 0.0);
        assertArrayEquals(counted.fit(EDGES, sparse).density().coordinates(), both.densities().get(1).coordinates(), 0.0);
        // the diagnostics say which units were read as censored, and where
        assertEquals("counts read as censored in [0.0, 4.0) and [7.0, 10.0] (a detection limit or a run of empty end"
                + " bins)", both.diagnostics().get(0).reason());
        assertEquals("", both.diagnostics().get(1).reason());
        double[] notCensored = counted.fit(EDGES, dense).density().coordinates();
        double gap = 0;
        for (int k = 0; k < declared.length; k++) {
            gap = Math.max(gap, Math.abs(declared[k] - notCensored[k]));
        }
        assertTrue(gap > 0.1, "the censored reading changed the dense unit's coordinates by only " + gap);
        assertArrayEquals(counted.fitAll(EDGES, new int[][] {sparse}, null, runs).densities().get(0).coordinates(),
                censored.fit(EDGES, sparse).density().coordinates(), 0.0);
        double[] asDoubles = java.util.Arrays.stream(dense).asDoubleStream().toArray();
        assertArrayEquals(declared, est.fit(EDGES, asDoubles).density().coordinates(), 0.0);
        // a circle has no ends: the default reads every bin as recorded
        BayesSpace circle = BayesSpace.periodicSplines(0, 10, 4, 6);
        assertArrayEquals(PenalizedLikelihoodEstimator.withDefaults(circle)
                .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED).fit(EDGES, dense).density().coordinates(),
                PenalizedLikelihoodEstimator.withDefaults(circle).fit(EDGES, dense).density().coordinates(), 0.0);
    }

    /**
     * Why a monitor should fix the reading: on invented age profiles of 180–220 events over 18
     * five-year bins (ages gamma-distributed with mean 60, shape 12, so the youngest bins are empty),
     * the censored and the counted reading of the same counts differ by a sizeable fraction of the
     * estimate's own standard error (measured: mean 0.83, largest 2.7 over 200 units; shape 6: 0.36
     * and 1.6), so a unit crossing 10 events per bin between periods would jump by that much under
     * the default. Asserted over 100 units: mean distance between 0.3 and 1.5 standard errors.
     */
    @Test
    void theTwoReadingsDifferByAFractionOfTheStandardErrorOnAgeProfiles() {
        BayesSpace space = BayesSpace.splines(0, 90, 4, 6);
        double[] e = new double[19];
        for (int j = 0; j <= 18; j++) {
            e[j] = 5.0 * j;
        }
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space);
        java.util.Random r = new java.util.Random(5);
        double sum = 0;
        int reps = 100;
        for (int rep = 0; rep < reps; rep++) {
            int n = 180 + r.nextInt(40);
            int[] c = new int[18];
            for (int i = 0; i < n; i++) {
                double g = 0;
                for (int k = 0; k < 12; k++) {
                    g -= Math.log(1 - r.nextDouble());
                }
                double age = g * 60 / 12;
                if (age < 90) {
                    c[(int) (age / 5)]++;
                }
            }
            UnitEstimate counted = est.withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED).fit(e, c);
            UnitEstimate censored = est.withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.CENSORED).fit(e, c);
            sum += censored.density().minus(counted.density()).norm()
                    / Math.sqrt(counted.diagnostics().estimationVariance());
        }
        double mean = sum / reps;
        assertTrue(mean > 0.3 && mean < 1.5, "mean distance between the readings, in standard errors: " + mean);
    }
}
