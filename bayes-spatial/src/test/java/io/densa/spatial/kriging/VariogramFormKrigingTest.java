package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

/**
 * Ordinary kriging in variogram form, [Γ 1; 1ᵀ 0][λ; μ] = [γ0; 1], σ² = λᵀγ0 + μ (Giraldo,
 * Delicado, Mateu (2011), Ordinary kriging for function-valued spatial data, Environ. Ecol. Stat. 18
 * — from memory), solved directly and independently of the library with EJML: checks the unbounded power model (used through a pseudo-covariance) and geographic
 * locations with great-circle distances.
 */
class VariogramFormKrigingTest {
    static double[] direct(Locations loc, VariogramModel m, double x0, double y0) {
        int n = loc.size();
        DMatrixRMaj a = new DMatrixRMaj(n + 1, n + 1);
        DMatrixRMaj b = new DMatrixRMaj(n + 1, 1);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                a.set(i, j, i == j ? 0 : m.gamma(loc.distance(i, j)));
            }
            a.set(i, n, 1);
            a.set(n, i, 1);
            b.set(i, m.gamma(loc.distanceTo(i, x0, y0)));
        }
        b.set(n, 1);
        DMatrixRMaj x = new DMatrixRMaj(n + 1, 1);
        CommonOps_DDRM.solve(a, b, x);
        double[] out = new double[n + 1];
        double var = x.get(n);
        for (int i = 0; i < n; i++) {
            out[i] = x.get(i);
            var += x.get(i) * b.get(i);
        }
        out[n] = var;
        return out;
    }

    static void check(Locations loc, VariogramModel m, double x0, double y0) {
        DensitySet d = TestData.independentCoordinates(TestData.K3, loc.size(), 3);
        KrigingPrediction p = Kriging.ordinary(loc, d, m, KrigingOptions.withDefaults()).predictWithWeights(x0, y0);
        double[] ref = direct(loc, m, x0, y0);
        for (int i = 0; i < loc.size(); i++) {
            assertEquals(ref[i], p.weights()[i], 1e-9, "weight " + i);
        }
        assertEquals(ref[loc.size()], p.variance(), 1e-9 * Math.max(1, ref[loc.size()]));
    }

    @Test
    void powerModelMatchesVariogramFormSolve() {
        check(TestData.uniformSquare(15, 10, 81), VariogramModel.power(0.7, 1.2), 4.2, 6.1);
        check(TestData.uniformSquare(15, 10, 82), VariogramModel.power(2, 0.5).withNugget(0.3), 1, 9);
    }

    @Test
    void geographicLocationsUseGreatCircleDistances() {
        double[] lon = {-3, -1, 0.5, 2, 4, 1, -2, 3}, lat = {40, 42, 41, 43, 40.5, 39, 44, 44.5};
        check(Locations.geographic(lon, lat), VariogramModel.exponential(1, 400).withNugget(0.1), 0.8, 41.7);
        check(Locations.geographic(lon, lat), VariogramModel.spherical(1, 500), -0.5, 42.2);
    }
}
