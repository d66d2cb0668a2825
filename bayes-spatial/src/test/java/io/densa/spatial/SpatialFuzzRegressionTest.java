package io.densa.spatial;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.DensitySet;
import io.densa.spatial.autocorrelation.AutocorrelationOptions;
import io.densa.spatial.autocorrelation.GearyC;
import io.densa.spatial.autocorrelation.MoranI;
import io.densa.spatial.kriging.CrossValidation;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingDiagnostics;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.KrigingPrediction;
import io.densa.spatial.kriging.OrdinaryKrigingReferenceTest;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;

/**
 * The spatial findings of the seeded fuzz (SP-1 to SP-9 in the project's fuzz-findings notes):
 * each finding's recorded case seeds replayed through {@link FuzzProperties} (whose contract is
 * finite output or a Densa exception, inputs unchanged), plus the instructive cases spelled out.
 */
class SpatialFuzzRegressionTest {
    private final FuzzProperties fuzz = new FuzzProperties();

    private static IllegalArgumentException rejects(String regex, Executable call) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, call);
        assertTrue(e.getMessage().matches(regex), "message was: " + e.getMessage());
        return e;
    }

    // ------------------------------------------------------------------ SP-1, SP-2, SP-3 locations

    @Test
    void indexMethodsNameTheIndexAndTheSize() { // SP-1
        Locations none = Locations.planar(new double[0], new double[0]);
        Locations two = Locations.planar(new double[] {0, 1}, new double[] {0, 1});
        rejects("first location index 0 is out of range: there are no locations", () -> none.distance(0, 0));
        rejects("subset row 0: location index -1 is out of range: accepted are 0..1 \\(2 locations\\)",
                () -> two.subset(-1));
        rejects("location index 2 is out of range: accepted are 0..1 \\(2 locations\\)", () -> two.distanceTo(2, 0, 0));
        rejects("location index 2 is out of range: .*", () -> two.x(2));
        rejects("location index -1 is out of range: .*", () -> two.y(-1));
        rejects("second location index 5 is out of range: .*", () -> two.distance(0, 5));
        for (long seed : new long[] {-7182094, -1046292606}) {
            fuzz.locations(seed);
        }
    }

    @Test
    void anEmptySetHasNoBoundingBox() { // SP-2
        IllegalStateException e = assertThrows(IllegalStateException.class,
                () -> Locations.planar(new double[0], new double[0]).boundingBox());
        assertTrue(e.getMessage().startsWith("there are no locations"), e.getMessage());
        assertArrayEquals(new double[] {-2, 0, 3, 5},
                Locations.planar(new double[] {3, -2}, new double[] {0, 5}).boundingBox(), 0);
    }

    @Test
    void planarDistancesAreFiniteOrRejected() { // SP-3
        // against Math.hypot (JDK, general-purpose reference): within an ulp
        double dx = 7.049e217 - 1.8294e217, dy = 6.3266e217 - 1.867e217;
        double d = Locations.planar(new double[] {7.049e217, 1.8294e217}, new double[] {6.3266e217, 1.867e217})
                .distance(0, 1);
        assertEquals(Math.hypot(dx, dy), d, Math.ulp(d));
        // two points 2e308 apart: no double can hold their distance
        Locations one = Locations.planar(new double[] {1}, new double[] {1});
        rejects("the distance between \\(1.0E308, 0.0\\) and \\(-1.0E308, 0.0\\) overflows a double; .*",
                () -> one.distance(1e308, 0, -1e308, 0));
        // a point whose distance to the locations themselves overflows is named as such
        rejects("first point \\(1.0E308, 0.0\\) is so far from the locations .* overflows a double; .*",
                () -> Locations.planar(new double[] {-1e308}, new double[] {0}).distance(1e308, 0, 0, 0));
        assertEquals(Math.hypot(1e308, 1e308), Locations.planar(new double[] {0}, new double[] {0})
                .distance(1e308, 0, 0, 1e308), 0);
        NeighbourIndex index = NeighbourIndex.of(Locations.planar(new double[] {1e308}, new double[] {0}));
        rejects("query point \\(-1.0E308, 0.0\\) is so far .*", () -> index.kthDistance(-1e308, 0, 1));
        assertEquals(1.7e308, index.kthDistance(-7e307, 0, 1), 1e293);
        for (long seed : new long[] {-3092395506L, -65, 93, 6814737665820L, 8142}) {
            fuzz.locations(seed);
        }
    }

    // ------------------------------------------------------------------ SP-4 models

    @Test
    void modelParametersAreValidatedAndLimitsAreFinite() { // SP-4
        rejects("the total sill of VariogramModel\\[spherical\\(1.0E308, 1.0\\) \\+ nugget\\(1.0E308\\)\\] overflows a"
                + " double; .*", () -> VariogramModel.spherical(1e308, 1).withNugget(1e308));
        rejects("the total sill of .* overflows a double; .*",
                () -> VariogramModel.exponential(1e308, 1).withNugget(1e308));
        // h / a overflows: the structure is at its sill, 1e308 + 1e307
        assertEquals(1.1e308, VariogramModel.exponential(1e308, 1e-300).withNugget(1e307).gamma(1), 1e293);
        rejects("the variogram VariogramModel\\[power\\(1.0E300, 1.9\\)\\] at lag 1.0E300 exceeds the double range .*",
                () -> VariogramModel.power(1e300, 1.9).gamma(1e300));
        assertThrows(IllegalStateException.class, () -> VariogramModel.power(1, 1).sill());
        // h / a underflows to 0: the Matérn structure is at its value at lag 0. The Matérn with ν = 1/2
        // is the exponential 1 − e^{−t}, t = 3h/a (Stein (1999), Interpolation of Spatial Data, §2.7 — from
        // memory), ν = 3/2 gives 1 − (1 + t) e^{−t}
        assertEquals(0, VariogramModel.matern(1, 1e300, 1.5).gamma(1e-300), 0);
        assertEquals(-Math.expm1(-3e-320), VariogramModel.matern(1, 1, 0.5).gamma(1e-320), 1e-300);
        double t = 1e-160; // K_ν(t) ≈ Γ(ν) 2^{ν−1} t^{−ν} overflows for ν = 2.5
        assertEquals(0, VariogramModel.matern(1, 1, 2.5).gamma(t), 1e-300);
        // a is the practical range: t = h / φ with the scale φ the structure reports
        double t15 = 0.5 / VariogramModel.matern(1, 1, 1.5).structures().get(0).scale();
        assertEquals(1 - (1 + t15) * Math.exp(-t15), VariogramModel.matern(1, 1, 1.5).gamma(0.5), 1e-12);
    }

    @Test
    void covarianceLoopsStayFiniteForRangesAtTheEndsOfTheDoubleRange() { // SP-4 (kriging's covariance path)
        double[] h = {0, 1e-300, 1, 1e200, 1e300};
        double[] out = new double[h.length];
        // exponential with a subnormal range: −3/a = −∞, and −∞ · 0 must not reach exp
        VariogramModel.exponential(1, Double.MIN_VALUE).pseudoCovariances(h, h.length, 1, out);
        assertArrayEquals(new double[] {1, 0, 0, 0, 0}, out, 0);
        // Gaussian with a² overflowing (−3/a² = −0): C(h) = e^{−3 (h/a)²}
        VariogramModel g = VariogramModel.gaussian(1, 1e200);
        g.pseudoCovariances(h, h.length, 1, out);
        assertArrayEquals(new double[] {1, 1, 1, Math.exp(-3), 0}, out, 1e-15);
        for (int i = 0; i < h.length; i++) {
            assertEquals(out[i], g.pseudoCovariance(h[i], 1), 0, "scalar and loop agree at lag " + h[i]);
        }
        for (long seed : new long[] {56, 29, -958617, 2000975589}) {
            fuzz.kriging(seed);
        }
    }

    // ------------------------------------------------------------------ SP-5, SP-6 variogram

    @Test
    void empiricalVariogramHasNoNaNBins() { // SP-5
        BayesSpace s = BayesSpace.splines(0, 1, 3, 1);
        double[][] c = {{1, 0, 0}, {0, 1, 0}, {0, 0, 1}, {1, 1, 0}};
        Locations loc = Locations.planar(new double[] {9.23, 1.05, 12.88, 12.88}, new double[] {18.36, 15.25, 0.32,
            0.32});
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, DensitySet.of(s, c), VariogramOptions.withDefaults()
                .withBinCount(15).withMaxLag(Double.MAX_VALUE));
        for (double v : ev.semivariances()) {
            assertTrue(Double.isFinite(v), java.util.Arrays.toString(ev.semivariances()));
        }
        double[][] big = {{1e300, 0, 0}, {0, -1e300, 0}, {0, 0, 1}, {1, 1, 0}};
        rejects("the squared B2 distances of bin \\d+ overflow a double .*", () -> EmpiricalVariogram.of(
                Locations.planar(new double[] {0, 1, 2, 3}, new double[] {0, 0, 1, 1}), DensitySet.of(s, big),
                VariogramOptions.withDefaults()));
        for (long seed : new long[] {18, -21802, 2066433908653362673L}) {
            fuzz.variogram(seed);
        }
    }

    @Test
    void variogramFittingKeepsItsContract() { // SP-6
        for (long seed : new long[] {165, 8828, -20, -374}) {
            fuzz.variogram(seed);
        }
    }

    // ------------------------------------------------------------------ SP-7 kriging

    @Test
    void krigingWeightsDoNotDependOnTheSillAndTheVarianceScalesWithIt() { // SP-7
        // Isaaks & Srivastava (1989), An Introduction to Applied Geostatistics, ch. 12 (from memory):
        // C(h) = 10 e^{-0.3h} gives weights 0.1729 0.3178 0.1287 0.0864 0.1511 0.0572 0.0858 and
        // variance 8.956; with C multiplied by f the weights are unchanged and the variance is 8.956 f
        // (the kriging equations are homogeneous in C). f = 1.7e307 puts the sill at 1.7e308, where
        // the unscaled system overflowed (variance +∞); f = 1e-310 makes the covariances subnormal.
        Locations loc = Locations.planar(OrdinaryKrigingReferenceTest.XY);
        DensitySet data = OrdinaryKrigingReferenceTest.data();
        KrigingPrediction ref = Kriging.ordinary(loc, data, VariogramModel.exponential(10, 10),
                KrigingOptions.withDefaults()).predictWithWeights(OrdinaryKrigingReferenceTest.X0,
                OrdinaryKrigingReferenceTest.Y0);
        assertEquals(8.956, ref.variance(), 0.001);
        for (double f : new double[] {1.7e307, 1e300, 1e-300, 1e-310, Math.scalb(1.0, 600)}) {
            KrigingPrediction p = Kriging.ordinary(loc, data, VariogramModel.exponential(10 * f, 10),
                    KrigingOptions.withDefaults()).predictWithWeights(OrdinaryKrigingReferenceTest.X0,
                    OrdinaryKrigingReferenceTest.Y0);
            assertArrayEquals(ref.weights(), p.weights(), 1e-12, "factor " + f);
            assertEquals(ref.density().coordinate(0), p.density().coordinate(0), 1e-9, "factor " + f);
            assertEquals(ref.variance() * f, p.variance(), 1e-12 * ref.variance() * f + (f < 1e-300 ? 1e-320 : 0),
                    "factor " + f);
        }
        // an exact power-of-two factor changes no bit of the weights
        KrigingPrediction p = Kriging.ordinary(loc, data, VariogramModel.exponential(10 * 0x1p600, 10),
                KrigingOptions.withDefaults()).predictWithWeights(OrdinaryKrigingReferenceTest.X0,
                OrdinaryKrigingReferenceTest.Y0);
        assertArrayEquals(ref.weights(), p.weights(), 0);
        assertEquals(ref.variance() * 0x1p600, p.variance(), 0);
    }

    @Test
    void aVarianceBeyondTheDoubleRangeNamesTheTarget() { // SP-7
        Locations loc = Locations.planar(OrdinaryKrigingReferenceTest.XY);
        // a sill at the double limit and no spatial correlation at these lags: σ² = sill (1 + 1/n) > 1.8e308
        Kriging k = Kriging.ordinary(loc, OrdinaryKrigingReferenceTest.data(),
                VariogramModel.gaussian(Double.MAX_VALUE, 1e-300), KrigingOptions.withDefaults());
        DensaException e = assertThrows(DensaException.class, () -> k.predict(65, 137));
        assertTrue(e.getMessage().startsWith("ORDINARY kriging at target (65.0, 137.0): the kriging variance"),
                e.getMessage());
        assertTrue(e.diagnostics(KrigingDiagnostics.class).isPresent(), e.diagnostics().toString());
    }

    private static DensitySet scaled(DensitySet d, double f) {
        int n = d.size(), k = d.dimension();
        double[] c = d.coordinatesRowMajor();
        double[][] out = new double[n][k];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                out[i][j] = c[i * k + j] * f;
            }
        }
        return DensitySet.of(d.space(), out);
    }

    @Test
    void crossValidationIsFiniteForTinySillsOrReportsWhatOverflows() { // SP-7
        // leave-one-out errors are homogeneous of degree 0 in the covariance and of degree 1 in the
        // data (the weights do not change): with the sill times 1e-300 and the coordinates times
        // 1e-150 the errors are the reference errors times 1e-150, the variances times 1e-300, and
        // the standardised errors unchanged
        Locations loc = TestData.uniformSquare(8, 100, 3);
        DensitySet d = TestData.independentCoordinates(TestData.K3, 8, 4);
        CrossValidation ref = Kriging.ordinary(loc, d, VariogramModel.exponential(1, 40).withNugget(0.1),
                KrigingOptions.withDefaults()).crossValidate();
        VariogramModel tiny = VariogramModel.exponential(1e-300, 40).withNugget(1e-301);
        CrossValidation cv = Kriging.ordinary(loc, scaled(d, 1e-150), tiny, KrigingOptions.withDefaults())
                .crossValidate();
        for (int i = 0; i < 8; i++) {
            assertEquals(ref.errorNorms()[i] * 1e-150, cv.errorNorms()[i], 1e-9 * ref.errorNorms()[i] * 1e-150);
            assertEquals(ref.krigingVariances()[i] * 1e-300, cv.krigingVariances()[i],
                    1e-9 * ref.krigingVariances()[i] * 1e-300);
            assertEquals(ref.standardisedErrors()[i], cv.standardisedErrors()[i], 1e-9);
        }
        assertEquals(ref.meanStandardisedSquaredError(), cv.meanStandardisedSquaredError(), 1e-9);
        // coordinates times 1e150 with that sill: standardised squared errors near 1e600 cannot be held
        Kriging far = Kriging.ordinary(loc, scaled(d, 1e150), tiny, KrigingOptions.withDefaults());
        DensaException e = assertThrows(DensaException.class, far::crossValidate);
        assertTrue(e.getMessage().startsWith("the leave-one-out summaries overflow a double"), e.getMessage());
        for (long seed : new long[] {1376556887078519378L, 1697533, -41095, 217, -7091095, 7373, 1939,
            -1738219964542L, 15579, -6, -804299, -5389718539107L}) {
            fuzz.kriging(seed);
        }
    }

    // ------------------------------------------------------------------ SP-8, SP-9 weights and autocorrelation

    @Test
    void moranOfValuesNear1e200IsComputedNotCalledConstant() { // SP-8
        // path 0 - 1 - 2, values {1e200, −1e200, 3}: deviations ≈ {1e200, −1e200, 0}, so
        // I = (n / S0) Σ w_ij z_i z_j / Σ z² = (3 / 4) · 2 · (−1e400) / (2e400) = −0.75 (Moran (1950) formula)
        double i = MoranI.statistic(SpatialWeights.fromMatrix(new double[][] {{0, 1, 0}, {1, 0, 1}, {0, 1, 0}}),
                new double[] {1e200, -1e200, 3});
        assertEquals(-0.75, i, 1e-15);
    }

    @Test
    void statisticsDoNotDependOnACommonFactorOfTheWeights() { // SP-8
        // I, c and their moments are invariant to W → f W (f cancels in n / S0 · Σ w z z and in
        // S1 / S0², S2 / S0²: Cliff & Ord (1981), Spatial Processes — from memory); subnormal weights
        // (f = 1e-310) used to give n / S0 = ∞
        Locations loc = TestData.uniformSquare(9, 10, 5);
        double[][] m = SpatialWeights.inverseDistance(loc, 1, Double.POSITIVE_INFINITY).toMatrix();
        double[] v = {3, 1, 4, 1, 5, 9, 2, 6, 5};
        AutocorrelationOptions opt = AutocorrelationOptions.withDefaults().withPermutations(99, 1L).withParallel(false);
        MoranI.Result ref = MoranI.test(SpatialWeights.fromMatrix(m), v, opt);
        GearyC.Result gRef = GearyC.test(SpatialWeights.fromMatrix(m), v, opt);
        for (double f : new double[] {1e-310, 1e-200, 1e100}) {
            double[][] fm = new double[9][9];
            for (int a = 0; a < 9; a++) {
                for (int b = 0; b < 9; b++) {
                    fm[a][b] = m[a][b] * f;
                }
            }
            SpatialWeights w = SpatialWeights.fromMatrix(fm);
            MoranI.Result r = MoranI.test(w, v, opt);
            assertEquals(ref.statistic(), r.statistic(), 1e-12, "factor " + f);
            assertEquals(ref.randomisation().variance(), r.randomisation().variance(), 1e-12, "factor " + f);
            assertEquals(ref.permutation().get().pTwoSided(), r.permutation().get().pTwoSided(), 0, "factor " + f);
            assertEquals(w.s0(), r.s0(), 0, "the reported S0 is that of the caller's weights");
            GearyC.Result g = GearyC.test(w, v, opt);
            assertEquals(gRef.statistic(), g.statistic(), 1e-12, "factor " + f);
            MoranI.DensityResult dr = MoranI.test(w, TestData.independentCoordinates(TestData.K3, 9, 2), opt);
            assertTrue(Double.isFinite(dr.statistic()) && Double.isFinite(dr.permutation().get().mean()));
        }
        for (long seed : new long[] {-383, -323914, 5782, -344, 1898, 21936, 2014981095, 216275, 348535, 585751, -4,
            -2617504693L, -199739, -145, 675, 73076}) {
            fuzz.weightsAndAutocorrelation(seed);
        }
    }

    @Test
    void weightsWhoseSumsOverflowAreRejected() { // SP-9
        double[][] w = {{0, 1e300, 1e300}, {1e300, 0, 1e300}, {1e300, 1e300, 0}};
        rejects("the weights are too large: .* the largest weight is 1.0E300 \\(link 0 -> 1\\).*",
                () -> SpatialWeights.fromMatrix(w));
        SpatialWeights binary = SpatialWeights.fromMatrix(new double[][] {{0, 1, 1}, {1, 0, 1}, {1, 1, 0}});
        rejects("the spatial lag of unit 0 overflows a double .*", () -> binary.spatialLag(new double[] {1, 1e308,
            1e308}));
        assertArrayEquals(new double[] {1e308, 5, 1e308 + 2}, binary.spatialLag(new double[] {2, 1e308, 3}), 0);
        // d^-power overflows for d < 1 and power 1e300; underflows for d > 1
        Locations loc = Locations.planar(new double[] {0, 0.5, 3}, new double[] {0, 0, 0});
        rejects("the inverse-distance weight of units 0 and 1 at distance 0.5 with power 1.0E300 is Infinity .*",
                () -> SpatialWeights.inverseDistance(loc, 1e300, Double.POSITIVE_INFINITY));
        for (long seed : new long[] {585751, -383, 292286, 471}) {
            fuzz.weightsAndAutocorrelation(seed);
        }
    }
}
