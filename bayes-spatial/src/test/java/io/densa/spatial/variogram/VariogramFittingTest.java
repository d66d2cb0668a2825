package io.densa.spatial.variogram;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
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
    private static final BayesSpace K10 = TestData.K10;
    static final BayesSpace K40 = BayesSpace.steps(0, 1, 41);

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
    void familiesCompareByCriterion() {
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
    }

    @Test
    void maternWithHalfSmoothnessFitsLikeTheExponential() {
        // Matérn with ν = 1/2 is the exponential covariance (Stein (1999), Interpolation of Spatial
        // Data, Springer, §2.7 — from memory), so the two fits to one empirical variogram must give
        // the same curve (tolerance: optimiser stopping, 1% of the sill, common practice)
        Locations loc = TestData.uniformSquare(400, 1, 41);
        DensitySet d = TestData.gaussianField(K10, loc, VariogramModel.exponential(1.5, 0.4), 42);
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withMaxLag(0.6));
        VariogramModel exp = VariogramFitting.fit(ev, VariogramFitOptions.withDefaults()
                .withFamily(VariogramModel.Family.EXPONENTIAL).withNugget(false)).model();
        VariogramModel mat = VariogramFitting.fit(ev, VariogramFitOptions.withDefaults()
                .withFamily(VariogramModel.Family.MATERN).withSmoothness(0.5).withNugget(false)).model();
        for (double h : ev.meanLags()) {
            assertEquals(exp.gamma(h), mat.gamma(h), 0.01 * exp.sill(), "lag " + h + ": " + exp + " vs " + mat);
        }
    }

    /**
     * Fractional Brownian motion B_H along a line, K independent coordinates each with covariance
     * (σ²/2)(s^{2H} + t^{2H} − |s − t|^{2H}) (Mandelbrot, Van Ness (1968), Fractional Brownian
     * motions, fractional noises and applications, SIAM Rev. 10 — from memory), so that the
     * trace-semivariogram is exactly the power model γ(h) = (K σ² / 2) h^{2H}.
     */
    static DensitySet fractionalBrownianLine(double[] s, double hurst, double sigma2, long seed) {
        int n = s.length, k = K40.dimension();
        org.ejml.data.DMatrixRMaj c = new org.ejml.data.DMatrixRMaj(n, n);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                c.set(i, j, 0.5 * sigma2 * (Math.pow(s[i], 2 * hurst) + Math.pow(s[j], 2 * hurst)
                        - Math.pow(Math.abs(s[i] - s[j]), 2 * hurst)));
            }
            c.add(i, i, 1e-10);
        }
        return TestData.correlatedCoordinates(K40, c, seed);
    }

    @Test
    void powerModelRecoversTheExponentOfFractionalBrownianMotion() {
        // simulation recovery with a fixed seed: the fitted power exponent ω must be 2H within
        // ±0.1 (sampling variability of one realisation with 40 independent coordinates at lags up
        // to 0.2, common practice); the two true exponents are 0.6 apart, so a fit that ignored the data would fail
        int n = 300;
        java.util.Random r = new java.util.Random(51);
        double[] s = new double[n];
        for (int i = 0; i < n; i++) {
            s[i] = 0.01 + r.nextDouble();
        }
        Locations loc = Locations.planar(s, new double[n]);
        for (double hurst : new double[] {0.35, 0.65}) {
            DensitySet d = fractionalBrownianLine(s, hurst, 0.05, 52);
            EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults().withBinCount(10)
                    .withMaxLag(0.2));
            VariogramFit pow = VariogramFitting.fit(ev, VariogramFitOptions.withDefaults()
                    .withFamily(VariogramModel.Family.POWER).withNugget(false));
            VariogramModel.Structure st = pow.model().structures().get(0);
            assertEquals(VariogramModel.Family.POWER, st.family());
            assertEquals(2 * hurst, st.range(), 0.1, "exponent for H = " + hurst);
            // coefficient K σ² / 2 = 1 for K = 40, σ² = 0.05 (±20%, same source of variability)
            assertEquals(1.0, st.partialSill(), 0.2, "coefficient for H = " + hurst);
        }
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
