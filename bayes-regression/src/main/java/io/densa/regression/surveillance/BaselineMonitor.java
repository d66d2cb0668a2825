package io.densa.regression.surveillance;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.DensitySet;
import io.densa.core.SolveDiagnostics;
import io.densa.core.internal.Cholesky;
import io.densa.core.internal.Seeds;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * A fitted, rolling baseline (see {@link RollingBaseline} for the model): predicts, scores and
 * absorbs one period at a time, and keeps each unit's alert history.
 *
 * <p>Immutable: {@link #absorb} returns a new monitor and leaves this one as it was, so scoring on
 * one thread while the next monitor is prepared on another is safe, and a backend can keep the
 * previous monitor until the new one is ready. {@link #state()} and {@link #restore} carry a
 * monitor across processes (bayes-io saves it as a model file).
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
    private final List<double[]> recent; // last L periods' coordinates (n × K row-major), most recent first; L the longest lag
    private final double[] recentVariances; // most recent period's estimation variances, or null
    private final List<double[]> calibration; // raw residuals (n × K) of the last C periods, oldest first
    private final List<double[]> calibrationX; // x_i = u_t + u_{t−1} per calibration period, or null entries
    private final List<int[]> calibrationKept; // per calibration period 1 (kept) / 0 (flagged, left out), or null: all kept
    private final List<AlertHistory> history;
    private final int lastPeriod;
    private final int absorbed;

    private BaselineMonitor(RollingBaseline config, BayesSpace space, String[] ids, int q, double[] szz,
            double[] szy, List<double[][]> windowMoments, List<double[]> recent, double[] recentVariances,
            List<double[]> calibration, List<double[]> calibrationX, List<int[]> calibrationKept,
            List<AlertHistory> history, int lastPeriod, int absorbed) {
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
        this.calibrationKept = calibrationKept;
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
        int start = config.longest;
        for (int t = 0; t < start; t++) {
            recent.add(0, past.get(t).densities().coordinatesRowMajor());
        }
        int d = 1 + lags * space.dimension() + q;
        BaselineMonitor m = new BaselineMonitor(config, space, ids, q, new double[d * d],
                new double[d * space.dimension()], List.of(), recent, past.get(start - 1).estimationVariances(),
                List.of(), new ArrayList<>(), new ArrayList<>(), quietHistory(ids), past.get(start - 1).index(), 0);
        int training = past.size() - config.calibrationPeriods;
        for (int t = start; t < past.size(); t++) {
            Period p = past.get(t);
            m.check(p);
            m = m.next(p, t >= training, false, null);
        }
        if ((long) n * (training - start) < d) {
            throw new IllegalArgumentException("the baseline has " + d + " coefficients per coordinate (intercept, "
                    + lags + " × " + space.dimension() + " lag coordinates, " + q + " covariates) but only "
                    + (long) n * (training - start) + " training rows; give more past periods or fewer lags");
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

    /** Everything this monitor holds besides its configuration (fresh arrays). */
    public MonitorState state() {
        int w = windowMoments.size();
        double[] wzz = new double[w * d * d];
        double[] wzy = new double[w * d * k];
        for (int t = 0; t < w; t++) {
            System.arraycopy(windowMoments.get(t)[0], 0, wzz, t * d * d, d * d);
            System.arraycopy(windowMoments.get(t)[1], 0, wzy, t * d * k, d * k);
        }
        double[] rec = new double[recent.size() * n * k];
        for (int l = 0; l < recent.size(); l++) {
            System.arraycopy(recent.get(l), 0, rec, l * n * k, n * k);
        }
        int c = calibration.size();
        double[] cal = new double[c * n * k];
        double[] calX = new double[c * n];
        int[] hasX = new int[c];
        int[] kept = new int[c * n];
        java.util.Arrays.fill(kept, 1);
        for (int t = 0; t < c; t++) {
            if (calibrationKept.get(t) != null) {
                System.arraycopy(calibrationKept.get(t), 0, kept, t * n, n);
            }
            System.arraycopy(calibration.get(t), 0, cal, t * n * k, n * k);
            if (calibrationX.get(t) != null) {
                hasX[t] = 1;
                System.arraycopy(calibrationX.get(t), 0, calX, t * n, n);
            }
        }
        return new MonitorState(space, ids, q, szz, szy, w, wzz, wzy, rec,
                recentVariances == null ? new double[0] : recentVariances, c, cal, calX, hasX, kept, history,
                lastPeriod, absorbed);
    }

    /**
     * The monitor saved as {@link #state()} with its configuration: predictions, scores and later
     * updates equal those of the saved monitor, bit for bit.
     *
     * @throws IllegalArgumentException when the parts do not fit together (naming the part)
     */
    public static BaselineMonitor restore(RollingBaseline config, MonitorState s) {
        java.util.Objects.requireNonNull(config, "config");
        java.util.Objects.requireNonNull(s, "state");
        BayesSpace space = java.util.Objects.requireNonNull(s.space(), "space");
        String[] ids = s.ids();
        int n = ids.length;
        int k = space.dimension();
        int q = s.covariates();
        if (n < 1 || q < 0 || s.absorbed() < 1) {
            throw new IllegalArgumentException("monitor state needs at least 1 unit, q >= 0 and an absorbed period; got "
                    + n + " units, q " + q + ", " + s.absorbed() + " absorbed");
        }
        int d = 1 + config.lags * k + q;
        int w = s.windowCount();
        int c = s.calibrationCount();
        requireLength("momentsZZ", s.momentsZZ(), (long) d * d);
        requireLength("momentsZY", s.momentsZY(), (long) d * k);
        if (w < 0 || (config.window == 0 ? w != 0 : w > config.window)) {
            throw new IllegalArgumentException("monitor state holds " + w + " window periods; the configuration's window is "
                    + config.window);
        }
        requireLength("windowZZ", s.windowZZ(), (long) w * d * d);
        requireLength("windowZY", s.windowZY(), (long) w * d * k);
        requireLength("recent", s.recent(), (long) config.longest * n * k);
        if (s.recentVariances().length != 0) {
            requireLength("recentVariances", s.recentVariances(), n);
        }
        if (c < 0 || c > config.calibrationPeriods) {
            throw new IllegalArgumentException("monitor state holds " + c + " calibration periods; at most "
                    + config.calibrationPeriods + " are configured");
        }
        requireLength("calibration", s.calibration(), (long) c * n * k);
        requireLength("calibrationX", s.calibrationX(), (long) c * n);
        if (s.hasX().length != c || s.history().size() != n) {
            throw new IllegalArgumentException("monitor state has " + s.hasX().length + " calibration flags and "
                    + s.history().size() + " histories; expected " + c + " and " + n);
        }
        for (int i = 0; i < n; i++) {
            if (!java.util.Objects.equals(s.history().get(i).id(), ids[i])) {
                throw new IllegalArgumentException("history " + i + " belongs to " + s.history().get(i).id()
                        + ", unit " + i + " is " + ids[i]);
            }
        }
        List<double[][]> wm = new ArrayList<>();
        double[] wzz = s.windowZZ();
        double[] wzy = s.windowZY();
        for (int t = 0; t < w; t++) {
            wm.add(new double[][] {Arrays.copyOfRange(wzz, t * d * d, (t + 1) * d * d),
                Arrays.copyOfRange(wzy, t * d * k, (t + 1) * d * k)});
        }
        List<double[]> rec = new ArrayList<>();
        double[] r = s.recent();
        for (int l = 0; l < config.longest; l++) {
            rec.add(Arrays.copyOfRange(r, l * n * k, (l + 1) * n * k));
        }
        List<double[]> cal = new ArrayList<>();
        List<double[]> calX = new ArrayList<>();
        List<int[]> calKept = new ArrayList<>();
        double[] cr = s.calibration();
        double[] cx = s.calibrationX();
        int[] ck = s.calibrationKept();
        if (ck.length != c * n) {
            throw new IllegalArgumentException("monitor state member calibrationKept has " + ck.length
                    + " values, expected " + (long) c * n);
        }
        for (int t = 0; t < c; t++) {
            cal.add(Arrays.copyOfRange(cr, t * n * k, (t + 1) * n * k));
            calX.add(s.hasX()[t] == 1 ? Arrays.copyOfRange(cx, t * n, (t + 1) * n) : null);
            calKept.add(ResidualCalibration.keptFlags(ck, t, n));
        }
        return new BaselineMonitor(config, space, ids, q, s.momentsZZ(), s.momentsZY(), wm, rec,
                s.recentVariances().length == 0 ? null : s.recentVariances(), cal, calX, calKept, s.history(),
                s.lastPeriod(), s.absorbed());
    }

    private static void requireLength(String what, double[] a, long expected) {
        if (a.length != expected) {
            throw new IllegalArgumentException("monitor state member " + what + " has " + a.length + " values, expected "
                    + expected);
        }
        for (int j = 0; j < a.length; j++) {
            if (!Double.isFinite(a[j])) {
                throw new IllegalArgumentException("monitor state member " + what + "[" + j + "] is " + a[j]
                        + "; finite values are required");
            }
        }
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

    /** Number of calibration residuals (units × calibration periods, less the flagged ones left out). */
    public int calibrationSize() {
        int m = 0;
        for (int[] kept : calibrationKept) {
            m += kept == null ? n : Arrays.stream(kept).sum();
        }
        return m;
    }

    /** Each unit's alert history, in unit order. */
    public List<AlertHistory> history() {
        return history;
    }

    /**
     * Coefficients B (d × K row-major: intercept, then the K rows of each lag of the lag set in
     * ascending order, then the covariates),
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
        double[] r = residual(period, yhat);
        double[] x = xValues(period);
        List<double[][]> kept = ResidualCalibration.kept(calibration, calibrationX, calibrationKept, n, k);
        List<double[]> keptR = new ArrayList<>(kept.size());
        List<double[]> keptX = new ArrayList<>(kept.size());
        for (double[][] c : kept) {
            keptR.add(c[0]);
            keptX.add(c[1]);
        }
        double[] ab = ResidualCalibration.varianceLine(keptR, keptX, k);
        DensitySet cal = null;
        for (int c = 0; c < kept.size(); c++) {
            DensitySet s = ResidualCalibration.standardised(space, keptR.get(c), keptX.get(c), ab, k, null);
            cal = cal == null ? s : cal.concat(s);
        }
        if (cal == null) {
            throw new IllegalStateException("every unit was flagged in every calibration period, so no calibration "
                    + "residual is left; monitor with withFlaggedKeptOutOfCalibration(false) or more calibration periods");
        }
        DensitySet current = ResidualCalibration.standardised(space, r, x, ab, k, idsOrNull());
        double[] grid = new double[101];
        for (int g = 0; g < grid.length; g++) {
            grid[g] = space.lower() + (space.upper() - space.lower()) * (g + 0.5) / grid.length;
        }
        AnomalyScoring.Report scores = AnomalyScoring.withDefaults().withFdr(config.fdr)
                .withBandLevel(config.bandLevel).withRandomisedTies(Seeds.mix(config.seed, 2L * period.index()))
                .fit(cal, grid).score(current);
        DensitySet expected = DensitySet.ofRowMajor(space, yhat, n, idsOrNull());
        double[][] rawCovariance = ResidualCalibration.covariance(space, keptR, k);
        double[] scales = new double[n];
        double[] baselineScales = new double[n];
        double[][] shape = ResidualCalibration.residualLaw(cal, ab, x, recentVariances, rawCovariance, scales,
                baselineScales);
        ExcessCounts.Result excess = null;
        if (period.counts() != null) {
            double[] edges = period.binEdges();
            double[] bands = config.excessBandsFor(edges, period.index());
            excess = ExcessCounts.withDefaults().withDraws(config.draws, Seeds.mix(config.seed, 2L * period.index() + 1))
                    .estimate(expected, period.counts(), edges, bands,
                            ExcessCounts.BaselineError.scaled(shape, baselineScales));
        }
        return new PeriodReport(period.index(), expected, current, scores, excess, scales, shape, baselineScales);
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
        return next(period, true, true, null);
    }

    /**
     * What one week (or period) of prospective monitoring gives: the report of the period, scored
     * before it was absorbed, and the monitor after absorbing it.
     *
     * @param report the period's report, as {@link #score} gives it (null before a calibration set
     *               exists)
     * @param next   the monitor after absorbing the period, as {@link #absorb} gives it
     */
    public record Step(PeriodReport report, BaselineMonitor next) {
    }

    /**
     * Scores the period and absorbs it in one pass: the report equals {@link #score}'s and the
     * monitor equals {@link #absorb}'s (both bit for bit), but the period is scored once instead of
     * twice. This monitor is not changed.
     *
     * @throws IllegalArgumentException when the period does not match (see {@link #predict})
     */
    public Step step(Period period) {
        check(period);
        PeriodReport rep = calibration.isEmpty() ? null : score(period);
        return new Step(rep, next(period, true, true, rep));
    }

    private BaselineMonitor next(Period period, boolean calibrate, boolean recordHistory, PeriodReport scored) {
        List<AlertHistory> h = history;
        double[] expected = null;
        int[] keptNow = null;
        if (recordHistory && !calibration.isEmpty()) {
            PeriodReport rep = scored != null ? scored : score(period);
            expected = rep.expected().coordinatesRowMajor();
            if (config.excludeFlagged && rep.scores().flaggedCount() > 0) {
                keptNow = new int[n];
                for (int i = 0; i < n; i++) {
                    keptNow[i] = rep.flagged(i) ? 0 : 1;
                }
            }
            h = new ArrayList<>(n);
            for (int i = 0; i < n; i++) {
                h.add(history.get(i).next(period.index(), rep.flagged(i), rep.displacedEvents(i)));
            }
        }
        List<double[]> cal = new ArrayList<>(calibration);
        List<double[]> calX = new ArrayList<>(calibrationX);
        List<int[]> calKept = new ArrayList<>(calibrationKept);
        if (calibrate) {
            cal.add(residual(period, expected != null ? expected : predictRowMajor(period)));
            calX.add(xValues(period));
            calKept.add(keptNow);
            while (cal.size() > config.calibrationPeriods) {
                cal.remove(0);
                calX.remove(0);
                calKept.remove(0);
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
        while (rec.size() > config.longest) {
            rec.remove(rec.size() - 1);
        }
        return new BaselineMonitor(config, space, ids, q, nzz, nzy, wm, rec, period.estimationVariances(), cal, calX,
                calKept, h, period.index(), absorbed + 1);
    }

    /** Raw residual coordinates y − ŷ (n × K row-major). */
    private double[] residual(Period period, double[] yhat) {
        double[] r = period.densities().coordinatesRowMajor();
        for (int j = 0; j < r.length; j++) {
            r[j] -= yhat[j];
        }
        return r;
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
        for (int l : config.lagSet) {
            System.arraycopy(recent.get(l - 1), i * k, z, o, k);
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
