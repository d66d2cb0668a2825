package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import org.junit.jupiter.api.Test;

/**
 * Simulation recovery for universal kriging with an iterated residual variogram: a known linear
 * drift in the first coordinate plus a Gaussian random field (fixed seed). The GLS drift slope is
 * recovered within ±0.5 (about three standard errors for this configuration, common practice) and
 * the residual model's range within ±50% (residual variograms are biased by the fitted drift).
 */
class UniversalFitTest {
    @Test
    void iteratedResidualVariogramRecoversDriftAndRange() {
        Locations loc = TestData.uniformSquare(400, 1, 71);
        DensitySet field = TestData.gaussianField(TestData.K10, loc, VariogramModel.exponential(1, 0.2), 72);
        double[][] c = field.coordinates();
        for (int i = 0; i < c.length; i++) {
            c[i][0] += 3 * loc.x(i) - 2 * loc.y(i);
        }
        DensitySet d = DensitySet.of(TestData.K10, c);
        UniversalFit fit = UniversalFit.estimate(loc, d, Drift.polynomial(1), VariogramOptions.withDefaults()
                .withMaxLag(0.5), VariogramFitOptions.withDefaults(), KrigingOptions.withDefaults()
                .withNeighbourhood(Neighbourhood.nearest(30)), 10);
        assertTrue(fit.converged(), "iterations " + fit.iterations());
        // drift columns: 1, u, v with u = (x − cx)/s: slope in x is β_u / s
        double[] bb = loc.boundingBox();
        double s = 0.5 * Math.max(bb[2] - bb[0], bb[3] - bb[1]);
        assertEquals(3, fit.driftCoefficients()[1][0] / s, 0.5);
        assertEquals(-2, fit.driftCoefficients()[2][0] / s, 0.5);
        double range = fit.fit().model().structures().get(0).range();
        assertEquals(0.2, range, 0.1, "residual range");
        KrigingPrediction p = fit.kriging().predict(0.5, 0.5);
        assertEquals(TestData.K10, p.density().space());
    }
}
