package io.densa.regression.surveillance;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.DensitySet;
import io.densa.core.SolveDiagnostics;
import io.densa.core.internal.Cholesky;
import io.densa.core.internal.Seeds;
import io.densa.regression.AnomalyScoring;
import io.densa.regression.ExcessCounts;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * A fitted, rolling baseline (see {@link RollingBaseline} for the model): predicts, scores and
 * absorbs one period at a time, and keeps each unit's alert history.
 *
 * <p>Immutable: {@link #absorb} returns a new monitor and leaves this one as it was, so scoring on
 * one thread while the next monitor is prepared on another is safe, and a backend can keep the
 * previous monitor until the new one is ready.
 */
public final class BaselineMonitor {
    private final RollingBaseline config;
    private final BayesSpace space;
    private final String[] ids;
    private final int n;
    private final int k;
    private final int q;
    private final int d;
    private final double[] szz; // d × d, weighted moments of the absorbed periods
    private final double[] szy; // d × K
    private final List<double[][]> windowMoments; // per absorbed period {szz_t, szy_t}, oldest first (window only)
    private final double[] beta; // d × K coefficients
    private final List<double[]> recent; // last L periods' coordinates (n × K row-major), most recent first
    private final double[] recentVariances; // most recent period's estimation variances, or null
    private final List<double[]> calibration; // raw residuals (n × K) of the last C periods, oldest first
    private final List<double[]> calibrationX; // x_i = u_t + u_{t−1} per calibration period, or null entries
    private final List<AlertHistory> history;
    private final int lastPeriod;
    private final int absorbed;

    private BaselineMonitor(RollingBaseline config, BayesSpace space, String[] ids, int q, double[] szz,
            double[] szy, List<double[][]> windowMoments, List<double[]> recent, double[] recentVariances,
            List<double[]> calibration, List<double[]> calibrationX, List<AlertHistory> history, int lastPeriod,
            int absorbed) {
        this.config = config;
        this.space = space;
        this.ids = ids;
        this.n = ids.length;
        this.k = space.dimension();
        this.q = q;
        this.d = 1 + config.lags * k + q;
        this.szz = szz;
        this.szy = szy;
        this.windowMoments = List.copyOf(windowMoments);
        this.recent = List.copyOf(recent);
        this.recentVariances = recentVariances;
        this.calibration = List.copyOf(calibration);
        this.calibrationX = calibrationX;
        this.history = List.copyOf(history);
        this.lastPeriod = lastPeriod;
        this.absorbed = absorbed;
        this.beta = absorbed == 0 ? null : solve(config, szz, szy, d, k);
    }

    static BaselineMonitor fit(RollingBaseline config, List<Period> past) {
        Period first = past.get(0);
        BayesSpace space = first.densities().space();
        int n = first.size();
        String[] ids = new String[n];
        for (int i = 0; i < n; i++) {
            ids[i] = first.densities().id(i);
        }
        int q = first.covariateCount();
        List<double[]> recent = new ArrayList<>();
        int lags = config.lags;
        for (int t = 0; t < lags; t++) {
            recent.add(0, past.get(t).densities().coordinatesRowMajor());
        }
        int d = 1 + lags * space.dimension() + q;
        BaselineMonitor m = new BaselineMonitor(config, space, ids, q, new double[d * d],
                new double[d * space.dimension()], List.of(), recent, past.get(lags - 1).estimationVariances(),
                List.of(), new ArrayList<>(), quietHistory(ids), past.get(lags - 1).index(), 0);
        int training = past.size() - config.calibrationPeriods;
        for (int t = lags; t < past.size(); t++) {
            Period p = past.get(t);
            m.check(p);
            m = m.next(p, t >= training, false);
        }
        if ((long) n * (training - lags) < d) {
            throw new IllegalArgumentException("the baseline has " + d + " coefficients per coordinate (intercept, "
                    + lags + " × " + space.dimension() + " lag coordinates, " + q + " covariates) but only "
                    + (long) n * (training - lags) + " training rows; give more past periods or fewer lags");
        }
        return m;
    }

    private static List<AlertHistory> quietHistory(String[] ids) {
        List<AlertHistory> h = new ArrayList<>(ids.length);
        for (String id : ids) {
            h.add(AlertHistory.quiet(id));
        }
        return h;
    }

    /** The configuration. */
    public RollingBaseline configuration() {
        return config;
    }

    /** The units' space. */
    public BayesSpace space() {
        return space;
    }

    /** Index of the latest absorbed period. */
    public int lastPeriod() {
        return lastPeriod;
    }

    /** Number of periods absorbed into the moments (training and later). */
    public int absorbedPeriods() {
        return absorbed;
    }

    /** Number of calibration residuals (units × calibration periods). */
    public int calibrationSize() {
        return calibration.size() * n;
    }

    /** Each unit's alert history, in unit order. */
    public List<AlertHistory> history() {
        return history;
    }

    /**
     * Coefficients B (d × K row-major: intercept, then lag 1's K rows, …, then the covariates),
     * a fresh copy.
     */
    public double[] coefficients() {
        return beta.clone();
    }

    /**
     * The baseline's predicted density per unit for the next period (the one after
     * {@link #lastPeriod()}), from the recent densities and the period's covariates.
     *
     * @throws IllegalArgumentException when the period does not follow the absorbed ones or its
     *                                  units, space or covariates do not match
     */
    public DensitySet predict(Period period) {
        check(period);
        return DensitySet.ofRowMajor(space, predictRowMajor(period), n, idsOrNull());
    }

    /**
     * Scores a period against the baseline and the rolling calibration set, without absorbing it.
     *
     * @throws IllegalArgumentException when the period does not match (see {@link #predict})
     */
    public PeriodReport score(Period period) {
        check(period);
        double[] yhat = predictRowMajor(period);
        double[] y = period.densities().coordinatesRowMajor();
        double[] r = new double[n * k];
        for (int j = 0; j < r.length; j++) {
            r[j] = y[j] - yhat[j];
        }
        double[] x = xValues(period);
        double[] ab = varianceLine();
        DensitySet cal = null;
        for (int c = 0; c < calibration.size(); c++) {
            DensitySet s = standardised(calibration.get(c), calibrationX.get(c), ab, null);
            cal = cal == null ? s : cal.concat(s);
        }
        DensitySet current = standardised(r, x, ab, idsOrNull());
        double[] grid = new double[101];
        for (int g = 0; g < grid.length; g++) {
            grid[g] = space.lower() + (space.upper() - space.lower()) * (g + 0.5) / grid.length;
        }
        AnomalyScoring.Report scores = AnomalyScoring.withDefaults().withFdr(config.fdr)
                .withBandLevel(config.bandLevel).withRandomisedTies(Seeds.mix(config.seed, 2L * period.index()))
                .fit(cal, grid).score(current);
        DensitySet expected = DensitySet.ofRowMajor(space, yhat, n, idsOrNull());
        ExcessCounts.Result excess = null;
        if (period.counts() != null) {
            double[] edges = period.binEdges();
            excess = ExcessCounts.withDefaults().withDraws(config.draws, Seeds.mix(config.seed, 2L * period.index() + 1))
                    .estimate(expected, period.counts(), edges, new double[] {edges[0], edges[edges.length - 1]},
                            ExcessCounts.BaselineError.common(calibrationCovariance()));
        }
        return new PeriodReport(period.index(), expected, current, scores, excess);
    }

    /**
     * Scores the period (when a calibration set exists), updates the alert history, adds the
     * period's out-of-sample residuals to the calibration set (dropping the oldest beyond C) and
     * its moments to the baseline (with the forgetting factor or the window), and returns the new
     * monitor. This monitor is not changed.
     *
     * @throws IllegalArgumentException when the period does not match (see {@link #predict})
     */
    public BaselineMonitor absorb(Period period) {
        check(period);
        return next(period, true, true);
    }

    private BaselineMonitor next(Period period, boolean calibrate, boolean recordHistory) {
        List<AlertHistory> h = history;
        if (recordHistory && !calibration.isEmpty()) {
            PeriodReport rep = score(period);
            h = new ArrayList<>(n);
            for (int i = 0; i < n; i++) {
                h.add(history.get(i).next(period.index(), rep.flagged(i), rep.overallExcess(i)));
            }
        }
        List<double[]> cal = new ArrayList<>(calibration);
        List<double[]> calX = new ArrayList<>(calibrationX);
        if (calibrate) {
            double[] yhat = predictRowMajor(period);
            double[] y = period.densities().coordinatesRowMajor();
            double[] r = new double[n * k];
            for (int j = 0; j < r.length; j++) {
                r[j] = y[j] - yhat[j];
            }
            cal.add(r);
            calX.add(xValues(period));
            while (cal.size() > config.calibrationPeriods) {
                cal.remove(0);
                calX.remove(0);
            }
        }
        // the period's moments
        double[] czz = new double[d * d];
        double[] czy = new double[d * k];
        double[] z = new double[d];
        double[] y = period.densities().coordinatesRowMajor();
        for (int i = 0; i < n; i++) {
            regressors(period, i, z);
            for (int a = 0; a < d; a++) {
                double za = z[a];
                for (int b = 0; b <= a; b++) {
                    czz[a * d + b] += za * z[b];
                }
                for (int c = 0; c < k; c++) {
                    czy[a * k + c] += za * y[i * k + c];
                }
            }
        }
        for (int a = 0; a < d; a++) {
            for (int b = 0; b < a; b++) {
                czz[b * d + a] = czz[a * d + b];
            }
        }
        double[] nzz = szz.clone();
        double[] nzy = szy.clone();
        List<double[][]> wm = new ArrayList<>(windowMoments);
        if (config.window > 0) {
            wm.add(new double[][] {czz, czy});
            add(nzz, czz, 1);
            add(nzy, czy, 1);
            if (wm.size() > config.window) {
                double[][] old = wm.remove(0);
                add(nzz, old[0], -1);
                add(nzy, old[1], -1);
            }
        } else {
            scale(nzz, config.forgetting);
            scale(nzy, config.forgetting);
            add(nzz, czz, 1);
            add(nzy, czy, 1);
        }
        List<double[]> rec = new ArrayList<>(recent);
        rec.add(0, y);
        while (rec.size() > config.lags) {
            rec.remove(rec.size() - 1);
        }
        return new BaselineMonitor(config, space, ids, q, nzz, nzy, wm, rec, period.estimationVariances(), cal, calX,
                h, period.index(), absorbed + 1);
    }

    private static void add(double[] a, double[] b, double s) {
        for (int j = 0; j < a.length; j++) {
            a[j] += s * b[j];
        }
    }

    private static void scale(double[] a, double s) {
        if (s != 1) {
            for (int j = 0; j < a.length; j++) {
                a[j] *= s;
            }
        }
    }

    /** B = (S_zz + ρ tr(S_zz)/d I)⁻¹ S_zy by one Cholesky factorisation. */
    private static double[] solve(RollingBaseline config, double[] szz, double[] szy, int d, int k) {
        double[] a = szz.clone();
        double tr = 0;
        for (int j = 0; j < d; j++) {
            tr += a[j * d + j];
        }
        double ridge = config.ridge * tr / d;
        for (int j = 0; j < d; j++) {
            a[j * d + j] += ridge;
        }
        int fail = Cholesky.factor(a, d, d, 1e-13);
        if (fail >= 0) {
            throw new DensaException("the baseline's moment matrix is singular at column " + fail + " (a covariate or "
                    + "lag coordinate that does not vary, or collinear covariates); raise the ridge with withRidge or "
                    + "remove the covariate", new SolveDiagnostics("rolling baseline moments", d, Double.NaN));
        }
        double[] b = new double[d * k];
        double[] col = new double[d];
        for (int c = 0; c < k; c++) {
            for (int j = 0; j < d; j++) {
                col[j] = szy[j * k + c];
            }
            Cholesky.solve(a, d, d, col, 0);
            for (int j = 0; j < d; j++) {
                b[j * k + c] = col[j];
            }
        }
        return b;
    }

    private void regressors(Period p, int i, double[] z) {
        z[0] = 1;
        int o = 1;
        for (double[] lag : recent) {
            System.arraycopy(lag, i * k, z, o, k);
            o += k;
        }
        for (int j = 0; j < q; j++) {
            z[o + j] = p.covariate(i, j);
        }
    }

    private double[] predictRowMajor(Period p) {
        double[] out = new double[n * k];
        double[] z = new double[d];
        for (int i = 0; i < n; i++) {
            regressors(p, i, z);
            for (int a = 0; a < d; a++) {
                double za = z[a];
                for (int c = 0; c < k; c++) {
                    out[i * k + c] += za * beta[a * k + c];
                }
            }
        }
        return out;
    }

    /** x_i = u_{i,t} + u_{i,t−1}, or null unless both periods carry estimation variances. */
    private double[] xValues(Period p) {
        if (recentVariances == null || p.estimationVariances() == null) {
            return null;
        }
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = p.estimationVariance(i) + recentVariances[i];
        }
        return x;
    }

    /**
     * (a, b) ≥ 0 minimising Σ (‖r‖² − a x − b)² over the calibration residuals, or null when a
     * calibration period lacks estimation variances.
     */
    private double[] varianceLine() {
        double sw = 0;
        double sx = 0;
        double sxx = 0;
        double sy = 0;
        double sxy = 0;
        for (int c = 0; c < calibration.size(); c++) {
            double[] x = calibrationX.get(c);
            if (x == null) {
                return null;
            }
            double[] r = calibration.get(c);
            for (int i = 0; i < n; i++) {
                double s = 0;
                for (int j = 0; j < k; j++) {
                    s += r[i * k + j] * r[i * k + j];
                }
                sw += 1;
                sx += x[i];
                sxx += x[i] * x[i];
                sy += s;
                sxy += x[i] * s;
            }
        }
        double det = sw * sxx - sx * sx;
        double a = det > 0 ? (sw * sxy - sx * sy) / det : 0;
        double b = (sy - a * sx) / sw;
        if (a < 0) {
            a = 0;
            b = sy / sw;
        } else if (b < 0) {
            b = 0;
            a = sxx > 0 ? sxy / sxx : 0;
        }
        if (!(a * (sx / sw) + b > 0)) {
            return null;
        }
        return new double[] {a, b};
    }

    /** Residual rows powered by 1/√(a x_i + b) (unchanged without the line). */
    private DensitySet standardised(double[] r, double[] x, double[] ab, String[] rowIds) {
        double[] s = r.clone();
        if (ab != null && x != null) {
            double floor = 1e-12 * (ab[1] + ab[0] * Arrays.stream(x).average().orElse(0));
            for (int i = 0; i < n; i++) {
                double f = 1 / Math.sqrt(Math.max(ab[0] * x[i] + ab[1], floor));
                for (int j = 0; j < k; j++) {
                    s[i * k + j] *= f;
                }
            }
        }
        return DensitySet.ofRowMajor(space, s, n, rowIds);
    }

    /** Covariance (K × K, divisor m − 1) of the raw calibration residuals. */
    private double[][] calibrationCovariance() {
        int m = calibration.size() * n;
        double[] mean = new double[k];
        for (double[] r : calibration) {
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < k; j++) {
                    mean[j] += r[i * k + j] / m;
                }
            }
        }
        double[][] c = new double[k][k];
        for (double[] r : calibration) {
            for (int i = 0; i < n; i++) {
                for (int a = 0; a < k; a++) {
                    double ea = r[i * k + a] - mean[a];
                    for (int b = 0; b <= a; b++) {
                        c[a][b] += ea * (r[i * k + b] - mean[b]) / Math.max(1, m - 1);
                    }
                }
            }
        }
        for (int a = 0; a < k; a++) {
            for (int b = 0; b < a; b++) {
                c[b][a] = c[a][b];
            }
        }
        return c;
    }

    private String[] idsOrNull() {
        return ids.clone();
    }

    /** The period must follow the absorbed ones and hold the same units in the same space. */
    void check(Period p) {
        if (p.index() <= lastPeriod) {
            throw new IllegalArgumentException("period " + p.index() + " does not follow the latest absorbed period "
                    + lastPeriod + "; periods must arrive in increasing order");
        }
        space.requireSame(p.densities().space(), "period " + p.index());
        if (p.size() != n) {
            throw new IllegalArgumentException("period " + p.index() + " has " + p.size() + " units, the baseline "
                    + n + "; every period must hold the same units in the same order");
        }
        for (int i = 0; i < n; i++) {
            String id = p.densities().id(i);
            if (!java.util.Objects.equals(id, ids[i])) {
                throw new IllegalArgumentException("period " + p.index() + ": unit " + i + " is " + id
                        + ", the baseline has " + ids[i] + " there; keep the units' order");
            }
        }
        if (p.covariateCount() != q) {
            throw new IllegalArgumentException("period " + p.index() + " has " + p.covariateCount()
                    + " covariates, the baseline " + q);
        }
    }

    @Override
    public String toString() {
        int flagged = 0;
        for (AlertHistory a : history) {
            flagged += a.consecutive() > 0 ? 1 : 0;
        }
        return "BaselineMonitor[" + n + " units, K " + k + ", " + config + ", absorbed " + absorbed
                + " periods up to " + lastPeriod + ", calibration " + calibrationSize() + " residuals, " + flagged
                + " units flagged in the latest period]";
    }
}
