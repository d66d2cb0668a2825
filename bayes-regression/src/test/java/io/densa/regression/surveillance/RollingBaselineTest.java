package io.densa.regression.surveillance;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Random;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import org.apache.commons.math3.stat.regression.OLSMultipleLinearRegression;
import org.junit.jupiter.api.Test;

class RollingBaselineTest {
    static final BayesSpace SPACE = BayesSpace.polynomials(0, 1, 3);
    static final int K = SPACE.dimension();
    static final int UNITS = 40;

    /** Invented panel: y_t = b0 + A y_{t−1} + g u + noise, coordinates in SPACE, with a seed. */
    record Panel(List<Period> periods, double[][] y) {
    }

    static Panel panel(int periods, double noise, long seed, int shiftFrom, int shifted, double shift) {
        Random r = new Random(seed);
        double[][] a = {{0.5, 0.1, 0}, {0, 0.4, 0.1}, {0.1, 0, 0.3}};
        double[] b0 = {0.3, -0.2, 0.1};
        double[] g = {0.5, 0.2, -0.3};
        double[][] u = new double[UNITS][1];
        for (double[] row : u) {
            row[0] = r.nextGaussian();
        }
        String[] ids = new String[UNITS];
        Arrays.setAll(ids, i -> "unit" + i);
        double[][] prev = new double[UNITS][K];
        for (double[] row : prev) {
            for (int j = 0; j < K; j++) {
                row[j] = r.nextGaussian();
            }
        }
        List<Period> out = new ArrayList<>();
        double[][] all = new double[periods][];
        for (int t = 0; t < periods; t++) {
            double[][] y = new double[UNITS][K];
            for (int i = 0; i < UNITS; i++) {
                for (int j = 0; j < K; j++) {
                    double v = b0[j] + g[j] * u[i][0] + noise * r.nextGaussian();
                    for (int m = 0; m < K; m++) {
                        v += a[j][m] * prev[i][m];
                    }
                    if (shiftFrom >= 0 && t >= shiftFrom && i < shifted) {
                        v += j == 0 ? shift : 0;
                    }
                    y[i][j] = v;
                }
            }
            out.add(new Period(t, DensitySet.of(SPACE, y, ids), u, null, null, null));
            all[t] = Arrays.stream(y).flatMapToDouble(Arrays::stream).toArray();
            prev = y;
        }
        return new Panel(out, all);
    }

    /**
     * Weighted least squares by Commons Math's OLS on rows scaled by √w (intercept as a column):
     * the closed form the monitor's moment updates must reproduce.
     */
    static double[] wls(Panel p, int from, int to, double phi, int q) {
        int rows = (to - from) * UNITS;
        int d = 1 + K + q;
        double[][] x = new double[rows][d];
        double[] beta = new double[d * K];
        for (int c = 0; c < K; c++) {
            double[] yy = new double[rows];
            int row = 0;
            for (int t = from; t < to; t++) {
                double sw = Math.sqrt(Math.pow(phi, to - 1 - t));
                double[][] u = p.periods().get(t).covariates();
                for (int i = 0; i < UNITS; i++) {
                    x[row][0] = sw;
                    for (int m = 0; m < K; m++) {
                        x[row][1 + m] = sw * p.y()[t - 1][i * K + m];
                    }
                    for (int j = 0; j < q; j++) {
                        x[row][1 + K + j] = sw * u[i][j];
                    }
                    yy[row] = sw * p.y()[t][i * K + c];
                    row++;
                }
            }
            leastSquaresInto(beta, c, yy, x, d);
        }
        return beta;
    }

    /** Commons Math least squares (no added intercept) of yy on x into column c of beta (d rows of K). */
    private static void leastSquaresInto(double[] beta, int c, double[] yy, double[][] x, int d) {
        OLSMultipleLinearRegression ols = new OLSMultipleLinearRegression();
        ols.setNoIntercept(true);
        ols.newSampleData(yy, x);
        double[] b = ols.estimateRegressionParameters();
        for (int j = 0; j < d; j++) {
            beta[j * K + c] = b[j];
        }
    }

    /** No forgetting: the moment-updated coefficients equal least squares on every transition. */
    @Test
    void momentsEqualLeastSquares() {
        Panel p = panel(12, 0.2, 1, -1, 0, 0);
        BaselineMonitor m = RollingBaseline.withDefaults().withRidge(0).fit(p.periods());
        assertArrayEquals(wls(p, 1, 12, 1, 1), m.coefficients(), 1e-10);
        // absorbing two more periods equals refitting on all of them
        Panel longer = panel(14, 0.2, 1, -1, 0, 0);
        BaselineMonitor m2 = m.absorb(longer.periods().get(12)).absorb(longer.periods().get(13));
        assertArrayEquals(wls(longer, 1, 14, 1, 1), m2.coefficients(), 1e-10);
    }

    /** Forgetting factor φ: weighted least squares with weights φ^(T−t) (recursive least squares). */
    @Test
    void forgettingEqualsExponentiallyWeightedLeastSquares() {
        Panel p = panel(12, 0.2, 2, -1, 0, 0);
        BaselineMonitor m = RollingBaseline.withDefaults().withRidge(0).withForgetting(0.8).fit(p.periods());
        assertArrayEquals(wls(p, 1, 12, 0.8, 1), m.coefficients(), 1e-9);
    }

    /** A window of W periods: least squares on the last W transitions only. */
    @Test
    void windowEqualsLeastSquaresOnTheLastPeriods() {
        Panel p = panel(12, 0.2, 3, -1, 0, 0);
        BaselineMonitor m = RollingBaseline.withDefaults().withRidge(0).withWindow(5).fit(p.periods());
        assertArrayEquals(wls(p, 7, 12, 1, 1), m.coefficients(), 1e-9);
    }

    /**
     * Without change the conformal p-values are valid: P(p ≤ α) ≤ α up to Monte Carlo error (Vovk,
     * Gammerman &amp; Shafer 2005), and flags at FDR 0.05 are rare.
     */
    @Test
    void nullPeriodsGiveValidPValues() {
        Panel p = panel(40, 0.3, 4, -1, 0, 0);
        BaselineMonitor m = RollingBaseline.withDefaults().withCalibrationPeriods(6).fit(p.periods().subList(0, 10));
        int below = 0;
        int total = 0;
        int flags = 0;
        for (int t = 10; t < 40; t++) {
            PeriodReport r = m.score(p.periods().get(t));
            for (var u : r.scores().units()) {
                below += u.pValue() <= 0.1 ? 1 : 0;
                flags += u.flagged() ? 1 : 0;
                total++;
            }
            m = m.absorb(p.periods().get(t));
        }
        double rate = below / (double) total;
        // 1,200 p-values: binomial sd of the rate at 0.1 is 0.009
        assertTrue(rate < 0.1 + 3 * 0.009, "P(p <= 0.1) = " + rate);
        assertTrue(flags <= 0.02 * total, flags + " flags of " + total);
    }

    /** A shift injected in 5 of 40 units is found within a few periods, and the history says so. */
    @Test
    void injectedShiftIsDetectedAndRecorded() {
        Panel p = panel(30, 0.3, 5, 20, 5, 2.5);
        BaselineMonitor m = RollingBaseline.withDefaults().withCalibrationPeriods(6).fit(p.periods().subList(0, 12));
        List<PeriodReport> reports = new ArrayList<>();
        for (int t = 12; t < 30; t++) {
            reports.add(m.score(p.periods().get(t)));
            m = m.absorb(p.periods().get(t));
        }
        int[] onsets = new int[UNITS];
        Arrays.fill(onsets, -1);
        Arrays.fill(onsets, 0, 5, 20);
        DetectionSummary s = DetectionSummary.evaluate(reports, onsets, 52);
        assertEquals(5, s.detected(), s.toString());
        assertTrue(s.medianDelay() <= 1, s.toString());
        for (int i = 0; i < 5; i++) {
            assertTrue(m.history().get(i).firstFlagged() >= 20, m.history().get(i).toString());
        }
        assertEquals("unit0", m.history().get(0).id());
    }

    /** Detection delays and false-alert rates on a hand-made example (counted by hand). */
    @Test
    void detectionSummaryCountsByHand() {
        Panel p = panel(20, 0.3, 6, -1, 0, 0);
        BaselineMonitor m = RollingBaseline.withDefaults().fit(p.periods().subList(0, 10));
        PeriodReport r10 = m.score(p.periods().get(10));
        int[] onsets = new int[UNITS];
        Arrays.fill(onsets, -1);
        onsets[0] = 10;
        DetectionSummary s = DetectionSummary.evaluate(List.of(r10), onsets, 52);
        int flaggedOthers = 0;
        for (int i = 1; i < UNITS; i++) {
            flaggedOthers += r10.flagged(i) ? 1 : 0;
        }
        assertEquals(flaggedOthers, s.falseAlerts());
        assertEquals((UNITS - 1) / 52.0, s.unitYearsAtRisk(), 1e-12);
        assertEquals(r10.flagged(0) ? 1 : 0, s.detected());
    }

    /** absorb leaves the monitor unchanged; concurrent scoring gives identical reports. */
    @Test
    void monitorsAreImmutableAndSafeToShare() throws Exception {
        Panel p = panel(16, 0.3, 7, -1, 0, 0);
        BaselineMonitor m = RollingBaseline.withDefaults().fit(p.periods().subList(0, 12));
        Period next = p.periods().get(12);
        double[] before = m.score(next).scores().units().stream().mapToDouble(u -> u.pValue()).toArray();
        BaselineMonitor m2 = m.absorb(next);
        assertNotSame(m, m2);
        double[] after = m.score(next).scores().units().stream().mapToDouble(u -> u.pValue()).toArray();
        assertArrayEquals(before, after, 0);
        ExecutorService ex = Executors.newFixedThreadPool(2);
        try {
            List<Future<double[]>> fs = new ArrayList<>();
            for (int j = 0; j < 4; j++) {
                fs.add(ex.submit(() -> m.score(next).scores().units().stream().mapToDouble(u -> u.pValue()).toArray()));
            }
            fs.add(ex.submit(() -> {
                m.absorb(next);
                return before;
            }));
            for (Future<double[]> f : fs) {
                assertArrayEquals(before, f.get(), 0);
            }
        } finally {
            ex.shutdown();
        }
    }

    /** Periods out of order, other units or other covariates are refused with a message. */
    @Test
    void mismatchedPeriodsAreRefused() {
        Panel p = panel(12, 0.3, 8, -1, 0, 0);
        BaselineMonitor m = RollingBaseline.withDefaults().fit(p.periods());
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> m.score(p.periods().get(3)));
        assertTrue(e.getMessage().contains("increasing order"), e.getMessage());
        Period fewer = Period.of(20, p.periods().get(0).densities().subset(0, 1, 2));
        assertThrows(IllegalArgumentException.class, () -> m.score(fewer));
        Period noCovariates = Period.of(20, p.periods().get(0).densities());
        e = assertThrows(IllegalArgumentException.class, () -> m.score(noCovariates));
        assertTrue(e.getMessage().contains("covariates"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> RollingBaseline.withDefaults().fit(p.periods().subList(0, 4)));
    }

    /**
     * Invented seasonal panel: y_t = b0 + A y_{t−S} + g u (+ noise) for t ≥ S, the first S periods
     * drawn freely; with noise 0 the relation is exact.
     */
    static Panel seasonalPanel(int periods, int season, double noise, long seed) {
        Random r = new Random(seed);
        double[][] a = {{0.6, 0.1, 0}, {0, -0.5, 0.2}, {0.1, 0, 0.4}};
        double[] b0 = {0.2, -0.1, 0.3};
        double[] g = {-0.4, 0.3, 0.1};
        double[][] u = new double[UNITS][1];
        for (double[] row : u) {
            row[0] = r.nextGaussian();
        }
        String[] ids = new String[UNITS];
        Arrays.setAll(ids, i -> "unit" + i);
        List<Period> out = new ArrayList<>();
        double[][] all = new double[periods][];
        for (int t = 0; t < periods; t++) {
            double[][] y = new double[UNITS][K];
            for (int i = 0; i < UNITS; i++) {
                for (int j = 0; j < K; j++) {
                    double v;
                    if (t < season) {
                        v = r.nextGaussian();
                    } else {
                        v = b0[j] + g[j] * u[i][0] + noise * r.nextGaussian();
                        for (int m = 0; m < K; m++) {
                            v += a[j][m] * all[t - season][i * K + m];
                        }
                    }
                    y[i][j] = v;
                }
            }
            out.add(new Period(t, DensitySet.of(SPACE, y, ids), u, null, null, null));
            all[t] = Arrays.stream(y).flatMapToDouble(Arrays::stream).toArray();
        }
        return new Panel(out, all);
    }

    /**
     * A seasonal lag set {S}: with an exact relation y_t = b0 + A y_{t−S} + g u the coefficients are
     * recovered exactly and the next period is predicted exactly (closed form: the generating
     * coefficients); with noise they equal ordinary least squares on the rows (y_t; 1, y_{t−S}, u)
     * by Commons Math's OLSMultipleLinearRegression, also after absorbing more periods.
     */
    @Test
    void seasonalLagRecoversTheGeneratingModel() {
        int season = 6;
        Panel exact = seasonalPanel(20, season, 0, 11);
        BaselineMonitor m = RollingBaseline.withDefaults().withLagSet(season).withRidge(0).withCalibrationPeriods(2)
                .fit(exact.periods().subList(0, 16));
        double[] expected = {0.2, -0.1, 0.3, 0.6, 0, 0.1, 0.1, -0.5, 0, 0, 0.2, 0.4, -0.4, 0.3, 0.1};
        assertArrayEquals(expected, m.coefficients(), 1e-9);
        assertArrayEquals(exact.y()[16], m.predict(exact.periods().get(16)).coordinatesRowMajor(), 1e-9);
        assertEquals(season, m.configuration().longestLag());
        assertArrayEquals(new int[] {season}, m.configuration().lagSet());

        Panel noisy = seasonalPanel(24, season, 0.3, 12);
        BaselineMonitor n = RollingBaseline.withDefaults().withLagSet(season).withRidge(0).fit(noisy.periods()
                .subList(0, 20));
        assertArrayEquals(seasonalOls(noisy, season, 20), n.coefficients(), 1e-10);
        n = n.absorb(noisy.periods().get(20)).absorb(noisy.periods().get(21));
        assertArrayEquals(seasonalOls(noisy, season, 22), n.coefficients(), 1e-10);
    }

    /** OLS of y_t on (1, y_{t−1}, y_{t−S}, u) for a lag set {1, S} (Commons Math) equals the monitor's moments. */
    @Test
    void lagSetWithAGapEqualsLeastSquares() {
        int season = 5;
        Panel p = seasonalPanel(18, season, 0.4, 13);
        BaselineMonitor m = RollingBaseline.withDefaults().withLagSet(season, 1).withRidge(0).fit(p.periods());
        int rows = (18 - season) * UNITS;
        int d = 1 + 2 * K + 1;
        double[][] x = new double[rows][d];
        double[] beta = new double[d * K];
        for (int c = 0; c < K; c++) {
            double[] yy = new double[rows];
            int row = 0;
            for (int t = season; t < 18; t++) {
                for (int i = 0; i < UNITS; i++) {
                    x[row][0] = 1;
                    for (int q = 0; q < K; q++) {
                        x[row][1 + q] = p.y()[t - 1][i * K + q];
                        x[row][1 + K + q] = p.y()[t - season][i * K + q];
                    }
                    x[row][1 + 2 * K] = p.periods().get(t).covariates()[i][0];
                    yy[row++] = p.y()[t][i * K + c];
                }
            }
            leastSquaresInto(beta, c, yy, x, d);
        }
        assertArrayEquals(beta, m.coefficients(), 1e-10);
        assertEquals(2, m.configuration().lags());
    }

    /** Lag sets out of range, repeated or empty are refused; too few past periods for the longest lag too. */
    @Test
    void badLagSetsAreRefused() {
        assertThrows(IllegalArgumentException.class, () -> RollingBaseline.withDefaults().withLagSet());
        assertThrows(IllegalArgumentException.class, () -> RollingBaseline.withDefaults().withLagSet(0));
        assertThrows(IllegalArgumentException.class,
                () -> RollingBaseline.withDefaults().withLagSet(RollingBaseline.MAX_LAG + 1));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> RollingBaseline.withDefaults().withLagSet(52, 1, 52));
        assertTrue(e.getMessage().contains("twice"), e.getMessage());
        Panel p = seasonalPanel(10, 3, 0.3, 14);
        e = assertThrows(IllegalArgumentException.class,
                () -> RollingBaseline.withDefaults().withLagSet(8).fit(p.periods()));
        assertTrue(e.getMessage().contains("at least 13"), e.getMessage());
    }

    /** Weighted least squares of y_t on (1, y_{t−S}, u) over t = S..to−1 (Commons Math OLS). */
    static double[] seasonalOls(Panel p, int season, int to) {
        int rows = (to - season) * UNITS;
        int d = 1 + K + 1;
        double[][] x = new double[rows][d];
        double[] beta = new double[d * K];
        for (int c = 0; c < K; c++) {
            double[] yy = new double[rows];
            int row = 0;
            for (int t = season; t < to; t++) {
                for (int i = 0; i < UNITS; i++) {
                    x[row][0] = 1;
                    for (int q = 0; q < K; q++) {
                        x[row][1 + q] = p.y()[t - season][i * K + q];
                    }
                    x[row][1 + K] = p.periods().get(t).covariates()[i][0];
                    yy[row++] = p.y()[t][i * K + c];
                }
            }
            leastSquaresInto(beta, c, yy, x, d);
        }
        return beta;
    }

    /** step gives score's report and absorb's monitor, bit for bit, over several periods. */
    @Test
    void stepEqualsScoreThenAbsorb() {
        Panel p = panel(20, 0.3, 15, 14, 4, 2.5);
        BaselineMonitor a = RollingBaseline.withDefaults().withCalibrationPeriods(6).fit(p.periods().subList(0, 12));
        BaselineMonitor b = a;
        int flags = 0;
        for (int t = 12; t < 20; t++) {
            PeriodReport r = a.score(p.periods().get(t));
            a = a.absorb(p.periods().get(t));
            BaselineMonitor.Step s = b.step(p.periods().get(t));
            b = s.next();
            for (int i = 0; i < UNITS; i++) {
                assertEquals(r.scores().units().get(i).pValue(), s.report().scores().units().get(i).pValue(), 0);
                assertEquals(r.flagged(i), s.report().flagged(i));
                flags += r.flagged(i) ? 1 : 0;
            }
            assertArrayEquals(a.coefficients(), b.coefficients(), 0);
            assertEquals(a.history(), b.history());
        }
        assertTrue(flags > 0, "the comparison must include flagged units");
    }

    /**
     * Flagged residuals kept out of the calibration set: the set shrinks by exactly the flags of the
     * periods it holds, and a lasting shift keeps being flagged at least as often as when every
     * residual enters the set (where the shifted units' own residuals mask them).
     */
    @Test
    void flaggedResidualsKeptOutOfCalibration() {
        Panel p = panel(30, 0.3, 16, 16, 6, 1.5);
        RollingBaseline base = RollingBaseline.withDefaults().withCalibrationPeriods(6);
        BaselineMonitor plain = base.fit(p.periods().subList(0, 12));
        BaselineMonitor kept = base.withFlaggedKeptOutOfCalibration(true).fit(p.periods().subList(0, 12));
        assertTrue(kept.configuration().flaggedKeptOutOfCalibration());
        List<Integer> flagsPerPeriod = new ArrayList<>();
        int plainShiftedFlags = 0;
        int keptShiftedFlags = 0;
        for (int t = 12; t < 30; t++) {
            BaselineMonitor.Step a = plain.step(p.periods().get(t));
            BaselineMonitor.Step b = kept.step(p.periods().get(t));
            plain = a.next();
            kept = b.next();
            flagsPerPeriod.add(b.report().scores().flaggedCount());
            int window = Math.min(6, flagsPerPeriod.size());
            int left = 0;
            for (int j = flagsPerPeriod.size() - window; j < flagsPerPeriod.size(); j++) {
                left += flagsPerPeriod.get(j);
            }
            assertEquals(6 * UNITS - left, kept.calibrationSize(), "period " + t);
            assertEquals(6 * UNITS, plain.calibrationSize());
            for (int i = 0; i < 6; i++) {
                plainShiftedFlags += a.report().flagged(i) ? 1 : 0;
                keptShiftedFlags += b.report().flagged(i) ? 1 : 0;
            }
        }
        assertTrue(flagsPerPeriod.stream().mapToInt(Integer::intValue).sum() > 0, "some flags are needed");
        // the state carries the left-out residuals; a restored monitor has the same calibration set
        MonitorState st = kept.state();
        assertEquals(kept.calibrationSize(), BaselineMonitor.restore(kept.configuration(), st).calibrationSize());
        int[] bad = st.calibrationKept();
        bad[0] = 2;
        MonitorState broken = new MonitorState(st.space(), st.ids(), st.covariates(), st.momentsZZ(), st.momentsZY(),
                st.windowCount(), st.windowZZ(), st.windowZY(), st.recent(), st.recentVariances(),
                st.calibrationCount(), st.calibration(), st.calibrationX(), st.hasX(), bad, st.history(),
                st.lastPeriod(), st.absorbed());
        RollingBaseline cfg = kept.configuration();
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> BaselineMonitor.restore(cfg, broken));
        assertTrue(e.getMessage().contains("calibrationKept[0] is 2"), e.getMessage());
        assertTrue(keptShiftedFlags >= plainShiftedFlags, keptShiftedFlags + " < " + plainShiftedFlags);
        assertTrue(keptShiftedFlags > 0);
    }
}
