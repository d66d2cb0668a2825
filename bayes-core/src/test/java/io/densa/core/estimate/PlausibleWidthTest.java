package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * {@link SmoothingSearch#plausibleWidth}, the range that bounds the variance of log λ̂ in the
 * smoothing-uncertainty term, on grids worked by hand, and the bound it feeds checked against the
 * variance of laws on that range (Popoviciu's inequality, Var X ≤ (M − m)²/4, attained by the
 * two-point law at the ends; elementary: Var X ≤ E(X − (m + M)/2)² ≤ ((M − m)/2)²).
 */
class PlausibleWidthTest {
    @Test
    void rangeOfGridPointsWithinTheRiseOfTheBestPlusOneStep() {
        // g = 3, 2, 1, 0, −1 with V = 10, 5, 4, 6, 12: best 4 at g = 1; within 6 of it: g = 2, 1, 0
        // (10 − 4 = 6 is not inside, 12 − 4 = 8 neither) → width 2 − 0 + 1 = 3
        double[] g = {3, 2, 1, 0, -1};
        double[] c = {10, 5, 4, 6, 12};
        assertEquals(3.0, SmoothingSearch.plausibleWidth(g, c, 5, 1.0), 0.0);
        // a flat criterion over the whole scan: every point, width 4 + 1
        assertEquals(5.0, SmoothingSearch.plausibleWidth(g, new double[] {4, 4.05, 4, 4.02, 4.1}, 5, 1.0), 0.0);
        // only the points scanned count; a sharp minimum leaves one cell
        assertEquals(0.5, SmoothingSearch.plausibleWidth(g, new double[] {40, 4, 30, 0, 0}, 3, 0.5), 0.0);
        // infinite values (a failed fit) are never inside; none finite → NaN
        assertEquals(1.0, SmoothingSearch.plausibleWidth(g, new double[] {Double.POSITIVE_INFINITY, 4, 11, 0, 0}, 3,
                1.0), 0.0);
        assertTrue(Double.isNaN(SmoothingSearch.plausibleWidth(g, new double[] {Double.POSITIVE_INFINITY,
            Double.POSITIVE_INFINITY}, 2, 1.0)));
    }

    @Test
    void quarterOfTheSquaredWidthBoundsTheVarianceOfLawsOnTheRange() {
        double w = 3.0;
        double bound = 0.25 * w * w;
        // the two-point law at the ends attains it; a skewed three-point law stays below
        assertEquals(bound, variance(new double[] {0, w}, new double[] {0.5, 0.5}), 1e-15);
        assertTrue(variance(new double[] {0, 1, w}, new double[] {0.2, 0.5, 0.3}) < bound);
    }

    private static double variance(double[] x, double[] p) {
        double m = 0;
        for (int i = 0; i < x.length; i++) {
            m += p[i] * x[i];
        }
        double v = 0;
        for (int i = 0; i < x.length; i++) {
            v += p[i] * (x[i] - m) * (x[i] - m);
        }
        return v;
    }
}
