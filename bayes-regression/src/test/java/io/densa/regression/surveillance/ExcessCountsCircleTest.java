package io.densa.regression.surveillance;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.junit.jupiter.api.Test;

/**
 * Excess counts on a circle (a year of 365 days): bins and bands that wrap around the cut point.
 * The expected band counts are checked against Commons Math's Gauss–Legendre integration of the
 * baseline's pdf over the band's two pieces on either side of the cut point (an independent
 * quadrature of the closed-form density: a von Mises shape, exact in the Fourier space; Mardia &amp;
 * Jupp (2000), Directional Statistics).
 */
class ExcessCountsCircleTest {
    private static final double P = 365;
    private static final BayesSpace SPACE = BayesSpace.fourier(0, P, 2);

    private static double[] edges(double start) {
        double[] e = new double[74];
        for (int i = 0; i < e.length; i++) {
            e[i] = start + 5 * i;
        }
        return e;
    }

    private static double integral(Density f, double lo, double hi) {
        return new IterativeLegendreGaussIntegrator(5, 1e-13, 1e-13).integrate(100_000, f::pdf, lo, hi);
    }

    @Test
    void bandsThatWrapAroundTheCutPointGetTheMassOnBothSides() {
        // Fourier (no interior breakpoints) and periodic cubic splines (knots every 365/12 days, so the
        // band pieces must be cut at the knots continued past the cut point)
        bandsWrap(SPACE);
        bandsWrap(BayesSpace.periodicSplines(0, P, 4, 12));
    }

    private static void bandsWrap(BayesSpace space) {
        // a season peaking on day 2, so that much of its mass lies on both sides of 1 January
        Density baseline = space.projectLogPdf(t -> 2.5 * Math.cos(2 * Math.PI * (t - 2) / P)).density();
        double[] bins = edges(10); // 10, 15, ..., 375: the last two bins are [0, 5) and [5, 10) of the next turn
        long[] counts = new long[73];
        long total = 0;
        for (int j = 0; j < 73; j++) {
            counts[j] = 3 + (j * 7) % 11;
            total += counts[j];
        }
        double[] bands = {10, 100, 300, 375}; // the last band is [300, 365) ∪ [0, 10)
        ExcessCounts.Result r = ExcessCounts.withDefaults().withDraws(199, 3).estimate(
                DensitySet.of(space, new double[][] {baseline.coordinates()}), new long[][] {counts}, bins, bands,
                ExcessCounts.BaselineError.none());
        ExcessCounts.UnitExcess u = r.units().get(0);
        double[] reference = {integral(baseline, 10, 100), integral(baseline, 100, 300),
            integral(baseline, 300, 365) + integral(baseline, 0, 10)};
        assertEquals(1, reference[0] + reference[1] + reference[2], 1e-9, "the pdf integrates to 1 over the circle");
        int[][] binRanges = {{0, 18}, {18, 58}, {58, 73}};
        for (int t = 0; t < 3; t++) {
            ExcessCounts.BandExcess e = u.bands().get(t);
            assertEquals(total * reference[t], e.expected(), 1e-8 * total, space + ", band " + t);
            long obs = 0;
            for (int j = binRanges[t][0]; j < binRanges[t][1]; j++) {
                obs += counts[j];
            }
            assertEquals(obs, e.observed(), 0, "band " + t);
        }
        assertEquals(0, u.overall().excess(), 0);
    }

    @Test
    void binsMustSpanOnePeriod() {
        Density baseline = SPACE.neutral();
        double[] bins = edges(10);
        bins[bins.length - 1] = 374;
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> ExcessCounts.withDefaults().estimate(DensitySet.of(SPACE, new double[][] {baseline.coordinates()}),
                        new long[][] {new long[73]}, bins, new double[] {10, 374}, ExcessCounts.BaselineError.none()));
        assertEquals(true, e.getMessage().contains("one period"), e.getMessage());
    }
}
