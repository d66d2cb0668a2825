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
 * (1995) adjustment within the period (see {@link AnomalyScoring}).
 *
 * <h2>Excess counts</h2>
 * Periods with counts also get excess counts ({@link ExcessCounts}, with each unit's own total as
 * the denominator): per band (by default one band per count bin; {@link #withExcessBands} groups
 * bins, e.g. into age groups or months) the observed minus the expected events, and the events
 * displaced between bands, with parametric-bootstrap intervals and a p-value against the null of no
 * change. Both carry the counting noise and the baseline's own error: unit i's prediction error is
 * taken as N(0, s_i S) in coordinates, with S the shape of the calibration residuals and
 * s_i = a u_{i,t−1} + b the part of the variance line that is not the current period's counting
 * noise (a u_{i,t}); without estimation variances, the calibration residuals' covariance for every
 * unit, which also holds the current period's counting noise. The p-values are then valid but on
 * the cautious side (measured on invented panels: 3–6 % of unit-periods without change at p ≤ 0.1;
 * against counting noise alone 27 %). See {@link PeriodReport#baselineError()}.
 *
 * <h2>Seasonal lags</h2>
 * The lags need not be 1..L: {@link #withLagSet} takes any set of up to 12 lags, each at most
 * {@value #MAX_LAG} periods, for example {52} for weekly periods predicted from the same week a year
 * earlier, or {1, 52}. The regressors are then z = (1, y_{t−l_1}, …, y_{t−l_m}, u) for the lags
 * l_1 &lt; … &lt; l_m of the set, so d = 1 + m K + q, and the monitor keeps the densities of the last
 * l_m periods to form them (the first l_m past periods only start the lags).
 *
 * <h2>Estimating the periods</h2>
 * Estimate every period's densities with the same estimator settings, and for event counts with
 * an explicit reading of empty end bins ({@code withEmptyEnds(EmptyEnds.COUNTED)} on the
 * penalised-likelihood estimator): its default censors the empty ends of units with at least 10
 * events per bin only, so a unit that crosses that line between periods would change reading, and
 * its estimate would move by a sizeable fraction of its standard error (0.4–0.8 on average on
 * invented age profiles of 180–220 events) with nothing changed in the data.
 *
 * <p>Defaults: 1 lag, no forgetting (φ = 1, every period weighs the same), 4 calibration periods,
 * FDR 0.05, 95 % pointwise bands, ridge 10⁻⁸, 999 bootstrap draws, seed 1, one excess band per count
 * bin. Immutable.
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

    /**
     * The bands of the excess counts (strictly increasing edges, each one of every period's bin
     * edges), or null for one band per count bin.
     */
    final double[] excessBands;

    private RollingBaseline(Draft d) {
        this.lagSet = d.lagSet;
        this.lags = lagSet.length;
        this.longest = lagSet[lagSet.length - 1];
        this.forgetting = d.forgetting;
        this.window = d.window;
        this.calibrationPeriods = d.calibrationPeriods;
        this.fdr = d.fdr;
        this.bandLevel = d.bandLevel;
        this.ridge = d.ridge;
        this.draws = d.draws;
        this.seed = d.seed;
        this.excludeFlagged = d.excludeFlagged;
        this.excessBands = d.excessBands;
    }

    /** The settings while a with-method changes one of them. */
    private static final class Draft {
        int[] lagSet = {1};
        double forgetting = 1;
        int window;
        int calibrationPeriods = 4;
        double fdr = 0.05;
        double bandLevel = 0.95;
        double ridge = 1e-8;
        int draws = 999;
        long seed = 1;
        boolean excludeFlagged;
        double[] excessBands;
    }

    /** A copy of this configuration with one change. */
    private RollingBaseline with(java.util.function.Consumer<Draft> change) {
        Draft d = new Draft();
        d.lagSet = lagSet;
        d.forgetting = forgetting;
        d.window = window;
        d.calibrationPeriods = calibrationPeriods;
        d.fdr = fdr;
        d.bandLevel = bandLevel;
        d.ridge = ridge;
        d.draws = draws;
        d.seed = seed;
        d.excludeFlagged = excludeFlagged;
        d.excessBands = excessBands;
        change.accept(d);
        return new RollingBaseline(d);
    }

    /** The defaults described above. */
    public static RollingBaseline withDefaults() {
        return new RollingBaseline(new Draft());
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
        return with(d -> d.lagSet = set);
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
        return with(d -> d.lagSet = set);
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
        return with(d -> d.excludeFlagged = exclude);
    }

    /** Forgetting factor φ ∈ (0, 1] (1: none); replaces a window. */
    public RollingBaseline withForgetting(double phi) {
        if (!(phi > 0 && phi <= 1)) {
            throw new IllegalArgumentException("forgetting factor must be in (0, 1], got " + phi);
        }
        return with(d -> {
            d.forgetting = phi;
            d.window = 0;
        });
    }

    /** A moving window of the last w ≥ 1 periods' moments; replaces a forgetting factor. */
    public RollingBaseline withWindow(int w) {
        if (w < 1) {
            throw new IllegalArgumentException("window must be at least 1 period, got " + w);
        }
        return with(d -> {
            d.forgetting = 1;
            d.window = w;
        });
    }

    /** Number C ≥ 1 of recent periods whose out-of-sample residuals calibrate the p-values. */
    public RollingBaseline withCalibrationPeriods(int c) {
        if (c < 1) {
            throw new IllegalArgumentException("calibration periods must be at least 1, got " + c);
        }
        return with(d -> d.calibrationPeriods = c);
    }

    /** False discovery rate q ∈ (0, 1). */
    public RollingBaseline withFdr(double q) {
        if (!(q > 0 && q < 1)) {
            throw new IllegalArgumentException("FDR must be in (0, 1), got " + q);
        }
        return with(d -> d.fdr = q);
    }

    /** Pointwise band level ∈ (0, 1) of the residual excursions. */
    public RollingBaseline withBandLevel(double level) {
        if (!(level > 0 && level < 1)) {
            throw new IllegalArgumentException("band level must be in (0, 1), got " + level);
        }
        return with(d -> d.bandLevel = level);
    }

    /** Relative ridge ρ ≥ 0 (finite). */
    public RollingBaseline withRidge(double rho) {
        if (!(rho >= 0) || Double.isInfinite(rho)) {
            throw new IllegalArgumentException("ridge must be finite and >= 0, got " + rho);
        }
        return with(d -> d.ridge = rho);
    }

    /** Bootstrap draws (≥ 99) of the excess-count intervals and the seed of all random choices. */
    public RollingBaseline withDraws(int count, long randomSeed) {
        if (count < 99) {
            throw new IllegalArgumentException("at least 99 bootstrap draws are needed, got " + count);
        }
        return with(d -> {
            d.draws = count;
            d.seed = randomSeed;
        });
    }

    /**
     * The bands of the excess counts: strictly increasing edges, each one of the periods' bin edges,
     * the first and the last equal to the first and the last bin edge (checked when a period with
     * counts is scored). With no edges (the default), each count bin is a band. Coarser bands (age
     * groups, months) give excess counts that are easier to read and cost less: the bootstrap
     * integrates every band in each of its draws. The array is copied.
     *
     * @throws IllegalArgumentException for fewer than two edges, or edges that are not finite and
     *                                  strictly increasing
     */
    public RollingBaseline withExcessBands(double... edges) {
        Objects.requireNonNull(edges, "edges");
        double[] e = edges.clone();
        if (e.length == 0) {
            return with(d -> d.excessBands = null);
        }
        if (e.length < 2) {
            throw new IllegalArgumentException("excess bands need at least 2 edges, got " + e.length);
        }
        for (int j = 0; j < e.length; j++) {
            if (!Double.isFinite(e[j]) || (j > 0 && !(e[j] > e[j - 1]))) {
                throw new IllegalArgumentException("excess band edges must be finite and strictly increasing; edge " + j
                        + " is " + e[j] + (j > 0 ? " after " + e[j - 1] : ""));
            }
        }
        return with(d -> d.excessBands = e);
    }

    /**
     * The excess bands for a period's bin edges: the configured ones (each must be one of the bin
     * edges, the first and last the layout's ends) or the bin edges themselves.
     *
     * @throws IllegalArgumentException naming the period and the band edge that does not fit
     */
    double[] excessBandsFor(double[] binEdges, int period) {
        if (excessBands == null) {
            return binEdges;
        }
        double tol = 1e-9 * (binEdges[binEdges.length - 1] - binEdges[0]);
        for (int t = 0; t < excessBands.length; t++) {
            boolean found = false;
            for (double e : binEdges) {
                found |= Math.abs(e - excessBands[t]) <= tol;
            }
            boolean end = t == 0 || t == excessBands.length - 1;
            double want = t == 0 ? binEdges[0] : binEdges[binEdges.length - 1];
            if (!found || (end && Math.abs(excessBands[t] - want) > tol)) {
                throw new IllegalArgumentException("period " + period + ": excess band edge " + excessBands[t]
                        + " (withExcessBands) " + (found ? "must be the layout's " + (t == 0 ? "first" : "last")
                        + " bin edge " + want : "is not one of the period's bin edges "
                        + java.util.Arrays.toString(binEdges)));
            }
        }
        return excessBands;
    }

    /** The bands of the excess counts (a fresh copy), or null for one band per count bin. */
    public double[] excessBands() {
        return excessBands == null ? null : excessBands.clone();
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
                + (excludeFlagged ? ", flagged residuals kept out of calibration" : "")
                + (excessBands != null ? ", excess bands " + java.util.Arrays.toString(excessBands) : "") + "]";
    }
}
