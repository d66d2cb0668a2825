package io.densa.core.estimate;

import static io.densa.core.estimate.EstimationTestSupport.edges;
import static io.densa.core.estimate.EstimationTestSupport.rng;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import java.util.List;
import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import org.junit.jupiter.api.Test;

/**
 * The extrapolation diagnostic of the estimators ({@link EstimationDiagnostics#extrapolationShare()},
 * {@link EstimationDiagnostics#extrapolated()}, {@link BatchEstimate#extrapolatedIds()}): its value
 * recomputed from the definition with Apache Commons Math integration (commons-math3 3.6.1,
 * {@link IterativeLegendreGaussIntegrator}) on the returned density, and the flag on a unit whose
 * values below a detection limit were clipped to it.
 */
class ExtrapolationDiagnosticTest {
    private static final BayesSpace SPACE = BayesSpace.splines(0, 1, 4, 8);
    private static final double[] EDGES = edges(0, 1, 40);

    /**
     * 3,000 normal values (mean 0.6, sd 0.1) with everything below the detection limit 0.35 (about
     * 0.6 % of them) set to 0.35: bins 0–13 empty, a spike in bin 14.
     */
    static int[] clippedCounts() {
        EstimationTestSupport.Truth t = new EstimationTestSupport.Truth("narrow normal", 0, 1,
                new org.apache.commons.math3.distribution.NormalDistribution(null, 0.6, 0.1), null, 1);
        int[] c = new int[40];
        for (double x : t.sample(3000, rng(5))) {
            double v = Math.max(x, 0.35);
            c[(int) Math.min(39, Math.floor(v * 40))]++;
        }
        return c;
    }

    private static double integrate(UnivariateFunction f, double lo, double hi) {
        return new IterativeLegendreGaussIntegrator(16, 1e-13, 1e-13).integrate(1_000_000, f, lo, hi);
    }

    /**
     * The definition, evaluated on the returned density: Σ_E ∫_E (c*_E − clr)₊² dx / ‖f‖², c*_E =
     * log(Z / (N |E|)), Z = ∫ e^{clr} dx, over the regions E before the first and after the last
     * event.
     */
    private static double share(Density f, double[][] regions, double total) {
        double z = integrate(x -> Math.exp(f.clr(x)), 0, 1);
        double deep = 0;
        for (double[] r : regions) {
            double level = Math.log(z / (total * (r[1] - r[0])));
            deep += integrate(x -> {
                double d = level - f.clr(x);
                return d > 0 ? d * d : 0;
            }, r[0], r[1]);
        }
        double n = f.norm();
        return Math.min(1, deep / (n * n));
    }

    @Test
    void countsShareMatchesTheDefinition() {
        int[] counts = clippedCounts();
        for (double w : new double[] {0, 1}) {
            // every bin as recorded: the share's regions are those beyond the first and last occupied bins
            UnitEstimate e = PenalizedLikelihoodEstimator.withDefaults(SPACE).withReferencePrior(w)
                    .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED).fit(EDGES, counts);
            int first = 0;
            int last = 39;
            while (counts[first] == 0) {
                first++;
            }
            while (counts[last] == 0) {
                last--;
            }
            // the regions below the first and above the last bin with events (the upper may be empty)
            double[][] regions = last == 39 ? new double[][] {{0, EDGES[first]}}
                    : new double[][] {{0, EDGES[first]}, {EDGES[last + 1], 1}};
            double expected = share(e.density(), regions, 3000);
            assertEquals(expected, e.diagnostics().extrapolationShare(), 1e-6 + 1e-4 * expected, "prior " + w);
        }
    }

    @Test
    void sampleShareMatchesTheDefinition() {
        double[] x = EstimationTestSupport.normal().sample(400, rng(6));
        double[] kept = java.util.Arrays.stream(x).filter(v -> v < 0.6).toArray();
        double max = java.util.Arrays.stream(kept).max().getAsDouble();
        double min = java.util.Arrays.stream(kept).min().getAsDouble();
        UnitEstimate e = PenalizedLikelihoodEstimator.withDefaults(SPACE).withReferencePrior(0).fitSample(kept);
        double expected = share(e.density(), new double[][] {{0, min}, {max, 1}}, kept.length);
        assertEquals(expected, e.diagnostics().extrapolationShare(), 1e-6 + 1e-4 * expected);
    }

    /**
     * A unit clipped at a detection limit is flagged by the plain penalised likelihood (no reference
     * prior, every bin as recorded: its clr dives below −15 where it has no events) and not with the
     * defaults; the batch names it.
     */
    @Test
    void clippedUnitIsFlaggedWithoutThePrior() {
        int[] clipped = clippedCounts();
        int[] full = EstimationTestSupport.normal().counts(3000, 40, rng(7));
        int[][] rows = {full, clipped};
        String[] ids = {"full", "clipped"};
        BatchEstimate plain = PenalizedLikelihoodEstimator.withDefaults(SPACE).withReferencePrior(0)
                .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED).fitAll(EDGES, rows, ids);
        double low = Double.POSITIVE_INFINITY;
        for (int i = 0; i <= 100; i++) {
            low = Math.min(low, plain.densities().get(1).clr(i / 100.0));
        }
        assertTrue(low < -15, "lowest clr " + low);
        assertEquals(List.of("clipped"), plain.extrapolatedIds(), plain.diagnostics().toString());
        BatchEstimate def = PenalizedLikelihoodEstimator.withDefaults(SPACE).fitAll(EDGES, rows, ids);
        assertEquals(List.of(), def.extrapolatedIds(), def.diagnostics().toString());
        assertTrue(def.diagnostics().get(1).extrapolationShare() < plain.diagnostics().get(1).extrapolationShare());
    }

    /** Events in every bin: nothing is extrapolated. */
    @Test
    void noEmptyBinsGivesZero() {
        int[] c = new int[40];
        java.util.Arrays.fill(c, 5);
        c[17] = 40;
        EstimationDiagnostics d = PenalizedLikelihoodEstimator.withDefaults(SPACE).fit(EDGES, c).diagnostics();
        assertEquals(0.0, d.extrapolationShare());
        assertFalse(d.extrapolated());
        EstimationDiagnostics s = SmoothingSplineEstimator.withDefaults(SPACE).fit(EDGES, c).diagnostics();
        assertEquals(0.0, s.extrapolationShare());
    }

    /** A unit without events returned as the reference is entirely prior: share 1, flagged. */
    @Test
    void emptyUnitIsFlagged() {
        BatchEstimate b = PenalizedLikelihoodEstimator.withDefaults(SPACE).withZeroTotal(ZeroTotalPolicy.REFERENCE)
                .fitAll(EDGES, new int[][] {clippedCounts(), new int[40]}, new String[] {"a", "b"});
        assertEquals(1.0, b.diagnostics().get(1).extrapolationShare());
        assertTrue(b.extrapolatedIds().contains("b"));
    }
}
