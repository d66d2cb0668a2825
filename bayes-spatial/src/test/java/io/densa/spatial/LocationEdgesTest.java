package io.densa.spatial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * Distances that neither overflow nor underflow, and one check of geographic points everywhere a
 * caller's point enters.
 */
class LocationEdgesTest {
    private static void rejects(String regex, org.junit.jupiter.api.function.Executable call) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, call);
        assertTrue(e.getMessage().matches(regex), "message was: " + e.getMessage());
    }

    @Test
    void planarDistancesSurviveExtremeScales() {
        // the 3-4-5 right triangle (Pythagoras) at scales where dx² + dy² over- or underflows
        for (double s : new double[] {1e300, 1e-300, 1e-320, 1}) {
            Locations loc = Locations.planar(new double[] {0, 3 * s}, new double[] {0, 4 * s});
            double d = loc.distance(0, 1);
            assertEquals(5 * s, d, 1e-15 * 5 * s + (s < 1e-307 ? 2 * Double.MIN_VALUE : 0), "scale " + s);
            assertEquals(d, loc.distanceTo(0, 3 * s, 4 * s), 0);
        }
        // against Math.hypot (JDK, general-purpose reference) over 2·10⁴ random magnitudes: within an
        // ulp or two, and bit-identical to √(dx² + dy²) where that does not over- or underflow
        Random r = new Random(7);
        for (int t = 0; t < 20_000; t++) {
            double dx = (r.nextDouble() - 0.5) * Math.pow(10, r.nextInt(600) - 300);
            double dy = (r.nextDouble() - 0.5) * Math.pow(10, r.nextInt(600) - 300);
            double d = Locations.planarNorm(dx, dy);
            double ref = Math.hypot(dx, dy);
            assertEquals(ref, d, 3 * Math.ulp(ref), dx + ", " + dy);
            double s = dx * dx + dy * dy;
            if (s > 1e-290 && s < 1e290) {
                assertEquals(Math.sqrt(s), d, 0);
            }
        }
    }

    @Test
    void locationsWhoseDiagonalOverflowsAreRejected() {
        rejects("the locations span \\[-1.0E308, 1.0E308\\] x \\[0.0, 0.0\\], whose diagonal overflows a double;.*",
                () -> Locations.planar(new double[] {-1e308, 1e308}, new double[] {0, 0}));
        // a span of 1.5e308 is fine
        assertEquals(1.5e308, Locations.planar(new double[] {-0.5e308, 1e308}, new double[] {0, 0}).distance(0, 1),
                1e293);
    }

    @Test
    void everyGeographicEntryPointAppliesTheSameCheck() {
        String bad = ".*is not a geographic point: longitude must be in \\[-180, 360\\] and latitude in \\[-90, 90\\]"
                + " degrees";
        double[][] points = {{0, 95}, {1000, 10}, {Double.NaN, 0}, {0, Double.NaN}, {-181, 0}, {0, -90.5}};
        Locations loc = Locations.geographic(new double[] {0, 1, 2, 3, 1.5}, new double[] {50, 50.5, 51, 49.5, 50});
        NeighbourIndex index = NeighbourIndex.of(loc);
        for (double[] pt : points) {
            double lon = pt[0], lat = pt[1];
            rejects("location 1 " + bad, () -> Locations.geographic(new double[] {0, lon}, new double[] {0, lat}));
            rejects("second point " + bad, () -> Locations.greatCircleKm(0, 0, lon, lat));
            rejects("first point " + bad, () -> Locations.greatCircleKm(lon, lat, 0, 0));
            rejects("query point " + bad, () -> index.nearest(lon, lat, 2));
            rejects("query point " + bad, () -> index.within(lon, lat, 100));
            rejects("point " + bad, () -> loc.distanceTo(0, lon, lat));
        }
        // the extremes themselves are accepted: the poles and the ends of the longitude range
        assertEquals(Math.PI * Locations.EARTH_RADIUS_KM, Locations.greatCircleKm(-180, -90, 360, 90), 1e-6);
        assertEquals(0, index.nearest(360, 50, 1)[0]);
    }
}
