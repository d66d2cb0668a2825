package io.densa.spatial.variogram;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import org.junit.jupiter.api.Test;

/**
 * Bins that hold enough pairs: sparse bins are merged (VariogramOptions, "Pairs per bin"), no bin
 * is empty and no NaN reaches a result. Every merged bin is checked against the textbook pair loop
 * γ̂(h) = (1/2|N(h)|) Σ ‖X_i ⊖ X_j‖²_B on the edges the result reports
 * ({@link EmpiricalVariogramTest#naive}).
 */
class VariogramBinningTest {
    /** Pairs of locations at distance ≤ maxLag, counted directly. */
    static long pairsWithin(Locations loc, double maxLag) {
        long p = 0;
        for (int i = 0; i < loc.size(); i++) {
            for (int j = i + 1; j < loc.size(); j++) {
                if (loc.distance(i, j) <= maxLag) {
                    p++;
                }
            }
        }
        return p;
    }

    static void noNaN(EmpiricalVariogram ev) {
        for (int s = 0; s < ev.sectorCount(); s++) {
            for (long c : ev.counts(s)) {
                assertTrue(c >= 1, "empty bin in sector " + s);
            }
            for (double v : ev.meanLags(s)) {
                assertTrue(Double.isFinite(v), "mean lag " + v);
            }
            for (double v : ev.semivariances(s)) {
                assertTrue(Double.isFinite(v), "semivariance " + v);
            }
        }
    }

    @Test
    void mergingScansFromTheShortestLag() {
        // by hand: running totals 0,0,0,3,5,8 close the first bin at base bin 5 (8 pairs >= 7); then
        // 0,7 (bins 6-7); 3,6,11 (8-10); 5,10 (11-12); 2,8 (13-14)
        long[] counts = {0, 0, 0, 3, 2, 3, 0, 7, 3, 3, 5, 5, 5, 2, 6};
        assertArrayEquals(new int[] {0, 6, 8, 11, 13, 15}, EmpiricalVariogram.mergeGroups(counts, 7));
        // a remainder below the minimum joins the last bin; fewer pairs than the minimum in all: one bin
        assertArrayEquals(new int[] {0, 2, 5}, EmpiricalVariogram.mergeGroups(new long[] {4, 1, 5, 0, 2}, 5));
        assertArrayEquals(new int[] {0, 3}, EmpiricalVariogram.mergeGroups(new long[] {1, 0, 2}, 30));
        // minimum 1 merges only empty bins, each into the next non-empty one (trailing ones into the last)
        assertArrayEquals(new int[] {0, 3, 5}, EmpiricalVariogram.mergeGroups(new long[] {0, 0, 4, 1, 0}, 1));
    }

    @Test
    void twentySitesGetNoEmptyAndNoSparseBinsByDefault() {
        int hadEmpty = 0;
        for (long seed = 0; seed < 20; seed++) {
            Locations loc = TestData.uniformSquare(20, 100, seed);
            DensitySet d = TestData.independentCoordinates(TestData.K3, 20, seed + 100);
            EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults());
            double maxLag = ev.edges()[ev.binCount()];
            double[] bb = loc.boundingBox();
            assertEquals(Math.hypot(bb[2] - bb[0], bb[3] - bb[1]) / 2, maxLag, 1e-9, "half the diagonal"); // default
            // the failure this replaces: the 15 equal bins of the old default, counted by the pair loop
            double[] equal = new double[16];
            for (int b = 0; b <= 15; b++) {
                equal[b] = maxLag * b / 15;
            }
            double[][] old = EmpiricalVariogramTest.naive(loc, d, equal, Double.NaN, 0);
            for (double c : old[0]) {
                if (c == 0) {
                    hadEmpty++;
                    break;
                }
            }
            long p = pairsWithin(loc, maxLag);
            long m = Math.min(30, p / 8);
            long total = 0;
            for (long c : ev.counts()) {
                assertTrue(c >= m, "seed " + seed + ": a bin of " + c + " pairs, minimum " + m);
                total += c;
            }
            assertEquals(p, total, "every pair within the maximum lag is in a bin");
            assertTrue(ev.binCount() >= 4 && ev.binCount() <= 9, "bins: " + ev.binCount());
            noNaN(ev);
            EmpiricalVariogramTest.check(ev, 0, EmpiricalVariogramTest.naive(loc, d, ev.edges(), Double.NaN, 0));
            VariogramFit fit = VariogramFitting.fit(ev, VariogramFitOptions.withDefaults());
            for (double v : fit.fitted()) {
                assertTrue(Double.isFinite(v), "fitted " + v);
            }
        }
        assertTrue(hadEmpty >= 3, "the old equal bins left a bin empty in " + hadEmpty + " of 20 networks");
    }

    @Test
    void largerNetworksGetThirtyPairsPerBinAndExplicitBinsOnlyLoseEmptyOnes() {
        Locations loc = TestData.uniformSquare(57, 100, 3);
        DensitySet d = TestData.independentCoordinates(TestData.K3, 57, 4);
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults());
        for (long c : ev.counts()) {
            assertTrue(c >= 30, "bin of " + c + " pairs");
        }
        EmpiricalVariogramTest.check(ev, 0, EmpiricalVariogramTest.naive(loc, d, ev.edges(), Double.NaN, 0));
        // explicit edges with empty bins between 0 and 0.03: those merge into the next bin, and every
        // non-empty bin keeps its pair loop values
        double[] edges = {0, 0.01, 0.02, 0.03, 20, 40, 60};
        double[][] ref = EmpiricalVariogramTest.naive(loc, d, edges, Double.NaN, 0);
        assertEquals(0, ref[0][0] + ref[0][1] + ref[0][2], "no pair is closer than 0.03 here");
        EmpiricalVariogram ex = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withEdges(edges));
        assertArrayEquals(new double[] {0, 20, 40, 60}, ex.edges(), 0);
        assertArrayEquals(new long[] {(long) ref[0][3], (long) ref[0][4], (long) ref[0][5]}, ex.counts());
        assertArrayEquals(new double[] {ref[2][3], ref[2][4], ref[2][5]}, ex.semivariances(), 1e-12);
        // a minimum for explicit bins, and a minimum larger than all pairs: one bin
        EmpiricalVariogram big = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withBinCount(40)
                .withMinimumPairs(50));
        for (long c : big.counts()) {
            assertTrue(c >= 50, "bin of " + c + " pairs");
        }
        EmpiricalVariogram one = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults()
                .withMinimumPairs(1_000_000));
        assertEquals(1, one.binCount());
        assertEquals(pairsWithin(loc, one.edges()[1]), one.counts()[0]);
        assertThrows(IllegalArgumentException.class, () -> VariogramOptions.withDefaults().withMinimumPairs(0));
    }

    @Test
    void directionSectorsAreMergedEachOnItsOwn() {
        Locations loc = TestData.uniformSquare(40, 10, 5);
        DensitySet d = TestData.independentCoordinates(TestData.K3, 40, 6);
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withBinCount(30)
                .withMaxLag(6).withDirections(10, 0, 90));
        double[] dirs = {0, 90};
        for (int s = 0; s < 2; s++) {
            assertEquals(ev.edges(s).length - 1, ev.binCount(s));
            EmpiricalVariogramTest.check(ev, s, EmpiricalVariogramTest.naive(loc, d, ev.edges(s), dirs[s], 10));
        }
        noNaN(ev);
        assertTrue(ev.binCount(0) < 30 && ev.binCount(1) < 30, "narrow sectors leave some of 30 bins empty");
    }

    @Test
    void noPairWithinTheLagsIsAnError() {
        Locations loc = Locations.planar(new double[] {0, 10, 20}, new double[] {0, 0, 0});
        DensitySet d = TestData.independentCoordinates(TestData.K3, 3, 1);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> EmpiricalVariogram.of(loc, d,
                VariogramOptions.withDefaults().withMaxLag(5)));
        assertTrue(e.getMessage().matches("no pair of locations lies within the lags \\[0.0, 5.0\\]; give a larger"
                + " maximum lag, other bin edges"), e.getMessage());
    }

    @Test
    void extremeScalesOfCoordinatesAndLocations() {
        // ‖s a ⊖ s b‖² = s² ‖a ⊖ b‖² (a norm is absolutely homogeneous), and lags scale with the locations
        Locations loc = TestData.uniformSquare(30, 1, 8);
        DensitySet d = TestData.independentCoordinates(TestData.K3, 30, 9);
        VariogramOptions o = VariogramOptions.withDefaults().withCloud(1000);
        EmpiricalVariogram ref = EmpiricalVariogram.of(loc, d, o);
        for (double s : new double[] {1e150, 1e-150}) {
            EmpiricalVariogram ev = EmpiricalVariogram.of(loc, scaledDensities(d, s), o);
            double[] g = ev.semivariances();
            for (int b = 0; b < g.length; b++) {
                assertEquals(ref.semivariances()[b] * s * s, g[b], 1e-12 * ref.semivariances()[b] * s * s);
            }
            double[] cg = ev.cloud().semivariance();
            for (int q = 0; q < cg.length; q++) {
                assertEquals(ref.cloud().semivariance()[q] * s * s, cg[q], 1e-12 * ref.cloud().semivariance()[q] * s * s);
            }
        }
        for (double s : new double[] {1e300, 1e-300}) {
            double[] x = loc.xs(), y = loc.ys();
            for (int i = 0; i < x.length; i++) {
                x[i] *= s;
                y[i] *= s;
            }
            EmpiricalVariogram ev = EmpiricalVariogram.of(Locations.planar(x, y), d, o);
            assertArrayEquals(ref.counts(), ev.counts());
            assertArrayEquals(ref.semivariances(), ev.semivariances(), 1e-12);
            for (int b = 0; b < ev.binCount(); b++) {
                assertEquals(ref.meanLags()[b] * s, ev.meanLags()[b], 1e-12 * ref.meanLags()[b] * s);
            }
        }
        // squared distances beyond the double range are an error, not an infinite γ̂
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> EmpiricalVariogram.of(loc, scaledDensities(d, 1e160), VariogramOptions.withDefaults()));
        assertTrue(e.getMessage().matches("the squared B2 distances of bin 0 overflow a double .*"), e.getMessage());
    }

    private static DensitySet scaledDensities(DensitySet d, double s) {
        double[][] c = d.coordinates();
        for (double[] row : c) {
            for (int j = 0; j < row.length; j++) {
                row[j] *= s;
            }
        }
        return DensitySet.of(d.space(), c);
    }

    /**
     * Nearly equally spaced explicit edges take the direct bin index corrected against the
     * neighbouring edges: the same bin as the binary search for every lag, including lags exactly
     * on an edge and one ulp either side (the half-open rule (e_b, e_{b+1}] of the class comment).
     */
    @Test
    void directBinIndexEqualsTheSearchOnAndAroundEveryEdge() {
        double[][] layouts = {new double[31], new double[16], {0.25, 1.25, 2.248, 3.25, 4.252}};
        for (int b = 0; b <= 30; b++) {
            layouts[0][b] = 0.5 * b / 30;
        }
        for (int b = 0; b <= 15; b++) {
            layouts[1][b] = 3 + 7.0 * b / 15;
        }
        java.util.Random r = new java.util.Random(5);
        for (double[] e : layouts) {
            assertTrue(EmpiricalVariogram.nearlyEqualSpacing(e));
            double inv = (e.length - 1) / (e[e.length - 1] - e[0]);
            for (double edge : e) {
                for (double h : new double[] {edge, Math.nextUp(edge), Math.nextDown(edge)}) {
                    assertEquals(EmpiricalVariogram.bin(e, h), EmpiricalVariogram.binNear(e, h, inv), "lag " + h);
                }
            }
            for (int t = 0; t < 100_000; t++) {
                double h = e[0] - 0.1 + (e[e.length - 1] - e[0] + 0.2) * r.nextDouble();
                assertEquals(EmpiricalVariogram.bin(e, h), EmpiricalVariogram.binNear(e, h, inv), "lag " + h);
            }
        }
        assertTrue(!EmpiricalVariogram.nearlyEqualSpacing(new double[] {0, 1, 3}));
    }
}
