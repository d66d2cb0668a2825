package io.densa.regression.surveillance;

import java.util.List;
import java.util.Objects;

/**
 * Configuration of period-by-period surveillance from a baseline that is kept and updated: each
 * unit's density in period t is predicted from its own densities in the previous periods and
 * scalar covariates, the prediction is compared with what arrived (conformal p-values, false
 * discovery rate flags, excess counts with intervals), and the period is then absorbed into the
 * baseline by updating its moments, without refitting from scratch.
 *
 * <h2>The model</h2>
 * In clr coordinates (an orthonormal basis of the Bayes space, so that perturbation is addition of
 * coordinates), unit i's density in period t is
 * y_{i,t} = b_0 + Σ_{l=1..L} A_l y_{i,t−l} + Γ u_{i,t} + e_{i,t}: a function-on-function linear
 * regression with a full-rank coordinate kernel A_l (K × K) per lag and scalar covariates u
 * (Ramsay &amp; Silverman 2005, Functional Data Analysis, 2nd ed., Springer, ch. 16, for the
 * functional linear model; van den Boogaart, Egozcue &amp; Pawlowsky-Glahn 2014, Bayes Hilbert spaces,
 * Aust. N. Z. J. Stat. 56, for the coordinates). With z_{i,t} = (1, y_{i,t−1}, …, y_{i,t−L}, u_{i,t})
 * of length d, the coefficients are B = (S_zz + ρ (tr S_zz / d) I)⁻¹ S_zy with the moments
 * S_zz = Σ w_t z zᵀ and S_zy = Σ w_t z yᵀ over the absorbed periods and a small ridge ρ (default
 * 10⁻⁸, a numerical guard). The weights are w_t = φ^{T−t} with a forgetting factor φ ∈ (0, 1]
 * (exponentially weighted recursive least squares; Ljung &amp; Söderström 1983, Theory and Practice
 * of Recursive Identification, MIT Press, ch. 2), or 1 for the last W periods and 0 before them (a
 * moving window). Absorbing a period adds its moments (and, with a window, subtracts those of the
 * period leaving it): the coefficients equal a weighted least-squares fit on the same rows.
 *
 * <h2>Scoring</h2>
 * The residual of unit i is r_i = y_i ⊖ ŷ_i. When every period carries the units' estimation
 * variances u, the squared residual norm is modelled as a x_i + b with x_i = u_{i,t} + u_{i,t−1}
 * (a, b ≥ 0, least squares over the calibration residuals), and each residual is standardised by
 * powering, r_i ⊙ (1/√(a x_i + b)), so that small units (noisy densities) are not flagged for their
 * noise. The calibration set is the residuals of the last C absorbed periods, each computed before
 * that period was absorbed (out of sample); p-values are split-conformal ranks of the residual
 * norm among them (Vovk, Gammerman &amp; Shafer 2005, Algorithmic Learning in a Random World,
 * Springer), smoothed with seeded random tie-breaking, and flags come from the Benjamini–Hochberg
 * (1995) adjustment within the period (see {@link AnomalyScoring}). Periods
 * with counts also get excess counts with parametric-bootstrap intervals that carry the counting
 * noise and the baseline's uncertainty, taken as the covariance of the calibration residuals (which
 * also holds the current period's estimation noise, so the intervals are on the wide side; see
 * {@link ExcessCounts}).
 *
 * <h2>Seasonal lags</h2>
 * The lags need not be 1..L: {@link #withLagSet} takes any set of up to 12 lags, each at most
 * {@value #MAX_LAG} periods, for example {52} for weekly periods predicted from the same week a year
 * earlier, or {1, 52}. The regressors are then z = (1, y_{t−l_1}, …, y_{t−l_m}, u) for the lags
 * l_1 &lt; … &lt; l_m of the set, so d = 1 + m K + q, and the monitor keeps the densities of the last
 * l_m periods to form them (the first l_m past periods only start the lags).
 *
 * <p>Defaults: 1 lag, no forgetting (φ = 1, every period weighs the same), 4 calibration periods,
 * FDR 0.05, 95 % pointwise bands, ridge 10⁻⁸, 999 bootstrap draws, seed 1. Immutable.
 *
 * <p>These are statistical signals for trained analysts, not diagnoses; decisions rest with the
 * responsible public-health authorities.
 */
public final class RollingBaseline {
    /** The longest lag a lag set may hold (ten years of weeks). */
    public static final int MAX_LAG = 520;
    /** The lags l_1 &lt; … &lt; l_m, ascending. */
    final int[] lagSet;
    /** Number m of lagged densities among the regressors. */
    final int lags;
    /** Longest lag l_m: periods of densities the monitor keeps. */
    final int longest;
    final double forgetting;
    final int window;
    final int calibrationPeriods;
    final double fdr;
    final double bandLevel;
    final double ridge;
    final int draws;
    final long seed;
    /** Whether a unit's residual leaves the calibration set in a period in which it was flagged. */
    final boolean excludeFlagged;

    private RollingBaseline(int[] lagSet, double forgetting, int window, int calibrationPeriods, double fdr,
            double bandLevel, double ridge, int draws, long seed, boolean excludeFlagged) {
        this.lagSet = lagSet;
        this.lags = lagSet.length;
        this.longest = lagSet[lagSet.length - 1];
        this.forgetting = forgetting;
        this.window = window;
        this.calibrationPeriods = calibrationPeriods;
        this.fdr = fdr;
        this.bandLevel = bandLevel;
        this.ridge = ridge;
        this.draws = draws;
        this.seed = seed;
        this.excludeFlagged = excludeFlagged;
    }

    /** The defaults described above. */
    public static RollingBaseline withDefaults() {
        return new RollingBaseline(new int[] {1}, 1, 0, 4, 0.05, 0.95, 1e-8, 999, 1, false);
    }

    /** Number of previous periods L ≥ 1 whose densities predict the next: the lags 1..L (L ≤ 12). */
    public RollingBaseline withLags(int l) {
        if (l < 1 || l > 12) {
            throw new IllegalArgumentException("lags must be in [1, 12], got " + l);
        }
        int[] set = new int[l];
        for (int j = 0; j < l; j++) {
            set[j] = j + 1;
        }
        return new RollingBaseline(set, forgetting, window, calibrationPeriods, fdr, bandLevel, ridge,
                draws, seed, excludeFlagged);
    }

    /**
     * The lags whose densities predict the next period, in any order (see "Seasonal lags" above):
     * for weekly periods {@code withLagSet(52)} predicts a week from the same week a year earlier.
     * Replaces {@link #withLags}. The array is not modified.
     *
     * @param lags 1 to 12 distinct lags, each in [1, {@value #MAX_LAG}]
     * @throws IllegalArgumentException for no lags, more than 12, a repeated lag or one out of range
     */
    public RollingBaseline withLagSet(int... lags) {
        java.util.Objects.requireNonNull(lags, "lags");
        if (lags.length < 1 || lags.length > 12) {
            throw new IllegalArgumentException("a lag set needs 1 to 12 lags, got " + lags.length);
        }
        int[] set = lags.clone();
        java.util.Arrays.sort(set);
        for (int j = 0; j < set.length; j++) {
            if (set[j] < 1 || set[j] > MAX_LAG) {
                throw new IllegalArgumentException("lag " + set[j] + " is out of range; lags must be in [1, " + MAX_LAG
                        + "]");
            }
            if (j > 0 && set[j] == set[j - 1]) {
                throw new IllegalArgumentException("lag " + set[j] + " appears twice in the lag set "
                        + java.util.Arrays.toString(lags));
            }
        }
        return new RollingBaseline(set, forgetting, window, calibrationPeriods, fdr, bandLevel, ridge,
                draws, seed, excludeFlagged);
    }

    /**
     * Whether the residual of a unit flagged in a period is kept out of the calibration set when the
     * period is absorbed (default false: every unit's residual enters it). A change that lasts
     * (an early season, a trend) otherwise enters the calibration set with the flagged units' own
     * large residuals, which raises the conformal p-values of the units still changing and masks them
     * after a few periods; keeping flagged residuals out follows the common practice of leaving
     * past outbreaks out of a surveillance baseline. The units' densities still enter the
     * regression moments.
     */
    public RollingBaseline withFlaggedKeptOutOfCalibration(boolean exclude) {
        return new RollingBaseline(lagSet, forgetting, window, calibrationPeriods, fdr, bandLevel, ridge, draws, seed,
                exclude);
    }

    /** Forgetting factor φ ∈ (0, 1] (1: none); replaces a window. */
    public RollingBaseline withForgetting(double phi) {
        if (!(phi > 0 && phi <= 1)) {
            throw new IllegalArgumentException("forgetting factor must be in (0, 1], got " + phi);
        }
        return new RollingBaseline(lagSet, phi, 0, calibrationPeriods, fdr, bandLevel, ridge,
                draws, seed, excludeFlagged);
    }

    /** A moving window of the last w ≥ 1 periods' moments; replaces a forgetting factor. */
    public RollingBaseline withWindow(int w) {
        if (w < 1) {
            throw new IllegalArgumentException("window must be at least 1 period, got " + w);
        }
        return new RollingBaseline(lagSet, 1, w, calibrationPeriods, fdr, bandLevel, ridge,
                draws, seed, excludeFlagged);
    }

    /** Number C ≥ 1 of recent periods whose out-of-sample residuals calibrate the p-values. */
    public RollingBaseline withCalibrationPeriods(int c) {
        if (c < 1) {
            throw new IllegalArgumentException("calibration periods must be at least 1, got " + c);
        }
        return new RollingBaseline(lagSet, forgetting, window, c, fdr, bandLevel, ridge, draws, seed, excludeFlagged);
    }

    /** False discovery rate q ∈ (0, 1). */
    public RollingBaseline withFdr(double q) {
        if (!(q > 0 && q < 1)) {
            throw new IllegalArgumentException("FDR must be in (0, 1), got " + q);
        }
        return new RollingBaseline(lagSet, forgetting, window, calibrationPeriods, q, bandLevel, ridge,
                draws, seed, excludeFlagged);
    }

    /** Pointwise band level ∈ (0, 1) of the residual excursions. */
    public RollingBaseline withBandLevel(double level) {
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("band level must be in (0, 1), got " + level);
        }
        return new RollingBaseline(lagSet, forgetting, window, calibrationPeriods, fdr, level, ridge,
                draws, seed, excludeFlagged);
    }

    /** Relative ridge ρ ≥ 0 (finite). */
    public RollingBaseline withRidge(double rho) {
        if (!(rho >= 0) || Double.isInfinite(rho)) {
            throw new IllegalArgumentException("ridge must be finite and >= 0, got " + rho);
        }
        return new RollingBaseline(lagSet, forgetting, window, calibrationPeriods, fdr, bandLevel, rho,
                draws, seed, excludeFlagged);
    }

    /** Bootstrap draws (≥ 99) of the excess-count intervals and the seed of all random choices. */
    public RollingBaseline withDraws(int count, long randomSeed) {
        if (count < 99) {
            throw new IllegalArgumentException("at least 99 bootstrap draws are needed, got " + count);
        }
        return new RollingBaseline(lagSet, forgetting, window, calibrationPeriods, fdr, bandLevel, ridge, count,
                randomSeed, excludeFlagged);
    }

    /** Number of lagged densities among the regressors (L for {@link #withLags}(L)). */
    public int lags() {
        return lags;
    }

    /** The lags, ascending (a fresh copy; {1, …, L} for {@link #withLags}(L)). */
    public int[] lagSet() {
        return lagSet.clone();
    }

    /** The longest lag: how many past periods' densities the monitor keeps. */
    public int longestLag() {
        return longest;
    }

    /** Whether the lags are 1..L without gaps (what {@link #withLags} gives). */
    public boolean consecutiveLags() {
        return longest == lags;
    }

    /** Forgetting factor φ (1 with a window). */
    public double forgetting() {
        return forgetting;
    }

    /** Window in periods, 0 for none. */
    public int window() {
        return window;
    }

    /** Calibration periods C. */
    public int calibrationPeriods() {
        return calibrationPeriods;
    }

    /** FDR level. */
    public double fdr() {
        return fdr;
    }

    /** Pointwise band level. */
    public double bandLevel() {
        return bandLevel;
    }

    /** Relative ridge ρ. */
    public double ridge() {
        return ridge;
    }

    /** Bootstrap draws of the excess-count intervals. */
    public int draws() {
        return draws;
    }

    /** Seed of all random choices. */
    public long seed() {
        return seed;
    }

    /** Whether flagged units' residuals are kept out of the calibration set. */
    public boolean flaggedKeptOutOfCalibration() {
        return excludeFlagged;
    }

    /**
     * Fits the baseline on past periods, oldest first: the first L periods (L the longest lag) start the lags, the
     * following ones up to the last C are absorbed as training periods, and the last C periods are
     * absorbed one by one after their out-of-sample residuals have been computed, so that they form
     * the first calibration set. No alert history is kept for past periods.
     *
     * @param past at least L + C + 1 consecutive periods (L the longest lag) of the same units (increasing indices)
     * @throws IllegalArgumentException when there are too few periods or too few training rows for
     *                                  the coefficients, or the periods do not match (naming the period)
     */
    public BaselineMonitor fit(List<Period> past) {
        Objects.requireNonNull(past, "past");
        if (past.size() < longest + calibrationPeriods + 1) {
            throw new IllegalArgumentException("the baseline needs at least " + (longest + calibrationPeriods + 1)
                    + " past periods (" + longest + " to start the lags, 1 training and " + calibrationPeriods
                    + " calibration periods), got " + past.size());
        }
        return BaselineMonitor.fit(this, past);
    }

    @Override
    public String toString() {
        return "RollingBaseline[lags " + (consecutiveLags() ? String.valueOf(lags) : java.util.Arrays.toString(lagSet))
                + (window > 0 ? ", window " + window : ", forgetting " + forgetting)
                + ", calibration periods " + calibrationPeriods + ", FDR " + fdr + ", band level " + bandLevel
                + ", ridge " + ridge + ", draws " + draws + ", seed " + seed
                + (excludeFlagged ? ", flagged residuals kept out of calibration" : "") + "]";
    }
}
