package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.internal.RoughnessPenalty;
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

    /**
     * Where the search's values do not bracket its choice (here the strongest smoothing of the grid,
     * nothing above it), the marginal likelihood's curvature comes from two more fits of the search:
     * the central second difference (V(g + h) − 2 V(g) + V(g − h)) / h², h =
     * {@link SmoothingSearch#CURVATURE_STEP} (elementary; Burden &amp; Faires (2011), Numerical
     * Analysis, 9th ed., §4.1). The reference recomputes the three values from fresh fits to a
     * tolerance of 1e-12 (the search's fits stop at 1e-9 of the penalised log-likelihood, about
     * 1e-6 here, so the difference quotient agrees to about 1e-4).
     */
    @Test
    void centralDifferenceWhereTheSearchDoesNotBracketTheChoice() {
        BayesSpace space = BayesSpace.cubicSplines(0, 365, 21);
        double[] edges = EstimationTestSupport.edges(0, 365, 365);
        double[] counts = new double[365];
        double total = 0;
        for (int j = 0; j < 365; j++) {
            // a log-linear profile (its clr has no curvature: the penalty's null space), rounded
            counts[j] = Math.floor(6 * Math.exp(-(j + 0.5) / 150.0) + 0.5 * (1 + Math.sin(3.7 * j)));
            total += counts[j];
        }
        BinLayout lay = new BinLayout(space, edges, 0);
        int k = space.dimension();
        double[] pen = RoughnessPenalty.raw(EstimationSupport.rawBasis(space.basis()), 2);
        double[] u = EstimationSupport.upperU(space.basisTransform(), k);
        PenalizedLikelihoodEstimator.Settings settings = PenalizedLikelihoodEstimator.withDefaults(space).settings();
        SmoothingSearch search = new SmoothingSearch(settings, k, u, pen, null, RoughnessPenalty.rank(pen, k));
        double scale = 0.01;
        PenalizedNewton eng = engine(lay, pen, u, counts, total);
        double[] found = {Double.NaN, Double.NaN};
        double chosen = search.choose(eng, scale, null, found);
        assertEquals(SmoothingSearch.lambdaAt(total, scale, settings.gridLog10Hi()), chosen, 0.0,
                "the choice is the strongest smoothing of the grid");
        double h = SmoothingSearch.CURVATURE_STEP;
        double[] v = new double[3];
        for (int i = 0; i < 3; i++) {
            PenalizedNewton fresh = engine(lay, pen, u, counts, total);
            double lambda = chosen * Math.pow(10, (i - 1) * h);
            assertTrue(fresh.solve(lambda, 100, 1e-12), fresh.failure());
            v[i] = search.criterionAfter(fresh, lambda, null, true);
        }
        double reference = (v[2] - 2 * v[1] + v[0]) / (h * h);
        assertTrue(Double.isFinite(reference) && Math.abs(reference) > 0.01, "reference " + reference);
        assertEquals(reference, found[1], 1e-3 * Math.max(1, Math.abs(reference)));
    }

    private static PenalizedNewton engine(BinLayout lay, double[] pen, double[] u, double[] counts, double total) {
        PenalizedNewton eng = new PenalizedNewton(lay, pen, null);
        eng.setCoordinateMap(u);
        eng.useCounts(counts, total);
        eng.clearCoefficients();
        return eng;
    }
}
