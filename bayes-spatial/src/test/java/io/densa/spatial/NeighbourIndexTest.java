package io.densa.spatial;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Comparator;
import java.util.Random;
import java.util.stream.IntStream;
import org.junit.jupiter.api.Test;

/** Neighbour queries against brute force; great-circle distance against closed forms. */
class NeighbourIndexTest {
    static int[] brute(Locations loc, double x, double y, int k) {
        return IntStream.range(0, loc.size()).boxed()
                .sorted(Comparator.<Integer>comparingDouble(i -> loc.distanceTo(i, x, y)).thenComparing(i -> i))
                .limit(k).mapToInt(Integer::intValue).toArray();
    }

    @Test
    void nearestAndWithinMatchBruteForcePlanarAndGeographic() {
        Random r = new Random(61);
        Locations planar = TestData.uniformSquare(500, 100, 62);
        double[] lon = new double[400], lat = new double[400];
        for (int i = 0; i < 400; i++) {
            lon[i] = -180 + 360 * r.nextDouble();
            lat[i] = Math.toDegrees(Math.asin(2 * r.nextDouble() - 1));
        }
        Locations geo = Locations.geographic(lon, lat);
        for (Locations loc : new Locations[] {planar, geo}) {
            NeighbourIndex idx = NeighbourIndex.of(loc);
            for (int t = 0; t < 50; t++) {
                double x = loc == planar ? 100 * r.nextDouble() : -180 + 360 * r.nextDouble();
                double y = loc == planar ? 100 * r.nextDouble() : -89 + 178 * r.nextDouble();
                int k = 1 + r.nextInt(40);
                assertArrayEquals(brute(loc, x, y, k), idx.nearest(x, y, k));
                double rad = loc == planar ? 15 : 2500;
                int[] in = idx.within(x, y, rad);
                int[] b = brute(loc, x, y, loc.size());
                int c = 0;
                while (c < b.length && loc.distanceTo(b[c], x, y) <= rad) {
                    c++;
                }
                assertArrayEquals(Arrays.copyOf(b, c), in);
            }
        }
    }

    @Test
    void greatCircleClosedForms() {
        double r = Locations.EARTH_RADIUS_KM;
        // quarter meridian: equator to pole = πR/2; antipodes = πR (spherical geometry, closed form)
        assertEquals(Math.PI * r / 2, Locations.greatCircleKm(10, 0, 10, 90), 1e-9);
        assertEquals(Math.PI * r, Locations.greatCircleKm(0, 0, 180, 0), 1e-9);
        assertEquals(Math.PI * r, Locations.greatCircleKm(30, 45, -150, -45), 1e-6);
        // a quarter of the equator
        assertEquals(Math.PI * r / 2, Locations.greatCircleKm(-45, 0, 45, 0), 1e-9);
    }

    @Test
    void closePairsFindsCoincidences() {
        Locations loc = Locations.planar(new double[] {0, 1, 0, 1, 5}, new double[] {0, 1, 0, 1.0000001, 5});
        int[][] p = NeighbourIndex.of(loc).closePairs(0);
        assertEquals(1, p.length);
        assertArrayEquals(new int[] {0, 2}, p[0]);
        assertEquals(2, NeighbourIndex.of(loc).closePairs(1e-6).length);
    }
}
