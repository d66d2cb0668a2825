package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.internal.ScatteredCurvature;
import org.junit.jupiter.api.Test;

/**
 * The curvature of the smoothing criterion taken from the search's own values
 * ({@link ScatteredCurvature#curvatureAt}), which replaces two fits in the λ-uncertainty
 * term: checked against closed forms. Interpolation by a cubic reproduces every cubic exactly, so
 * its second derivative at a node equals the cubic's (elementary; Burden &amp; Faires (2011),
 * Numerical Analysis, 9th ed., §3.3: the interpolating polynomial of degree ≤ n through n + 1
 * points is unique).
 */
class SearchCurvatureTest {
    /** V(g) = 7 − 3 (g − 1) + 1.5 (g − 1)² + 0.7 (g − 1)³: V''(1) = 3, V''(g) = 3 + 4.2 (g − 1). */
    private static double cubic(double g) {
        double t = g - 1;
        return 7 - 3 * t + 1.5 * t * t + 0.7 * t * t * t;
    }

    @Test
    void secondDerivativeOfTheInterpolatingCubicAtZero() {
        double[] t = {0, -1, 0.3, 1};
        double[] y = new double[4];
        for (int i = 0; i < 4; i++) {
            y[i] = cubic(1 + t[i]);
        }
        assertEquals(3.0, ScatteredCurvature.cubicSecondDerivativeAtZero(t, y), 1e-12);
        // a node order other than the search's, with zero not first
        double[] t2 = {-0.5, 2, 0, 0.25};
        for (int i = 0; i < 4; i++) {
            y[i] = cubic(1 + t2[i]);
        }
        assertEquals(3.0, ScatteredCurvature.cubicSecondDerivativeAtZero(t2, y), 1e-12);
    }

    @Test
    void curvatureFromTheValuesOfASearch() {
        // a scan 3, 2, 1, 0 and refinements at 0.62 and 0.615 (closer than the minimum spacing to
        // 0.62, so left out) around the choice 0.62
        ScatteredCurvature e = new ScatteredCurvature(10);
        for (double g : new double[] {3, 2, 1, 0, 0.62, 0.615}) {
            e.add(g, cubic(g));
        }
        e.add(-1, Double.POSITIVE_INFINITY); // a failed fit is not a value
        assertEquals(3 + 4.2 * (0.62 - 1), e.curvatureAt(0.62), 1e-11);
        assertEquals(3 + 4.2 * (2 - 1), e.curvatureAt(2), 1e-11);
    }

    @Test
    void noCurvatureWhereTheValuesDoNotBracketTheChoice() {
        ScatteredCurvature e = new ScatteredCurvature(10);
        for (double g : new double[] {3, 2.99, 2, 1}) {
            e.add(g, cubic(g));
        }
        // the strongest end of the grid: nothing above it
        assertTrue(Double.isNaN(e.curvatureAt(3)));
        // a point not evaluated
        assertTrue(Double.isNaN(e.curvatureAt(1.5)));
        // the only value above lies closer than the minimum spacing
        ScatteredCurvature f = new ScatteredCurvature(10);
        for (double g : new double[] {1, 1.005, 0, -1}) {
            f.add(g, cubic(g));
        }
        assertTrue(Double.isNaN(f.curvatureAt(1)));
        // three values only
        ScatteredCurvature h = new ScatteredCurvature(10);
        for (double g : new double[] {2, 1, 0}) {
            h.add(g, cubic(g));
        }
        assertTrue(Double.isNaN(h.curvatureAt(1)));
    }
}
