package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import io.densa.core.internal.ProgressCounter;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramModel;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Fast leave-one-out (Dubrule (1983), Cross validation of kriging in a unique neighborhood, Math.
 * Geol. 15(6) — from memory) against refitting n times.
 */
class CrossValidationTest {
    final Locations loc = TestData.uniformSquare(40, 1, 11);
    final DensitySet data = TestData.independentCoordinates(TestData.K3, 40, 12);
    final VariogramModel model = VariogramModel.spherical(1, 0.7).withNugget(0.1);

    static void assertSame(CrossValidation a, CrossValidation b) {
        for (int i = 0; i < a.errors().length; i++) {
            for (int j = 0; j < a.errors()[i].length; j++) {
                assertEquals(a.errors()[i][j], b.errors()[i][j], 1e-9, "error " + i + "," + j);
            }
            assertEquals(a.krigingVariances()[i], b.krigingVariances()[i], 1e-9, "variance " + i);
            assertEquals(a.standardisedErrors()[i], b.standardisedErrors()[i], 1e-9);
        }
        assertEquals(a.meanSquaredError(), b.meanSquaredError(), 1e-9);
    }

    @Test
    void fastEqualsBruteForceForEveryVariant() {
        double[] v = new double[40];
        for (int i = 0; i < 40; i++) {
            v[i] = 0.02 * (i % 5);
        }
        KrigingOptions o = KrigingOptions.withDefaults().withErrorVariances(v);
        Kriging[] ks = {Kriging.ordinary(loc, data, model, KrigingOptions.withDefaults()),
            Kriging.ordinary(loc, data, model, o),
            Kriging.simple(loc, data, data.mean(), model, o),
            Kriging.universal(loc, data, Drift.polynomial(1), model, o),
            Kriging.universal(loc, data, Drift.polynomial(1).withCovariates(covariate()), model, o)};
        for (Kriging k : ks) {
            assertSame(LeaveOneOut.fast(k), LeaveOneOut.bruteForce(k,
                    new ProgressCounter(ProgressListener.NONE, "cross-validation", k.locations().size())));
        }
    }

    double[][] covariate() {
        double[][] c = new double[40][1];
        for (int i = 0; i < 40; i++) {
            c[i][0] = Math.sin(3 * loc.x(i)) + loc.y(i) * loc.y(i);
        }
        return c;
    }

    @Test
    void summaryIsConsistentAndLocalNeighbourhoodsWork() {
        Kriging k = Kriging.ordinary(loc, data, model,
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(10)));
        CrossValidation cv = k.crossValidate();
        double ms = 0, mn = 0;
        for (int i = 0; i < 40; i++) {
            ms += cv.errorNorms()[i] * cv.errorNorms()[i];
            mn += cv.errorNorms()[i];
            KrigingPrediction p = Kriging.ordinary(loc.subset(without(i)), data.subset(without(i)), model,
                    KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(10)))
                    .predict(loc.x(i), loc.y(i));
            assertEquals(data.get(i).minus(p.density()).norm(), cv.errorNorms()[i], 1e-9);
        }
        assertEquals(ms / 40, cv.meanSquaredError(), 1e-12);
        assertEquals(mn / 40, cv.meanError(), 1e-12);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> LeaveOneOut.fast(k));
        org.junit.jupiter.api.Assertions.assertTrue(e.getMessage().contains("Neighbourhood.global()"), e.getMessage());
        List<CrossValidation> cmp = Kriging.compareModels(loc, data,
                List.of(model, VariogramModel.exponential(1, 0.3)), KrigingOptions.withDefaults());
        assertEquals(2, cmp.size());
    }

    static int[] without(int i) {
        int[] r = new int[39];
        for (int j = 0, c = 0; j < 40; j++) {
            if (j != i) {
                r[c++] = j;
            }
        }
        return r;
    }
}
