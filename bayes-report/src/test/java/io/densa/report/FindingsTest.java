package io.densa.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.SmoothingCriterion;
import io.densa.spatial.Locations;
import io.densa.spatial.scan.SpatialScan;
import io.densa.spatial.variogram.VariogramFit;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramModel;
import java.util.List;
import org.junit.jupiter.api.Test;

/** Sentences that follow the numbers: the test decides which sentence is written. */
class FindingsTest {
    @Test
    void clusteringIsClaimedOnlyWhenTheTestIsSignificant() {
        String yes = Findings.clustering("Departures", "Moran's I", 0.41, 0.001, 0.05);
        assertTrue(yes.startsWith("Departures cluster in space:"), yes);
        assertTrue(yes.contains("p = 0.001 ≤ 0.05"), yes);
        String no = Findings.clustering("Departures", "Moran's I", 0.02, 0.31, 0.05);
        assertTrue(no.startsWith("Departures show no clustering in space at the 0.05 level"), no);
        assertFalse(no.contains("cluster in space:"), no);
        // the level itself counts as significant (p ≤ alpha), just above it does not
        assertTrue(Findings.clustering("D", "I", 0.1, 0.05, 0.05).contains("cluster in space:"));
        assertTrue(Findings.clustering("D", "I", 0.1, 0.0501, 0.05).contains("no clustering"));
        assertThrows(IllegalArgumentException.class, () -> Findings.clustering("D", "I", 0.1, Double.NaN, 0.05));
        assertThrows(IllegalArgumentException.class, () -> Findings.clustering("D", "I", 0.1, 0.01, 1.5));
    }

    @Test
    void scanClusterIsClaimedOnlyWhenItsTestIsSignificant() {
        Locations line = Locations.planar(new double[] {0, 1, 2, 3, 4}, new double[5]);
        double[] expected = {10, 10, 10, 10, 10};
        String[] names = {"A", "B", "C", "D", "E"};
        SpatialScan scan = SpatialScan.withDefaults().withReplicates(99, 1);
        SpatialScan.Result strong = scan.test(line, new long[] {20, 18, 5, 4, 3}, expected);
        String yes = Findings.scanCluster("Events", strong, names, 1, 0.05);
        assertTrue(yes.startsWith("Events: a cluster of raised counts — 2 units (A and 1 more) with 38 observed "
                + "against 20 expected, an excess of 18"), yes);
        assertTrue(yes.contains("p = 0.01 ≤ 0.05 (99 Monte Carlo replicates)"), yes);
        SpatialScan.Result weak = scan.test(line, new long[] {12, 9, 8, 11, 10}, expected);
        String no = Findings.scanCluster("Events", weak, names, 3, 0.05);
        assertTrue(weak.pValue() > 0.05, "" + weak.pValue());
        assertTrue(no.startsWith("Events: no cluster of raised counts at the 0.05 level — the most likely zone"), no);
        assertFalse(no.contains("a cluster of raised"), no);
        String none = Findings.scanCluster("Events", scan.test(line, new long[] {10, 10, 10, 10, 10}, expected), names,
                3, 0.05);
        assertTrue(none.contains("no zone has more observed than expected events"), none);
        assertThrows(IllegalArgumentException.class, () -> Findings.scanCluster("E", strong, names, 0, 0.05));
    }

    @Test
    void moranSentenceUsesThePermutationTestWhenThereIsOne() {
        Fixtures f = new Fixtures(5);
        String s = Findings.clustering("Values", "value", f.moran, 0.05);
        double p = f.moran.permutation().orElseThrow().pGreater();
        assertTrue(s.contains("199 permutations"), s);
        assertEquals(p <= 0.05, s.contains("cluster in space:"), s);
        assertEquals(p <= 0.05, Findings.clusters(f.moran, 0.05));
    }

    static VariogramFit fit(List<VariogramFit.Warning> warnings) {
        return new VariogramFit(VariogramModel.exponential(1, 40), VariogramFitOptions.Method.WEIGHTED_CRESSIE, 0.1, 0.1,
                new double[] {0.5, 0.8}, 2, 100, true, false, 20, warnings);
    }

    @Test
    void variogramWarningsAreSaidAndTheirAbsenceToo() {
        List<String> none = Findings.variogramFit("Raw densities", fit(List.of()), "km");
        assertEquals(1, none.size());
        assertTrue(none.get(0).contains("no parameter ended on a bound"), none.get(0));
        assertTrue(none.get(0).contains("20 km"), none.get(0));
        List<String> two = Findings.variogramFit("Residuals", fit(List.of(
                new VariogramFit.Warning(VariogramFit.WarningKind.RANGE_BEYOND_LAGS, "the fitted practical range 40"
                        + " is 2.00 times the largest lag 20"),
                new VariogramFit.Warning(VariogramFit.WarningKind.PARAMETER_AT_BOUND, "the range 40 ended on its upper"
                        + " bound 40"))), "km");
        assertEquals(2, two.size());
        assertTrue(two.get(0).contains("2.00 times the largest lag") && two.get(0).contains("poorly determined"));
        assertTrue(two.get(1).contains("upper bound") && two.get(1).contains("not an estimate"));
    }

    static EstimationDiagnostics diag(String id, EstimationDiagnostics.Status status, double extrapolation) {
        return new EstimationDiagnostics(id, status, status == EstimationDiagnostics.Status.NOT_CONVERGED
                ? "iteration budget spent" : "", 1, true, SmoothingCriterion.values()[0], 1, 3, -10, 100, 5,
                new double[] {1}, 1, extrapolation);
    }

    @Test
    void extrapolatedAndNonConvergedFitsAreNamed() {
        assertTrue(Findings.extrapolated(List.of(), 10, 5).startsWith("No estimate is carried by extrapolation"));
        String two = Findings.extrapolated(List.of("A", "B", "C"), 10, 2);
        assertTrue(two.startsWith("3 of 10 estimates are carried by extrapolation"), two);
        assertTrue(two.contains("A, B and 1 more"), two);
        List<EstimationDiagnostics> d = List.of(diag("A", EstimationDiagnostics.Status.CONVERGED, 0),
                diag("B", EstimationDiagnostics.Status.NOT_CONVERGED, 0),
                diag("C", EstimationDiagnostics.Status.EMPTY_UNIT_REFERENCE, 1));
        String c = Findings.convergence(d, 5);
        assertTrue(c.startsWith("1 of 3 density fits did not converge"), c);
        assertTrue(c.contains("B (iteration budget spent)") && c.contains("1 unit had no events"), c);
        assertTrue(Findings.convergence(d.subList(0, 1), 5).startsWith("All 1 density fits with data converged"));
    }

    @Test
    void clippedUnitsAreNamedWithTheirLimits() {
        // unit b: three empty bins, then 40 events against 5 one bin further in (binomial tail ≈ 2e-8);
        // unit a: a smooth rise; unit c: a spike at the top
        double[] edges = {0, 1, 2, 3, 4, 5, 6, 7, 8};
        double[][] counts = {{1, 3, 6, 9, 9, 6, 3, 1}, {0, 0, 0, 40, 5, 8, 6, 2}, {1, 4, 8, 9, 5, 30, 0, 0}};
        io.densa.core.estimate.DetectionLimits s = io.densa.core.estimate.DetectionLimits.suggested(edges, counts);
        String text = Findings.clippedUnits(s, List.of("a", "b", "c"), 5);
        assertTrue(text.startsWith("2 of 3 units' counts look clipped at a detection limit"), text);
        assertTrue(text.contains("b (below 3)") && text.contains("c (above 5)") && !text.contains("a ("), text);
        String none = Findings.clippedUnits(io.densa.core.estimate.DetectionLimits.suggested(edges,
                new double[][] {counts[0]}), List.of("a"), 5);
        assertTrue(none.startsWith("No unit's counts look clipped"), none);
    }

    @Test
    void displacedUnitsAreNamedAtTheFalseDiscoveryRate() {
        io.densa.core.BayesSpace space = io.densa.core.BayesSpace.polynomials(0, 10, 2);
        double[] base = space.projectLogPdf(x -> -(x - 5) * (x - 5) / 8).density().coordinates();
        double[] edges = {0, 2, 4, 6, 8, 10};
        // band shares of the baseline, by the space's own cdf; quiet units follow them, units 3 and 7 do not
        io.densa.core.Density f = space.density(base);
        double[] pi = new double[5];
        for (int t = 0; t < 5; t++) {
            pi[t] = f.cdf(edges[t + 1]) - f.cdf(edges[t]);
        }
        int n = 20;
        double[][] c = new double[n][];
        long[][] counts = new long[n][5];
        String[] names = new String[n];
        for (int i = 0; i < n; i++) {
            c[i] = base;
            names[i] = "U" + i;
            for (int t = 0; t < 5; t++) {
                counts[i][t] = Math.round(1000 * pi[t]);
            }
            if (i == 3 || i == 7) {
                counts[i][0] += 300;
                counts[i][4] += 200;
            }
        }
        io.densa.regression.surveillance.ExcessCounts.Result r = io.densa.regression.surveillance.ExcessCounts
                .withDefaults().withDraws(199, 2).estimate(io.densa.core.DensitySet.of(space, c), counts, edges, edges,
                        io.densa.regression.surveillance.ExcessCounts.BaselineError.none());
        String text = Findings.displaced(r, names, "districts", "visits", 0.1, 5);
        assertTrue(text.startsWith("At a false discovery rate of 0.1, 2 of 20 districts displace more visits"), text);
        assertTrue(text.contains("U3 (") && text.contains("U7 ("), text);
        io.densa.regression.surveillance.ExcessCounts.Result quiet = io.densa.regression.surveillance.ExcessCounts
                .withDefaults().withDraws(199, 2).estimate(io.densa.core.DensitySet.of(space, new double[][] {base}),
                        new long[][] {counts[0]}, edges, edges,
                        io.densa.regression.surveillance.ExcessCounts.BaselineError.none());
        assertTrue(Findings.displaced(quiet, new String[] {"U0"}, "districts", "visits", 0.1, 5).startsWith(
                "At a false discovery rate of 0.1, none of the 1 districts displaces more visits"));
    }
}
