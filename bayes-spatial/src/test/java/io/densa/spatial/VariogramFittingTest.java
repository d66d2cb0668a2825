package io.densa.spatial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Simulation recovery: Gaussian random fields simulated by Cholesky with a fixed seed from a known
 * model; Cressie's WLS (Cressie (1985), Math. Geol. 17(5)) and OLS fits recover the parameters
 * within the stated tolerances (partial sill ±10%, range ±15%, nugget ±0.05 absolute; tolerances chosen
 * from the sampling variability of one realisation with 10 independent coordinates, common
 * practice).
 */
class VariogramFittingTest {
    static final BayesSpace K10 = BayesSpace.polynomials(0, 1, 10);

    @Test
    void weightedAndOrdinaryLeastSquaresRecoverTheModel() {
        Locations loc = TestData.uniformSquare(600, 1, 21);
        VariogramModel truth = VariogramModel.exponential(2, 0.3).withNugget(0.2);
        DensitySet d = TestData.gaussianField(K10, loc, truth, 22);
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withBinCount(15)
                .withMaxLag(0.6));
        for (VariogramFitOptions.Method method : VariogramFitOptions.Method.values()) {
            VariogramFit fit = VariogramFitting.fit(ev, VariogramFitOptions.withDefaults().withMethod(method));
            VariogramModel m = fit.model();
            double c = 0, a = 0;
            for (VariogramModel.Structure s : m.structures()) {
                if (s.family() == VariogramModel.Family.EXPONENTIAL) {
                    c = s.partialSill();
                    a = s.range();
                }
            }
            assertEquals(2, c, 0.2, method + " partial sill of " + m);
            assertEquals(0.3, a, 0.045, method + " range of " + m);
            assertEquals(0.2, m.nugget(), 0.05, method + " nugget of " + m);
            assertTrue(fit.converged());
            assertEquals(15, fit.binsUsed());
            assertTrue(fit.rmse() < 0.1, "rmse " + fit.rmse());
        }
    }

    @Test
    void familiesCompareByCriterionAndMaternSmoothnessIsRespected() {
        Locations loc = TestData.uniformSquare(500, 1, 31);
        VariogramModel truth = VariogramModel.gaussian(1, 0.5);
        DensitySet d = TestData.gaussianField(K10, loc, truth, 32);
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withMaxLag(0.7));
        List<VariogramFit> fits = VariogramFitting.compare(ev, List.of(
                VariogramFitOptions.withDefaults().withFamily(VariogramModel.Family.EXPONENTIAL),
                VariogramFitOptions.withDefaults().withFamily(VariogramModel.Family.GAUSSIAN),
                VariogramFitOptions.withDefaults().withFamily(VariogramModel.Family.SPHERICAL)));
        // a smooth Gaussian field is best described by the Gaussian family
        assertEquals(VariogramModel.Family.GAUSSIAN, fits.get(0).model().structures().get(0).family());
        assertTrue(fits.get(0).criterion() <= fits.get(1).criterion());
        VariogramFit mat = VariogramFitting.fit(ev, VariogramFitOptions.withDefaults()
                .withFamily(VariogramModel.Family.MATERN).withSmoothness(2.5).withNugget(false));
        assertEquals(2.5, mat.model().structures().get(0).smoothness(), 0);
        VariogramFit pow = VariogramFitting.fit(ev, VariogramFitOptions.withDefaults()
                .withFamily(VariogramModel.Family.POWER).withNugget(false));
        double w = pow.model().structures().get(0).range();
        assertTrue(w > 0 && w < 2, "exponent " + w);
    }

    @Test
    void tooFewBinsAreRejected() {
        Locations loc = TestData.uniformSquare(50, 1, 33);
        DensitySet d = TestData.independentCoordinates(TestData.K3, 50, 34);
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withBinCount(3));
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> VariogramFitting.fit(ev, VariogramFitOptions.withDefaults()));
        assertTrue(e.getMessage().matches("fitting 3 parameters needs at least 4 non-empty bins, got 3"),
                e.getMessage());
        VariogramFit two = VariogramFitting.fit(ev, VariogramFitOptions.withDefaults().withNugget(false));
        assertEquals(3, two.binsUsed());
    }
}
