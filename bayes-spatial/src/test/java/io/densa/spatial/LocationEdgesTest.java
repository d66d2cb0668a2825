package io.densa.spatial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensitySet;
import io.densa.spatial.internal.Scaling;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.KrigingPrediction;
import io.densa.spatial.kriging.OrdinaryKrigingReferenceTest;
import io.densa.spatial.variogram.VariogramModel;
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
            double d = Scaling.planarNorm(dx, dy);
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
    void krigingIsInvariantToTheUnitOfLengthEvenAtExtremeScales() {
        // Isaaks & Srivastava (1989), An Introduction to Applied Geostatistics, ch. 12 (from memory):
        // seven samples, C(h) = 10 e^{-0.3h}: weights 0.1729 0.3178 0.1287 0.0864 0.1511 0.0572 0.0858,
        // estimate 592.73, variance 8.956. Measuring lengths in another unit (coordinates and range
        // times s) changes no covariance, hence none of these numbers.
        double[] w = {0.1729, 0.3178, 0.1287, 0.0864, 0.1511, 0.0572, 0.0858};
        DensitySet data = OrdinaryKrigingReferenceTest.data();
        for (double s : new double[] {1, 1e300, 1e-300}) {
            double[][] xy = new double[7][];
            for (int i = 0; i < 7; i++) {
                xy[i] = new double[] {OrdinaryKrigingReferenceTest.XY[i][0] * s, OrdinaryKrigingReferenceTest.XY[i][1] * s};
            }
            Kriging k = Kriging.ordinary(Locations.planar(xy), data, VariogramModel.exponential(10, 10 * s),
                    KrigingOptions.withDefaults());
            KrigingPrediction p = k.predictWithWeights(OrdinaryKrigingReferenceTest.X0 * s,
                    OrdinaryKrigingReferenceTest.Y0 * s);
            for (int i = 0; i < 7; i++) {
                assertEquals(w[i], p.weights()[i], 5e-4, "scale " + s + ", weight " + i);
            }
            assertEquals(592.73, p.density().coordinate(0), 0.01, "scale " + s);
            assertEquals(8.956, p.variance(), 0.001, "scale " + s);
            // the nearest sample, (63, 140), is √(2² + 3²) = √13 from the target (65, 137)
            assertEquals(Math.sqrt(13) * s, p.nearestStationDistance(), 1e-12 * s, "scale " + s);
        }
    }

    @Test
    void everyGeographicEntryPointAppliesTheSameCheck() {
        String bad = ".*is not a geographic point: longitude must be in \\[-180, 360\\] and latitude in \\[-90, 90\\]"
                + " degrees";
        double[][] points = {{0, 95}, {1000, 10}, {Double.NaN, 0}, {0, Double.NaN}, {-181, 0}, {0, -90.5}};
        Locations loc = Locations.geographic(new double[] {0, 1, 2, 3, 1.5}, new double[] {50, 50.5, 51, 49.5, 50});
        NeighbourIndex index = NeighbourIndex.of(loc);
        DensitySet d = TestData.independentCoordinates(TestData.K3, 5, 3);
        Kriging k = Kriging.ordinary(loc, d, VariogramModel.exponential(1, 500), KrigingOptions.withDefaults());
        for (double[] pt : points) {
            double lon = pt[0], lat = pt[1];
            rejects("location 1 " + bad, () -> Locations.geographic(new double[] {0, lon}, new double[] {0, lat}));
            rejects("second point " + bad, () -> Locations.greatCircleKm(0, 0, lon, lat));
            rejects("first point " + bad, () -> Locations.greatCircleKm(lon, lat, 0, 0));
            rejects("target " + bad, () -> k.predict(lon, lat));
            rejects("query point " + bad, () -> index.nearest(lon, lat, 2));
            rejects("query point " + bad, () -> index.within(lon, lat, 100));
            rejects("point " + bad, () -> loc.distanceTo(0, lon, lat));
            if (Double.isFinite(lon) && Double.isFinite(lat)) {
                // a 3 x 3 grid whose centre cell is the point: its corner cells lie beyond it
                rejects("grid corner " + bad, () -> k.predictGrid(Grid.over(lon - 1, lat - 1, lon + 1, lat + 1, 3, 3),
                        GridOptions.withDefaults(), t -> { }));
            }
        }
        // the extremes themselves are accepted: the poles and the ends of the longitude range
        assertEquals(Math.PI * Locations.EARTH_RADIUS_KM, Locations.greatCircleKm(-180, -90, 360, 90), 1e-6);
        assertEquals(0, index.nearest(360, 50, 1)[0]);
        assertTrue(Double.isFinite(k.predict(360, 50).variance()));
    }
}
