package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import java.util.Arrays;
import java.util.SplittableRandom;
import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.junit.jupiter.api.Test;

/**
 * The extrapolation diagnostic on a circle ({@link EstimationDiagnostics#extrapolationShare()}): the
 * region beyond the data is the one arc the data leave out (the complement of the smallest arc holding
 * them, the circular range of Mardia &amp; Jupp (2000), Directional Statistics, from memory). Its value
 * is recomputed from the definition with Apache Commons Math integration (commons-math3 3.6.1,
 * {@link IterativeLegendreGaussIntegrator}) on the returned density, and it does not depend on where
 * the bins start.
 */
class CircularExtrapolationTest {
    private static final double P = 360;
    private static final BayesSpace CIRCLE = BayesSpace.periodicSplines(0, P, 4, 12);

    /** Edges every 15 from first, spanning one period. */
    private static double[] edges(double first) {
        double[] e = new double[25];
        for (int i = 0; i <= 24; i++) {
            e[i] = first + 15 * i;
        }
        return e;
    }

    /**
     * 600 values of a von Mises law (κ = 6, mean direction 180) kept only inside [125, 235), by
     * rejection from the uniform: events in the bins from [120, 135) to [225, 240) only, the rest of
     * the circle empty.
     */
    private static double[] clippedSample() {
        SplittableRandom rnd = new SplittableRandom(42);
        double[] out = new double[600];
        int i = 0;
        while (i < out.length) {
            double x = P * rnd.nextDouble();
            if (x >= 125 && x < 235 && rnd.nextDouble() < Math.exp(6 * (Math.cos(2 * Math.PI * (x - 180) / P) - 1))) {
                out[i++] = x;
            }
        }
        return out;
    }

    private static int[] counts(double[] sample, double first) {
        int[] c = new int[24];
        for (double x : sample) {
            double y = x;
            while (y < first) {
                y += P;
            }
            while (y >= first + P) {
                y -= P;
            }
            c[(int) Math.floor((y - first) / 15)]++;
        }
        return c;
    }

    /**
     * The empty bins as one arc [lo, hi]: they must follow one another round the circle (a single bin
     * with events followed by an empty one), from the upper edge of that bin.
     */
    private static double[] emptyArc(int[] c, double first) {
        int after = -1, empty = 0;
        for (int j = 0; j < 24; j++) {
            if (c[j] == 0) {
                empty++;
            } else if (c[(j + 1) % 24] == 0) {
                assertEquals(-1, after, "the empty bins are not one arc");
                after = j;
            }
        }
        double lo = first + 15 * (after + 1);
        return new double[] {lo, lo + 15 * empty};
    }

    private static double integrate(UnivariateFunction f, double lo, double hi) {
        return new IterativeLegendreGaussIntegrator(16, 1e-13, 1e-13).integrate(1_000_000, f, lo, hi);
    }

    /**
     * The definition, on the returned density: ∫_E (c* − clr)₊² dx / ‖f‖², c* = log(Z / (N |E|)),
     * Z = ∫ e^{clr} dx over the period, E = [lo, hi] (hi may pass the period: clr takes x modulo it).
     */
    private static double share(Density f, double lo, double hi, double total) {
        double z = integrate(x -> Math.exp(f.clr(x)), 0, P);
        double level = Math.log(z / (total * (hi - lo)));
        double deep = integrate(x -> {
            double d = level - f.clr(x);
            return d > 0 ? d * d : 0;
        }, lo, hi);
        double n = f.norm();
        return Math.min(1, deep / (n * n));
    }

    @Test
    void countsShareIsTheDefinitionOverTheEmptyArc() {
        int[] c = counts(clippedSample(), 0);
        for (int j = 0; j < 24; j++) {
            assertEquals(j >= 8 && j <= 15, c[j] > 0, "bin " + j + " has " + c[j]);
        }
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(CIRCLE).withReferencePrior(0);
        UnitEstimate e = est.fit(edges(0), c);
        // the empty arc [240, 360) ∪ [0, 120), one region across the cut point
        double expected = share(e.density(), 240, 480, 600);
        assertTrue(expected > 0.05 && expected < 0.95, "the clipped unit extrapolates, unclamped: " + expected);
        assertEquals(expected, e.diagnostics().extrapolationShare(), 1e-6 + 1e-4 * expected);
    }

    @Test
    void countsShareDoesNotDependOnWhereTheBinsStart() {
        double[] sample = clippedSample();
        for (double first : new double[] {0, 180, -45, 97.5}) {
            int[] c = counts(sample, first);
            PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(CIRCLE).withReferencePrior(0);
            UnitEstimate e = est.fit(edges(first), c);
            double[] arc = emptyArc(c, first);
            double lo = arc[0], hi = arc[1];
            double expected = share(e.density(), lo, hi, 600);
            assertEquals(expected, e.diagnostics().extrapolationShare(), 1e-6 + 1e-4 * expected, "first edge " + first);
            SmoothingSplineEstimator ss = SmoothingSplineEstimator.withDefaults(CIRCLE);
            UnitEstimate s = ss.fit(edges(first), c);
            assertEquals(share(s.density(), lo, hi, 600), s.diagnostics().extrapolationShare(),
                    1e-6 + 1e-4 * s.diagnostics().extrapolationShare(), "smoothing spline, first edge " + first);
        }
    }

    @Test
    void sampleShareIsTheDefinitionOverTheLargestGap() {
        double[] x = clippedSample();
        double[] sorted = x.clone();
        Arrays.sort(sorted);
        // the largest gap runs from the largest value round to the smallest (the data sit in [125, 235))
        double lo = sorted[sorted.length - 1], hi = sorted[0] + P;
        for (int i = 1; i < sorted.length; i++) {
            assertTrue(sorted[i] - sorted[i - 1] < hi - lo);
        }
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(CIRCLE).withReferencePrior(0);
        UnitEstimate e = est.fitSample(x);
        double expected = share(e.density(), lo, hi, 600);
        assertTrue(expected > 0.05 && expected < 0.95, "the clipped sample extrapolates, unclamped: " + expected);
        assertEquals(expected, e.diagnostics().extrapolationShare(), 1e-6 + 1e-4 * expected);
        // the same days, some a period or two off: the same share
        double[] turned = x.clone();
        for (int i = 0; i < turned.length; i += 3) {
            turned[i] += P * (i % 2 == 0 ? 2 : -1);
        }
        assertEquals(e.diagnostics().extrapolationShare(), est.fitSample(turned).diagnostics().extrapolationShare(),
                1e-9);
    }

    @Test
    void eventsAllRoundTheCircleGiveZeroAndASinglePointGivesOne() {
        int[] c = new int[24];
        Arrays.fill(c, 3);
        c[5] = 30;
        assertEquals(0.0, PenalizedLikelihoodEstimator.withDefaults(CIRCLE).fit(edges(7), c).diagnostics()
                .extrapolationShare());
        double[] one = {10, 10 + P, 10 - 2 * P};
        assertEquals(1.0, PenalizedLikelihoodEstimator.withDefaults(CIRCLE).withSmoothing(1).fitSample(one)
                .diagnostics().extrapolationShare());
    }
}
