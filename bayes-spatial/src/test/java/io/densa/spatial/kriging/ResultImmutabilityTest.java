package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertNotSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.variogram.VariogramCloud;
import io.densa.spatial.variogram.VariogramFit;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramFitting;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import org.junit.jupiter.api.Test;

/**
 * Result records with array components are immutable values (common practice for Java records,
 * whose generated accessors and equality would otherwise expose and compare arrays by reference):
 * changing the caller's input array or an accessor's result leaves the record unchanged, and two
 * records with equal contents are equal with equal hashes.
 */
class ResultImmutabilityTest {
    @Test
    void cloudCopiesAndComparesByContent() {
        int[] a = {0, 1}, b = {1, 2};
        double[] d = {0.5, 0.7}, g = {1, 2};
        VariogramCloud c = new VariogramCloud(a, b, d, g, false);
        a[0] = 9;
        d[0] = 9;
        c.first()[1] = 9;
        c.semivariance()[0] = -1;
        assertEquals(0, c.first()[0]);
        assertEquals(1, c.first()[1]);
        assertEquals(0.5, c.distance()[0]);
        assertEquals(1, c.semivariance()[0]);
        VariogramCloud same = new VariogramCloud(new int[] {0, 1}, new int[] {1, 2}, new double[] {0.5, 0.7},
                new double[] {1, 2}, false);
        assertEquals(same, c);
        assertEquals(same.hashCode(), c.hashCode());
        assertNotEquals(new VariogramCloud(new int[] {0, 1}, new int[] {1, 3}, new double[] {0.5, 0.7},
                new double[] {1, 2}, false), c);
        assertTrue(c.toString().contains("first=[0, 1]"), c.toString());
    }

    @Test
    void predictionDiagnosticsAndCrossValidationCopy() {
        Locations loc = TestData.uniformSquare(20, 1, 3);
        DensitySet data = TestData.independentCoordinates(TestData.K3, 20, 4);
        Kriging k = Kriging.ordinary(loc, data, VariogramModel.exponential(1, 0.5), KrigingOptions.withDefaults());
        KrigingPrediction p = k.predictWithWeights(0.3, 0.4);
        double w0 = p.weights()[0];
        p.weights()[0] = 99;
        p.neighbours()[0] = 99;
        assertEquals(w0, p.weights()[0]);
        assertEquals(0, p.neighbours()[0]);
        assertEquals(p, k.predictWithWeights(0.3, 0.4));
        assertEquals(p.hashCode(), k.predictWithWeights(0.3, 0.4).hashCode());

        CrossValidation cv = k.crossValidate();
        double e00 = cv.errors()[0][0];
        cv.errors()[0][0] = 99;
        cv.errorNorms()[0] = 99;
        assertEquals(e00, cv.errors()[0][0]);
        assertNotSame(cv.errors(), cv.errors());
        assertEquals(cv, k.crossValidate());
        assertEquals(cv.hashCode(), k.crossValidate().hashCode());

        int[] idx = {2, 5};
        KrigingDiagnostics kd = new KrigingDiagnostics(2, 10, idx, "x");
        idx[0] = 7;
        kd.locations()[1] = 7;
        assertEquals(new KrigingDiagnostics(2, 10, new int[] {2, 5}, "x"), kd);
    }

    @Test
    void variogramFitCopies() {
        Locations loc = TestData.uniformSquare(60, 1, 5);
        DensitySet data = TestData.independentCoordinates(TestData.K3, 60, 6);
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, data, VariogramOptions.withDefaults());
        VariogramFit fit = VariogramFitting.fit(ev, VariogramFitOptions.withDefaults());
        double f0 = fit.fitted()[0];
        fit.fitted()[0] = 99;
        assertEquals(f0, fit.fitted()[0]);
        assertEquals(fit, VariogramFitting.fit(ev, VariogramFitOptions.withDefaults()));
    }
}
