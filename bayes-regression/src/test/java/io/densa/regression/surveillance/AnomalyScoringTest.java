package io.densa.regression.surveillance;

import io.densa.core.BayesSpace;
import io.densa.core.BenjaminiHochberg;
import io.densa.core.DensitySet;
import io.densa.regression.Design;
import io.densa.regression.FunctionOnScalarFit;
import io.densa.regression.FunctionOnScalarRegression;
import io.densa.regression.TestData;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.distribution.UniformRealDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.junit.jupiter.api.Test;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

class AnomalyScoringTest {
    private final BayesSpace space = TestData.space8();
    private final int k = space.dimension();

    /** Simulated units: densities and their dose covariate. */
    private record Units(DensitySet y, double[] dose) {
    }

    private Units fosData(Random r, int n, double shiftLo, double shiftHi, double bump) {
        double[] dose = new double[n];
        double[][] c = new double[n][k];
        double[] bumpCoords = space.project(t -> Math.exp(t >= shiftLo && t <= shiftHi ? bump : 0.0)).density()
                .coordinates();
        for (int i = 0; i < n; i++) {
            dose[i] = r.nextDouble();
            for (int l = 0; l < k; l++) {
                c[i][l] = 0.3 * Math.sin(l) + dose[i] * Math.cos(l) + 0.2 * r.nextGaussian() + bumpCoords[l];
            }
        }
        return new Units(DensitySet.of(space, c), dose);
    }

    private static Design design(Units u) {
        return Design.builder().numeric("dose", u.dose()).build();
    }

    /** The conformal p-value formula (1 + #{cal ≥ s}) / (n_cal + 1) on a small hand example. */
    @Test
    void conformalPValueFormula() {
        BayesSpace s = BayesSpace.steps(0, 1, 2); // K = 1: residual norm = |coordinate|
        DensitySet cal = DensitySet.of(s, new double[][] {{1}, {-2}, {3}, {4}});
        AnomalyScoring.Calibrated c = AnomalyScoring.withDefaults().fit(cal, new double[] {0.25, 0.75});
        // s = 2.5: calibration norms ≥ 2.5 are 3 and 4 → (1 + 2)/5; s = 5 → 1/5; s = 0 → 5/5; ties count
        assertArrayEquals(new double[] {0.6, 0.2, 1.0, 0.8}, c.pValues(new double[] {2.5, 5, 0, 2}), 1e-15);
    }

    /**
     * Under the null (new units exchangeable with the calibration units) the split-conformal
     * p-value is uniform on {1/(n+1), …, 1}: 1000 independent replicates (model fitted on 40
     * training units, 199 calibration units, one new unit each) are tested against U(0, 1) with
     * the Commons Math Kolmogorov–Smirnov test (discreteness 1/200 is well below the KS critical
     * distance ≈ 0.05 at n = 1000).
     */
    @Test
    void conformalPValuesAreUniformUnderTheNull() {
        Random r = new Random(2024);
        int reps = 1000;
        double[] p = new double[reps];
        double[] grid = {0.1, 0.5, 0.9};
        for (int rep = 0; rep < reps; rep++) {
            Units train = fosData(r, 40, 0, 0, 0);
            FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().fit(design(train), train.y());
            Units cal = fosData(r, 199, 0, 0, 0);
            Units test = fosData(r, 1, 0, 0, 0);
            AnomalyScoring.Calibrated c = AnomalyScoring.withDefaults()
                    .fit(fit.residuals(design(cal), cal.y()), grid);
            p[rep] = c.score(fit.residuals(design(test), test.y())).units().get(0).pValue();
        }
        double ks = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(new UniformRealDistribution(0, 1), p);
        assertTrue(ks > 0.01, "KS p-value " + ks);
    }

    /**
     * Benjamini &amp; Hochberg (1995), J. R. Stat. Soc. B 57(1), worked example (the 15 p-values of
     * their Section 4, from memory): at q = 0.05 the step-up procedure rejects the 4 smallest
     * (p_(4) = 0.0095 ≤ 4·0.05/15 = 0.0133, while p_(5) = 0.0201 &gt; 0.0167 and no larger p_(k) is
     * below k·0.05/15).
     */
    @Test
    void benjaminiHochbergPublishedExample() {
        double[] p = {0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.3240, 0.4262,
            0.5719, 0.6528, 0.7590, 1.0000};
        boolean[] rej = BenjaminiHochberg.reject(p, 0.05);
        for (int i = 0; i < p.length; i++) {
            assertEquals(i < 4, rej[i], "hypothesis " + i);
        }
        double[] adj = BenjaminiHochberg.adjust(p);
        for (int i = 0; i < p.length; i++) {
            assertEquals(rej[i], adj[i] <= 0.05);
        }
        // second derivation, from the definition of the step-up rule: reject the k smallest for the
        // largest k with p_(k) <= k q / m (the p-values are already sorted)
        int k = 0;
        for (int i = 1; i <= p.length; i++) {
            if (p[i - 1] <= i * 0.05 / p.length) {
                k = i;
            }
        }
        assertEquals(4, k);
    }

    /**
     * Hand-derived step-up examples. (a) p = (0.01, 0.04, 0.03, 0.20, 0.50), q = 0.1: sorted
     * 0.01, 0.03, 0.04, 0.20, 0.50 against k·0.02 = 0.02, 0.04, 0.06, 0.08, 0.10 → largest k with
     * p_(k) ≤ kq/m is 3: reject the first three inputs. Adjusted: p̃_(5) = 0.5, p̃_(4) = min(0.5,
     * 5·0.2/4) = 0.25, p̃_(3) = 5·0.04/3 = 0.0667, p̃_(2) = min(0.0667, 0.075) = 0.0667, p̃_(1) =
     * min(0.0667, 0.05) = 0.05. (b) Step-up, not step-down: p = (0.001, 0.07, 0.071, 0.072), q = 0.1,
     * thresholds 0.025, 0.05, 0.075, 0.1: p_(2) fails its own threshold but p_(4) = 0.072 ≤ 0.1, so
     * all four are rejected.
     */
    @Test
    void benjaminiHochbergHandExamples() {
        double[] p = {0.01, 0.04, 0.03, 0.20, 0.50};
        boolean[] rej = BenjaminiHochberg.reject(p, 0.1);
        assertArrayEquals(new boolean[] {true, true, true, false, false}, rej);
        assertArrayEquals(new double[] {0.05, 0.2 / 3, 0.2 / 3, 0.25, 0.5}, BenjaminiHochberg.adjust(p), 1e-15);
        assertArrayEquals(new boolean[] {true, true, true, true},
                BenjaminiHochberg.reject(new double[] {0.001, 0.07, 0.071, 0.072}, 0.1));
        assertThrows(IllegalArgumentException.class, () -> BenjaminiHochberg.reject(new double[] {Double.NaN}, 0.1));
    }

    /**
     * FDR control in simulation (fixed seed): 200 batches of 100 units, 10 of them anomalous
     * (residual shifted by a fixed density of norm 2), calibration on 500 null units. The mean
     * false discovery proportion must not exceed q·m₀/m = 0.045 by more than its Monte Carlo error
     * (we allow 0.06); the anomalies are found (mean power &gt; 0.8).
     */
    @Test
    void benjaminiHochbergControlsFdrWithKnownAnomalies() {
        Random r = new Random(99);
        double[] shift = new double[k];
        shift[0] = 2.0;
        double fdp = 0;
        double power = 0;
        int batches = 200;
        double[] grid = {0.2, 0.5, 0.8};
        for (int b = 0; b < batches; b++) {
            DensitySet cal = DensitySet.of(space, TestData.gaussian(r, 500, k, 0.3));
            double[][] units = TestData.gaussian(r, 100, k, 0.3);
            for (int i = 0; i < 10; i++) {
                for (int l = 0; l < k; l++) {
                    units[i][l] += shift[l];
                }
            }
            AnomalyScoring.Report rep = AnomalyScoring.withDefaults().withFdr(0.05).fit(cal, grid)
                    .score(DensitySet.of(space, units));
            int fp = 0;
            int tp = 0;
            for (AnomalyScoring.UnitScore u : rep.units()) {
                if (u.flagged()) {
                    if (u.row() < 10) {
                        tp++;
                    } else {
                        fp++;
                    }
                }
            }
            assertEquals(fp + tp, rep.flaggedCount());
            fdp += fp / (double) Math.max(1, fp + tp);
            power += tp / 10.0;
        }
        fdp /= batches;
        power /= batches;
        assertTrue(fdp <= 0.06, "mean FDP " + fdp);
        assertTrue(power > 0.8, "mean power " + power);
    }

    /**
     * End to end: a model fitted on training data, calibrated on a separate set; a new unit with
     * extra mass on [0.3, 0.5] is flagged and its excursion is reported as an EXCESS interval
     * around 0.4; null units are not flagged. (The smallest conformal p-value is 1/(n_cal + 1), so
     * BH over m units can flag only when n_cal + 1 ≥ m/q: 1000 calibration units for 31 units.)
     */
    @Test
    void flaggedUnitsReportWhereTheyDepart() {
        Random r = new Random(5);
        Units train = fosData(r, 200, 0, 0, 0);
        FunctionOnScalarFit fit = FunctionOnScalarRegression.withDefaults().fit(design(train), train.y());
        Units cal = fosData(r, 1000, 0, 0, 0);
        double[] grid = new double[51];
        for (int q = 0; q <= 50; q++) {
            grid[q] = q / 50.0;
        }
        AnomalyScoring.Calibrated c = AnomalyScoring.withDefaults().withBandLevel(0.99)
                .fit(fit.residuals(design(cal), cal.y()), grid);
        Units odd = fosData(r, 1, 0.3, 0.5, 4.0);
        Units normal = fosData(r, 30, 0, 0, 0);
        DensitySet batch = normal.y().concat(odd.y());
        double[] dose = new double[31];
        System.arraycopy(normal.dose(), 0, dose, 0, 30);
        dose[30] = odd.dose()[0];
        Design d = Design.builder().numeric("dose", dose).build();
        AnomalyScoring.Report rep = c.score(fit.residuals(d, batch));
        AnomalyScoring.UnitScore u = rep.units().get(30);
        assertTrue(u.flagged(), "p = " + u.pValue());
        assertEquals(u.residualNorm(), ((io.densa.core.TestResult) u).statistic(), 0.0);
        boolean found = false;
        for (AnomalyScoring.Excursion e : u.excursions()) {
            if (e.direction() == AnomalyScoring.Direction.EXCESS && e.from() <= 0.4 && e.to() >= 0.4) {
                found = true;
                assertTrue(e.from() >= 0.2 && e.to() <= 0.6, e.toString());
            }
        }
        assertTrue(found, u.excursions().toString());
        for (int i = 0; i < 30; i++) {
            assertFalse(rep.units().get(i).flagged());
            assertTrue(rep.units().get(i).excursions().isEmpty());
        }
        assertEquals(1, rep.flaggedCount());
        assertEquals(1000, rep.calibrationSize());
    }

    /**
     * The calibrated band at each grid point is the pair of (1 ∓ level)/2 quantiles of the
     * calibration residual clr values there, checked against Commons Math {@code Percentile} with
     * the R-7 estimation type (linear interpolation between order statistics).
     */
    @Test
    void bandIsThePointwiseQuantileOfCalibrationResiduals() {
        DensitySet cal = DensitySet.of(space, TestData.gaussian(new Random(41), 57, k, 1));
        double[] grid = {0.05, 0.3, 0.77, 1.0};
        AnomalyScoring.Calibrated c = AnomalyScoring.withDefaults().withBandLevel(0.9).fit(cal, grid);
        List<AnomalyScoring.BandPoint> band = c.band();
        assertEquals(grid.length, band.size());
        org.apache.commons.math3.stat.descriptive.rank.Percentile pct =
                new org.apache.commons.math3.stat.descriptive.rank.Percentile()
                        .withEstimationType(org.apache.commons.math3.stat.descriptive.rank.Percentile.EstimationType.R_7);
        for (int q = 0; q < grid.length; q++) {
            double[] v = new double[cal.size()];
            for (int i = 0; i < cal.size(); i++) {
                v[i] = cal.get(i).clr(grid[q]);
            }
            assertEquals(grid[q], band.get(q).x(), 0.0);
            assertEquals(pct.evaluate(v, 5.0), band.get(q).lower(), 1e-12);
            assertEquals(pct.evaluate(v, 95.0), band.get(q).upper(), 1e-12);
        }
    }

    @Test
    void badInput() {
        DensitySet cal = DensitySet.of(space, TestData.gaussian(new Random(1), 10, k, 1));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> AnomalyScoring.withDefaults().fit(cal, new double[] {0.5, 0.2}));
        assertTrue(e.getMessage().matches("grid must be strictly increasing.*"), e.getMessage());
        AnomalyScoring.Calibrated c = AnomalyScoring.withDefaults().fit(cal, new double[] {0.5});
        DensitySet other = DensitySet.of(BayesSpace.polynomials(0, 1, 8), new double[2][8]);
        e = assertThrows(IllegalArgumentException.class, () -> c.score(other));
        assertTrue(e.getMessage().matches("residuals lives in .* but .* is required; use space.project.*"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> c.pValues(new double[] {Double.NaN}));
        assertTrue(e.getMessage().matches("norm 0 is NaN.*"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> AnomalyScoring.withDefaults().withFdr(Double.NaN));
    }
}
