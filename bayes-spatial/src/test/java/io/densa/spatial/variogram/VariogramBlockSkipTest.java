package io.densa.spatial.variogram;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The variogram pass visits locations in Z order and skips blocks of locations that lie beyond the
 * largest lag from a location; the skip must never lose a pair. Checked on uneven networks (tight
 * clusters far apart, a few isolated sites, coincident sites) with short lags, where most blocks
 * are skipped, against the textbook pair loop γ̂(h) = (1/2|N(h)|) Σ ‖X_i ⊖ X_j‖²_B (Matheron
 * (1962), Traité de géostatistique appliquée — from memory; {@link EmpiricalVariogramTest#naive}) on every
 * pair, and for invariance under relabelling of the locations.
 */
class VariogramBlockSkipTest {
    /** n sites in a few tight clusters spread over a square of side 100, plus isolated and repeated sites. */
    static double[][] clustered(int n, long seed) {
        return clustered(n, seed, true);
    }

    static double[][] clustered(int n, long seed, boolean repeats) {
        Random r = new Random(seed);
        double[] x = new double[n];
        double[] y = new double[n];
        double[][] centres = new double[7][];
        for (int c = 0; c < centres.length; c++) {
            centres[c] = new double[] {100 * r.nextDouble(), 100 * r.nextDouble(), 0.3 + 3 * r.nextDouble()};
        }
        for (int i = 0; i < n; i++) {
            if (i % 50 == 0) {
                x[i] = 100 * r.nextDouble();
                y[i] = 100 * r.nextDouble();
            } else if (repeats && i % 97 == 1) {
                x[i] = x[i - 1];
                y[i] = y[i - 1];
            } else {
                double[] c = centres[r.nextInt(centres.length)];
                x[i] = c[0] + c[2] * r.nextGaussian();
                y[i] = c[1] + c[2] * r.nextGaussian();
            }
        }
        return new double[][] {x, y};
    }

    private static double[] edges(double maxLag, int bins) {
        double[] e = new double[bins + 1];
        for (int b = 0; b <= bins; b++) {
            e[b] = maxLag * b / bins;
        }
        return e;
    }

    @Test
    void shortLagsOnClusteredNetworksLoseNoPair() {
        for (long seed : new long[] {1, 2, 3}) {
            double[][] xy = clustered(1500, seed);
            Locations loc = Locations.planar(xy[0], xy[1]);
            DensitySet d = TestData.independentCoordinates(TestData.K3, 1500, seed + 10);
            for (double maxLag : new double[] {0.8, 4, 25}) {
                // equal widths (the direct bin index) and uneven explicit edges (the search)
                VariogramOptions width = VariogramOptions.withDefaults().withBinWidth(maxLag / 12).withMaxLag(maxLag)
                        .withMinimumPairs(1);
                EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, width);
                EmpiricalVariogramTest.check(ev, 0, EmpiricalVariogramTest.naive(loc, d, ev.edges(), Double.NaN, 0));
                double[] uneven = {0, 0.05 * maxLag, 0.2 * maxLag, 0.3 * maxLag, 0.7 * maxLag, maxLag};
                EmpiricalVariogram eu = EmpiricalVariogram.of(loc, d,
                        VariogramOptions.withDefaults().withEdges(uneven).withMinimumPairs(1));
                EmpiricalVariogramTest.check(eu, 0, EmpiricalVariogramTest.naive(loc, d, eu.edges(), Double.NaN, 0));
            }
            // direction sectors take the general pair loop (no repeated sites here: a pair at lag 0
            // belongs to every sector, which the angular reference does not model)
            double[][] xd = clustered(1500, seed, false);
            loc = Locations.planar(xd[0], xd[1]);
            EmpiricalVariogram es = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withMaxLag(4)
                    .withBinWidth(0.5).withMinimumPairs(1).withDirections(20, 0, 90));
            for (int s = 0; s < 2; s++) {
                EmpiricalVariogramTest.check(es, s, EmpiricalVariogramTest.naive(loc, d, es.edges(s),
                        es.directions()[s], 20));
            }
        }
    }

    @Test
    void geographicShortLagsLoseNoPair() {
        double[][] xy = clustered(1200, 4);
        double[] lon = new double[xy[0].length];
        double[] lat = new double[xy[0].length];
        for (int i = 0; i < lon.length; i++) {
            lon[i] = -170 + 3.4 * xy[0][i]; // clusters across most longitudes, including near ±180
            lat[i] = -60 + 1.2 * xy[1][i];
        }
        Locations loc = Locations.geographic(lon, lat);
        DensitySet d = TestData.independentCoordinates(TestData.K3, lon.length, 5);
        for (double maxKm : new double[] {50, 400, 3000}) {
            EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d,
                    VariogramOptions.withDefaults().withEdges(edges(maxKm, 10)).withMinimumPairs(1));
            EmpiricalVariogramTest.check(ev, 0, EmpiricalVariogramTest.naive(loc, d, ev.edges(), Double.NaN, 0));
        }
    }

    @Test
    void relabellingTheLocationsChangesNothing() {
        double[][] xy = clustered(900, 6);
        int n = xy[0].length;
        DensitySet d = TestData.independentCoordinates(TestData.K3, n, 7);
        int[] perm = new int[n];
        for (int i = 0; i < n; i++) {
            perm[i] = (int) ((i * 7919L) % n); // 7919 is prime, so this is a permutation of 0..n−1
        }
        double[] x = new double[n];
        double[] y = new double[n];
        double[][] c = new double[n][];
        for (int i = 0; i < n; i++) {
            x[i] = xy[0][perm[i]];
            y[i] = xy[1][perm[i]];
            c[i] = d.get(perm[i]).coordinates();
        }
        VariogramOptions o = VariogramOptions.withDefaults().withMaxLag(6).withBinWidth(0.5).withMinimumPairs(1);
        EmpiricalVariogram a = EmpiricalVariogram.of(Locations.planar(xy[0], xy[1]), d, o);
        EmpiricalVariogram b = EmpiricalVariogram.of(Locations.planar(x, y), DensitySet.of(d.space(), c), o);
        assertArrayEquals(a.counts(), b.counts());
        for (int q = 0; q < a.binCount(); q++) {
            assertEquals(a.semivariances()[q], b.semivariances()[q], 1e-12 * a.semivariances()[q]);
            assertEquals(a.meanLags()[q], b.meanLags()[q], 1e-12 * a.meanLags()[q]);
        }
    }
}
