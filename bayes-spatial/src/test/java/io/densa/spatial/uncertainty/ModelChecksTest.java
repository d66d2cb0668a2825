package io.densa.spatial.uncertainty;

import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.TestData;
import io.densa.spatial.variogram.VariogramOptions;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.Locations;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import org.junit.jupiter.api.Test;

/**
 * The proportional-covariance check and the anisotropy test on simulated data (simulation
 * recovery, seeded): under their null models the Monte Carlo p-values reject at about the nominal
 * rate (the p-value of a Monte Carlo test is uniform on {1/(B+1), ..., 1} under the null when the
 * simulated model is the truth; Besag &amp; Diggle (1977), Appl. Statist. 26(3) — from memory), and
 * under clear departures they reject.
 */
class ModelChecksTest {
    static final BayesSpace SPACE = BayesSpace.polynomials(0, 1, 2);
    static final double[] MEAN = NodeRuleAccuracyTest.bump(SPACE, 0.5, 0.15);

    static double[][] unitTrace(double[][] a) {
        double tr = 0;
        for (double[] row : a) {
            for (double v : row) {
                tr += v * v;
            }
        }
        double[][] out = new double[a.length][];
        for (int i = 0; i < a.length; i++) {
            out[i] = a[i].clone();
            for (int j = 0; j < out[i].length; j++) {
                out[i][j] /= Math.sqrt(tr);
            }
        }
        return out;
    }

    @Test
    void proportionalityHoldsAtTheNominalRateUnderTheModel() {
        VariogramModel model = VariogramModel.exponential(1, 0.4).withNugget(0.02);
        double[][] a = unitTrace(new double[][] {{1, 0}, {0.3, 0.5}});
        int rejected = 0, sets = 30;
        for (int s = 0; s < sets; s++) {
            Locations loc = TestData.uniformSquare(60, 1, 500 + s);
            double[][] c = ProportionalFields.sample(loc, model, MEAN, a, 600 + s);
            Kriging kr = Kriging.ordinary(loc, DensitySet.of(SPACE, c), model, KrigingOptions.withDefaults());
            ProportionalityCheck pc = PredictiveDistribution.of(kr).checkProportionality(
                    VariogramOptions.withDefaults().withBinCount(8), 2, 39, 700 + s);
            rejected += pc.rejects(0.1) ? 1 : 0;
            assertEquals(pc.significantAt(0.1), pc.rejects(0.1));
            assertEquals("Monte Carlo (39 simulated fields), upper tail", pc.method());
        }
        System.out.println("proportionality check under the model: " + rejected + " of " + sets + " rejected at 0.1");
        // Binomial(30, 0.1): P(X >= 9) < 0.002
        assertTrue(rejected <= 8, "rejected " + rejected + " of " + sets);
    }

    @Test
    void differentRangesPerDirectionAreDetected() {
        // X = m + u1 Z1(s) + u2 Z2(s): Z1 with a short range, Z2 with a long one (not proportional)
        VariogramModel shortRange = VariogramModel.exponential(0.5, 0.08);
        VariogramModel longRange = VariogramModel.exponential(0.5, 1.5);
        int detected = 0, sets = 8;
        int n = 100;
        for (int s = 0; s < sets; s++) {
            Locations loc = TestData.uniformSquare(n, 1, 800 + s);
            double[][] z1 = ProportionalFields.sample(loc, shortRange, new double[2], new double[][] {{1, 0}, {0, 0}},
                    900 + s);
            double[][] z2 = ProportionalFields.sample(loc, longRange, new double[2], new double[][] {{0, 0}, {0, 1}},
                    1000 + s);
            double[][] c = new double[n][2];
            for (int i = 0; i < n; i++) {
                c[i][0] = MEAN[0] + z1[i][0] + z2[i][0];
                c[i][1] = MEAN[1] + z1[i][1] + z2[i][1];
            }
            Kriging kr = Kriging.ordinary(loc, DensitySet.of(SPACE, c), shortRange.plus(longRange),
                    KrigingOptions.withDefaults());
            ProportionalityCheck pc = PredictiveDistribution.of(kr).checkProportionality(
                    VariogramOptions.withDefaults().withBinCount(8), 2, 39, 1100 + s);
            detected += pc.rejects(0.05) ? 1 : 0;
            assertEquals(2, pc.shares().length);
            assertEquals(pc.statistic(), pc.directionStatistics()[0] + pc.directionStatistics()[1], 1e-12);
        }
        System.out.println("proportionality check, two ranges: " + detected + " of " + sets + " rejected at 0.05");
        assertTrue(detected >= 7, "detected " + detected + " of " + sets);
    }

    static VariogramOptions sectors() {
        return VariogramOptions.withDefaults().withBinCount(12).withMaxLag(0.6).withDirections(22.5, 0, 45, 90, 135);
    }

    @Test
    void isotropicFieldsAreNotFlaggedTooOften() {
        VariogramModel model = VariogramModel.exponential(1, 0.4).withNugget(0.02);
        double[][] a = unitTrace(new double[][] {{1, 0}, {0.3, 0.5}});
        int rejected = 0, sets = 30;
        for (int s = 0; s < sets; s++) {
            Locations loc = TestData.uniformSquare(70, 1, 1200 + s);
            double[][] c = ProportionalFields.sample(loc, model, MEAN, a, 1300 + s);
            Kriging kr = Kriging.ordinary(loc, DensitySet.of(SPACE, c), model, KrigingOptions.withDefaults());
            AnisotropyTest t = AnisotropyTest.of(kr, sectors(), 39, 1400 + s);
            rejected += t.anisotropic(0.1) ? 1 : 0;
            assertEquals(t.significantAt(0.1), t.anisotropic(0.1));
            assertEquals("Monte Carlo (39 simulated fields), upper tail", t.method());
        }
        System.out.println("anisotropy test on isotropic fields: " + rejected + " of " + sets + " rejected at 0.1");
        assertTrue(rejected <= 8, "rejected " + rejected + " of " + sets);
    }

    @Test
    void geometricAnisotropyIsDetectedWithItsDirection() {
        // correlation range 1.0 along x, 0.2 along y: simulate on coordinates (x / 1.0, y / 0.2) with range 1
        VariogramModel unit = VariogramModel.exponential(1, 1.0).withNugget(0.02);
        VariogramModel isotropic = VariogramModel.exponential(1, 0.45).withNugget(0.02);
        double[][] a = unitTrace(new double[][] {{1, 0}, {0.3, 0.5}});
        int detected = 0, sets = 6;
        for (int s = 0; s < sets; s++) {
            Locations loc = TestData.uniformSquare(150, 1, 1500 + s);
            double[] sx = loc.xs(), sy = loc.ys();
            for (int i = 0; i < sy.length; i++) {
                sy[i] /= 0.2;
            }
            double[][] c = ProportionalFields.sample(Locations.planar(sx, sy), unit, MEAN, a, 1600 + s);
            Kriging kr = Kriging.ordinary(loc, DensitySet.of(SPACE, c), isotropic, KrigingOptions.withDefaults());
            AnisotropyTest t = AnisotropyTest.of(kr, sectors(), 39, 1700 + s);
            if (t.anisotropic(0.05)) {
                detected++;
                assertEquals(0.0, t.majorDirection(), "greatest continuity along x");
                assertTrue(t.relativeSemivariances()[2] > 1.3 * t.relativeSemivariances()[0],
                        "y (90 degrees) varies more than x at short lags: " + java.util.Arrays.toString(
                        t.relativeSemivariances()));
            }
            assertEquals(4, t.variogram().sectorCount());
        }
        System.out.println("anisotropy test, range ratio 5: " + detected + " of " + sets + " detected at 0.05");
        assertTrue(detected >= 5, "detected " + detected + " of " + sets);
    }

    @Test
    void badInputIsNamed() {
        Locations loc = TestData.uniformSquare(20, 1, 1);
        Kriging kr = Kriging.ordinary(loc, TestData.independentCoordinates(SPACE, 20, 2),
                VariogramModel.exponential(1, 0.4), KrigingOptions.withDefaults());
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> AnisotropyTest.of(kr, VariogramOptions.withDefaults(), 19, 1));
        assertTrue(e.getMessage().contains("direction sectors"), e.getMessage());
        PredictiveDistribution pd = PredictiveDistribution.of(kr);
        e = assertThrows(IllegalArgumentException.class, () -> pd.checkProportionality(sectors(), 1, 19, 1));
        assertTrue(e.getMessage().contains("without direction sectors"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> pd.checkProportionality(VariogramOptions.withDefaults(), 3,
                19, 1));
        assertThrows(IllegalArgumentException.class, () -> pd.checkProportionality(VariogramOptions.withDefaults(), 1,
                0, 1));
    }
}
