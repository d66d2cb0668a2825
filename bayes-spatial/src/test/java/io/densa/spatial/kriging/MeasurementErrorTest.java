package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

/**
 * Location-specific measurement-error variances: v_i on the system diagonal only (convention of
 * {@link KrigingOptions}); checked against a direct EJML solve of the bordered system.
 */
class MeasurementErrorTest {
    final Locations loc = TestData.uniformSquare(25, 1, 5);
    final DensitySet data = TestData.independentCoordinates(TestData.K3, 25, 6);
    final VariogramModel model = VariogramModel.exponential(1, 0.6);

    @Test
    void largerErrorVarianceGivesSmallerWeight() {
        // two locations mirrored about the target, otherwise identical
        Locations two = Locations.planar(new double[] {0.4, 0.6, 0.5, 0.5}, new double[] {0.5, 0.5, 0.9, 0.1});
        DensitySet d = TestData.independentCoordinates(TestData.K3, 4, 1);
        double previous = Double.NaN;
        for (double v : new double[] {0, 0.1, 0.5, 2}) {
            KrigingPrediction p = Kriging.ordinary(two, d, model,
                    KrigingOptions.withDefaults().withErrorVariances(v, 0, 0, 0)).predictWithWeights(0.5, 0.5);
            if (v > 0) {
                assertTrue(p.weights()[0] < p.weights()[1], "v=" + v);
                assertTrue(p.weights()[0] < previous, "weight must fall as v grows");
            } else {
                assertEquals(p.weights()[0], p.weights()[1], 1e-12);
            }
            previous = p.weights()[0];
        }
    }

    @Test
    void equalErrorVariancesActLikeANuggetInTheSystemOnly() {
        double c = 0.3;
        double[] v = new double[25];
        java.util.Arrays.fill(v, c);
        Kriging err = Kriging.ordinary(loc, data, model, KrigingOptions.withDefaults().withErrorVariances(v));
        Kriging nug = Kriging.ordinary(loc, data, model.withNugget(c), KrigingOptions.withDefaults());
        double tx = 0.37, ty = 0.52;
        KrigingPrediction a = err.predictWithWeights(tx, ty);
        KrigingPrediction b = nug.predictWithWeights(tx, ty);
        for (int i = 0; i < 25; i++) {
            assertEquals(a.weights()[i], b.weights()[i], 1e-12);
        }
        // the nugget model also counts c at the target: variances differ by exactly c
        assertEquals(b.variance() - c, a.variance(), 1e-12);
        // direct EJML solve of [C + cI, 1; 1', 0] with the error-free right-hand side
        int n = 25;
        DMatrixRMaj m = new DMatrixRMaj(n + 1, n + 1);
        DMatrixRMaj rhs = new DMatrixRMaj(n + 1, 1);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                m.set(i, j, i == j ? 1 + c : model.covariance(loc.distance(i, j)));
            }
            m.set(i, n, 1);
            m.set(n, i, 1);
            rhs.set(i, model.covariance(loc.distanceTo(i, tx, ty)));
        }
        rhs.set(n, 1);
        DMatrixRMaj x = new DMatrixRMaj(n + 1, 1);
        CommonOps_DDRM.solve(m, rhs, x);
        double var = 1;
        for (int i = 0; i < n; i++) {
            assertEquals(x.get(i), a.weights()[i], 1e-10);
            var -= x.get(i) * rhs.get(i);
        }
        assertEquals(var - x.get(n), a.variance(), 1e-10);
        // at a data location the error model smooths, the nugget model interpolates
        KrigingPrediction atErr = err.predict(loc.x(3), loc.y(3));
        KrigingPrediction atNug = nug.predict(loc.x(3), loc.y(3));
        assertTrue(atNug.density().equalsWithin(data.get(3), 1e-9));
        assertFalse(atErr.density().equalsWithin(data.get(3), 1e-3));
        assertTrue(atErr.variance() > 0);
    }
}
