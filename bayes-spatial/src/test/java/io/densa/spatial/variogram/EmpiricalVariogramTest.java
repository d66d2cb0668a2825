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
 * The blocked Gram-identity estimator against the textbook double loop γ̂(h) = (1/2|N(h)|) Σ
 * ‖X_i ⊖ X_j‖²_B (Giraldo, Delicado, Mateu (2011), Environ. Ecol. Stat. 18 — from memory) computed
 * pair by pair with Density.distanceSq.
 */
class EmpiricalVariogramTest {
    static double[][] naive(Locations loc, DensitySet d, double[] e, double dir, double tol) {
        int nb = e.length - 1;
        double[] sg = new double[nb], sh = new double[nb], c = new double[nb];
        for (int i = 0; i < loc.size(); i++) {
            for (int j = i + 1; j < loc.size(); j++) {
                double h = loc.distance(i, j);
                if (h > e[nb] || h < e[0]) {
                    continue;
                }
                if (!Double.isNaN(dir)) {
                    double ang = Math.toDegrees(Math.atan2(loc.y(j) - loc.y(i), loc.x(j) - loc.x(i)));
                    double diff = Math.abs(((ang - dir) % 180 + 180) % 180);
                    if (Math.min(diff, 180 - diff) > tol) {
                        continue;
                    }
                }
                int b = 0;
                while (b < nb - 1 && h > e[b + 1]) {
                    b++;
                }
                sg[b] += d.get(i).distanceSq(d.get(j));
                sh[b] += h;
                c[b]++;
            }
        }
        double[][] out = new double[3][nb];
        for (int b = 0; b < nb; b++) {
            out[0][b] = c[b];
            out[1][b] = c[b] > 0 ? sh[b] / c[b] : Double.NaN;
            out[2][b] = c[b] > 0 ? sg[b] / (2 * c[b]) : Double.NaN;
        }
        return out;
    }

    static void check(EmpiricalVariogram ev, int sector, double[][] ref) {
        long[] c = ev.counts(sector);
        for (int b = 0; b < c.length; b++) {
            assertEquals(ref[0][b], c[b], 0, "count bin " + b);
            if (c[b] > 0) {
                assertEquals(ref[1][b], ev.meanLags(sector)[b], 1e-12 * Math.max(1, ref[1][b]));
                assertEquals(ref[2][b], ev.semivariances(sector)[b], 1e-10 * Math.max(1, ref[2][b]));
            }
        }
    }

    @Test
    void matchesPairByPairLoopForWidthsEdgesAndDirections() {
        Locations loc = TestData.uniformSquare(300, 10, 3);
        DensitySet d = TestData.gaussianField(TestData.K3, loc, VariogramModel.exponential(2, 4), 4);
        EmpiricalVariogram w = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withBinWidth(0.5)
                .withMaxLag(6));
        assertEquals(12, w.binCount());
        check(w, 0, naive(loc, d, w.edges(), Double.NaN, 0));
        EmpiricalVariogram w2 = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withBinWidth(0.7)
                .withMaxLag(6));
        assertEquals(9, w2.binCount());
        assertEquals(5.6, w2.edges()[8], 1e-12);
        check(w2, 0, naive(loc, d, w2.edges(), Double.NaN, 0));
        double[] edges = {0.2, 0.5, 1, 2, 3.5, 5};
        EmpiricalVariogram e = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withEdges(edges));
        assertArrayEquals(edges, e.edges(), 0);
        check(e, 0, naive(loc, d, edges, Double.NaN, 0));
        EmpiricalVariogram s = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withBinCount(8)
                .withMaxLag(5).withDirections(22.5, 0, 45, 90, 135));
        assertEquals(4, s.sectorCount());
        double[] dirs = {0, 45, 90, 135};
        for (int k = 0; k < 4; k++) {
            check(s, k, naive(loc, d, s.edges(), dirs[k], 22.5));
        }
    }

    @Test
    void parallelIsBitIdenticalToSerialAndCloudIsConsistent() {
        Locations loc = TestData.uniformSquare(2500, 1, 8);
        DensitySet d = TestData.independentCoordinates(TestData.K3, 2500, 9);
        VariogramOptions o = VariogramOptions.withDefaults().withBinCount(20);
        EmpiricalVariogram a = EmpiricalVariogram.of(loc, d, o.withParallel(true));
        EmpiricalVariogram b = EmpiricalVariogram.of(loc, d, o.withParallel(false));
        assertArrayEquals(a.semivariances(), b.semivariances(), 0);
        assertArrayEquals(a.meanLags(), b.meanLags(), 0);
        assertArrayEquals(a.counts(), b.counts());
        Locations small = TestData.uniformSquare(30, 1, 1);
        DensitySet ds = TestData.independentCoordinates(TestData.K3, 30, 2);
        VariogramCloud cloud = EmpiricalVariogram.of(small, ds, VariogramOptions.withDefaults().withMaxLag(0.5)
                .withCloud(100000)).cloud();
        assertTrue(cloud.size() > 0 && !cloud.truncated());
        for (int p = 0; p < cloud.size(); p++) {
            assertEquals(0.5 * ds.get(cloud.first()[p]).distanceSq(ds.get(cloud.second()[p])), cloud.semivariance()[p],
                    1e-12);
            assertTrue(cloud.distance()[p] <= 0.5);
        }
        VariogramCloud cut = EmpiricalVariogram.of(small, ds, VariogramOptions.withDefaults().withCloud(5)).cloud();
        assertEquals(5, cut.size());
        assertTrue(cut.truncated());
    }

    @Test
    void geographicLagsAreGreatCircleKilometres() {
        double[] lon = {0, 1, 2, 0.5, 1.5, 3}, lat = {50, 50.5, 51, 49.7, 50.2, 50.9};
        Locations loc = Locations.geographic(lon, lat);
        DensitySet d = TestData.independentCoordinates(TestData.K3, 6, 3);
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withEdges(0, 100, 300));
        check(ev, 0, naive(loc, d, ev.edges(), Double.NaN, 0));
        assertThrows(IllegalArgumentException.class, () -> EmpiricalVariogram.of(loc, d,
                VariogramOptions.withDefaults().withDirections(10, 0)));
    }

    @Test
    void largeCommonOffsetKeepsTheDigitsOfSmallDifferences() {
        // Perturbation by a fixed density is a translation in B2 (Egozcue, Diaz-Barrero,
        // Pawlowsky-Glahn (2006), Hilbert space of probability density functions based on
        // Aitchison geometry, Acta Math. Sin. 22 — from memory), so every ‖X_i ⊖ X_j‖ and hence
        // every γ̂ is unchanged; the reference is the pair-by-pair difference loop.
        Locations loc = TestData.uniformSquare(200, 10, 5);
        DensitySet field = TestData.gaussianField(TestData.K3, loc, VariogramModel.exponential(2, 4), 6);
        double[][] small = field.coordinates();
        for (double[] row : small) {
            for (int c = 0; c < row.length; c++) {
                row[c] *= 1e-2; // differences of order 1e-2
            }
        }
        DensitySet d = DensitySet.of(TestData.K3, small);
        double[] off = new double[TestData.K3.dimension()];
        java.util.Arrays.fill(off, 1e4 / Math.sqrt(off.length));
        DensitySet shifted = d.perturb(TestData.K3.density(off));
        assertEquals(1e4, TestData.K3.density(off).norm(), 1e-8);
        VariogramOptions o = VariogramOptions.withDefaults().withBinCount(10).withMaxLag(6);
        double[] plain = EmpiricalVariogram.of(loc, d, o).semivariances();
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, shifted, o);
        double[] far = ev.semivariances();
        double[][] ref = naive(loc, shifted, ev.edges(), Double.NaN, 0);
        for (int b = 0; b < plain.length; b++) {
            // tolerance: coordinates of size 1e4 carry absolute rounding 1e4 · 2^-52 ≈ 2e-12 against
            // differences of 1e-2, so γ̂ keeps about 9 digits (the Gram identity on uncentred
            // coordinates keeps about 4)
            assertEquals(plain[b], far[b], 1e-7 * plain[b], "bin " + b);
            assertEquals(ref[2][b], far[b], 1e-7 * ref[2][b], "bin " + b + " against the pair loop");
        }
    }

    @Test
    void pairsExactlyOnABinEdgeBinAsLocationsDistanceSays() {
        // edges placed at the exact distances Locations.distance reports for some pairs: bins are
        // (e_b, e_{b+1}], so each such pair must land in the lower bin, as in the pair loop
        java.util.Random r = new java.util.Random(17);
        int n = 60;
        double[] lon = new double[n], lat = new double[n];
        for (int i = 0; i < n; i++) {
            lon[i] = 10 + 3 * r.nextDouble();
            lat[i] = 45 + 2 * r.nextDouble();
        }
        Locations geo = Locations.geographic(lon, lat);
        Locations plane = TestData.uniformSquare(n, 7.3, 18);
        DensitySet d = TestData.independentCoordinates(TestData.K3, n, 19);
        for (Locations loc : new Locations[] {geo, plane}) {
            double[] edges = {0, loc.distance(0, 1), loc.distance(2, 3), loc.distance(4, 5), loc.distance(6, 7)};
            java.util.Arrays.sort(edges);
            EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withEdges(edges));
            check(ev, 0, naive(loc, d, edges, Double.NaN, 0));
            // uniform bins whose maximum lag is exactly a pair distance
            EmpiricalVariogram u = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withBinCount(4)
                    .withMaxLag(edges[4]));
            check(u, 0, naive(loc, d, u.edges(), Double.NaN, 0));
        }
    }

    @Test
    void greatCircleMatchesTheHaversineFormula() {
        // haversine (Sinnott (1984), Virtues of the haversine, Sky and Telescope 68(2) — from
        // memory) written out independently; 1 degree of a meridian = π R / 180 km
        java.util.Random r = new java.util.Random(23);
        for (int t = 0; t < 200; t++) {
            double lo1 = 360 * r.nextDouble() - 180, la1 = 170 * r.nextDouble() - 85;
            double lo2 = lo1 + (r.nextDouble() - 0.5) * Math.pow(10, -4 + 6 * r.nextDouble());
            lo2 = lo2 < -180 ? lo2 + 360 : lo2; // the same meridian, inside the accepted [-180, 360]
            double la2 = Math.max(-89, Math.min(89, la1 + (r.nextDouble() - 0.5) * 10));
            double p1 = Math.toRadians(la1), p2 = Math.toRadians(la2);
            double hv = Math.pow(Math.sin((p2 - p1) / 2), 2)
                    + Math.cos(p1) * Math.cos(p2) * Math.pow(Math.sin(Math.toRadians(lo2 - lo1) / 2), 2);
            double ref = 2 * Locations.EARTH_RADIUS_KM * Math.asin(Math.sqrt(hv));
            assertEquals(ref, Locations.greatCircleKm(lo1, la1, lo2, la2), 1e-9 * Math.max(1, ref));
        }
        assertEquals(Math.PI * Locations.EARTH_RADIUS_KM / 180, Locations.greatCircleKm(5, 10, 5, 11), 1e-9);
    }

    @Test
    void badOptionsAreRejected() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> VariogramOptions.withDefaults().withEdges(0, 2, 1));
        assertTrue(e.getMessage().matches("bin edges must be .*; edge 2 = 1.0"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> VariogramOptions.withDefaults().withBinWidth(Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> VariogramOptions.withDefaults().withDirections(95, 0));
        Locations loc = TestData.uniformSquare(5, 1, 1);
        e = assertThrows(IllegalArgumentException.class, () -> EmpiricalVariogram.of(loc,
                TestData.independentCoordinates(TestData.K3, 4, 1), VariogramOptions.withDefaults()));
        assertTrue(e.getMessage().matches("locations \\(5\\) and densities \\(4\\) differ in number"), e.getMessage());
    }
}
