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
        // the same as fitting the merged cells directly: [0,1) … [7,8) and [8, 10]
        int[] merged = {3, 9, 20, 31, 40, 31, 20, 9, 12};
        double[] cells = {0, 1, 2, 3, 4, 5, 6, 7, 8, 10};
        assertArrayEquals(est.fit(cells, merged).density().coordinates(), b.densities().get(0).coordinates());
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
}
