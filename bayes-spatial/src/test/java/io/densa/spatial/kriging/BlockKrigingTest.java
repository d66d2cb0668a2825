package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import org.junit.jupiter.api.Test;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.Polygon;

/**
 * Block kriging is linear in the point predictions: with the global neighbourhood the block
 * estimate is the average of the point estimates at the discretisation points, and the block
 * variance is mean_{b,b'} C(u_b − u_b') − 2 mean_b λᵀc_b + λᵀCλ (Journel &amp; Huijbregts (1978),
 * Mining Geostatistics, ch. V — from memory), checked here by direct summation.
 */
class BlockKrigingTest {
    final Locations loc = TestData.uniformSquare(60, 1, 51);
    final DensitySet data = TestData.independentCoordinates(TestData.K3, 60, 52);
    final VariogramModel model = VariogramModel.spherical(1, 0.6).withNugget(0.05);

    static Polygon square(double x0, double y0, double s) {
        GeometryFactory gf = new GeometryFactory();
        return gf.createPolygon(new Coordinate[] {new Coordinate(x0, y0), new Coordinate(x0 + s, y0),
            new Coordinate(x0 + s, y0 + s), new Coordinate(x0, y0 + s), new Coordinate(x0, y0)});
    }

    @Test
    void blockIsTheAverageOfPointPredictionsAndHasTheBlockVariance() {
        Kriging k = Kriging.ordinary(loc, data, model, KrigingOptions.withDefaults());
        Polygon block = square(0.3, 0.2, 0.25);
        double spacing = 0.05;
        double[][] pts = BlockKriging.discretise(block, spacing);
        assertEquals(25, pts.length);
        KrigingPrediction b = k.predictBlock(block, spacing);
        double[] mean = new double[3];
        for (double[] u : pts) {
            double[] c = k.predict(u[0], u[1]).density().coordinates();
            for (int j = 0; j < 3; j++) {
                mean[j] += c[j] / pts.length;
            }
        }
        for (int j = 0; j < 3; j++) {
            assertEquals(mean[j], b.density().coordinate(j), 1e-10);
        }
        double s = 0;
        for (double w : b.weights()) {
            s += w;
        }
        assertEquals(1, s, 1e-10);
        // direct block variance of the reported weights
        int n = loc.size();
        double cvv = 0, lc = 0, lcl = 0;
        for (double[] u : pts) {
            for (double[] v : pts) {
                double h = Math.hypot(u[0] - v[0], u[1] - v[1]);
                cvv += h == 0 ? model.sill() : model.covariance(h);
            }
            for (int i = 0; i < n; i++) {
                lc += b.weights()[i] * model.covariance(loc.distanceTo(i, u[0], u[1]));
            }
        }
        cvv /= pts.length * (double) pts.length;
        lc /= pts.length;
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                lcl += b.weights()[i] * b.weights()[j] * (i == j ? model.sill() : model.covariance(loc.distance(i, j)));
            }
        }
        assertEquals(cvv - 2 * lc + lcl, b.variance(), 1e-10);
        assertTrue(b.variance() < k.predict(0.425, 0.325).variance(), "a block is predicted better than a point");
    }

    @Test
    void tinyBlockIsItsInteriorPointAndBadBlocksAreRejected() {
        Kriging k = Kriging.ordinary(loc, data, model,
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(15)));
        Polygon tiny = square(0.5, 0.5, 1e-3);
        KrigingPrediction b = k.predictBlock(tiny, 1);
        KrigingPrediction p = k.predict(0.5005, 0.5005);
        assertTrue(b.density().equalsWithin(p.density(), 1e-12));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> k.predictBlock(square(0, 0, 1), 0.001));
        assertTrue(e.getMessage().matches("spacing 0.001 puts more than 4096 points in the block.*"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> k.predictBlock(square(0, 0, 1), Double.NaN));
    }
}
