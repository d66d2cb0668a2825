package io.densa.regression.surveillance;

import io.densa.core.DensitySet;

/**
 * What a monitor says about one period, before absorbing it.
 *
 * @param period    the period's index
 * @param expected  the baseline's predicted density per unit
 * @param residuals the (standardised) residual densities that were scored
 * @param scores    conformal p-values, Benjamini–Hochberg adjusted p-values and flags per unit,
 *                  against the monitor's rolling calibration set
 * @param excess    excess counts with intervals per unit (the bands of
 *                  {@link RollingBaseline#withExcessBands}, each unit's own total as the
 *                  denominator, the baseline's error of {@link #baselineError()}), or null when
 *                  the period has no counts
 * @param residualScales per unit, the modelled squared norm E‖r_i‖² = a x_i + b of its raw residual
 *                  (see {@link RollingBaseline}), or the trace of the calibration residuals'
 *                  covariance for every unit when the periods carry no estimation variances
 * @param residualShape K × K: the covariance of the calibration residuals, standardised as they are
 *                  for scoring (so that unit i's residual covariance is {@code residualScales[i]}
 *                  times it); the raw residuals' covariance over its trace without estimation
 *                  variances
 * @param baselineScales per unit, the part of {@code residualScales} that is the baseline's own
 *                  prediction error: a u_{i,t−1} + b, the variance line without the current
 *                  period's estimation variance (with no estimation variances, the same as
 *                  {@code residualScales}). Arrays of the report, not copied
 */
public record PeriodReport(int period, DensitySet expected, DensitySet residuals, AnomalyScoring.Report scores,
        ExcessCounts.Result excess, double[] residualScales, double[][] residualShape, double[] baselineScales) {
    /**
     * The covariance Σ_i = s_i S (K × K, a fresh array) of unit i's raw residual r_i = y_i ⊖ ŷ_i in a
     * period without change, from the rolling calibration set: the spread of the observed density
     * around the baseline's prediction that counting noise and the baseline's own error make
     * together (the calibration residuals are out of sample). Draws of the observed density with
     * this covariance ({@code EstimateUncertainty.summarise(observed, covariances, options)} in
     * bayes-spatial) give intervals for the change of any quantity read off the density relative to
     * the prediction — a shift of the median or of the timing of a season — that carry both. With
     * few calibration periods the covariance is rough (it is estimated from units × C residuals).
     */
    public double[][] residualCovariance(int i) {
        double s = residualScales[unit(i)];
        int k = residualShape.length;
        double[][] out = new double[k][k];
        for (int a = 0; a < k; a++) {
            for (int b = 0; b < k; b++) {
                out[a][b] = s * residualShape[a][b];
            }
        }
        return out;
    }

    /** Whether unit i is flagged. */
    public boolean flagged(int i) {
        return scores.units().get(unit(i)).flagged();
    }

    /**
     * The law of the baseline's own prediction error, unit i's coordinates off by N(0, s_i S) with
     * s_i = {@code baselineScales[i]} and S = {@code residualShape}: what {@link ExcessCounts}
     * draws for the baseline's uncertainty (the monitor's excess counts use it). The counting noise
     * of the current period is not in it; {@link #residualCovariance} holds both.
     */
    public ExcessCounts.BaselineError baselineError() {
        return ExcessCounts.BaselineError.scaled(residualShape, baselineScales);
    }

    /**
     * Events of unit i displaced between the excess bands (see {@link ExcessCounts.Displaced}), NaN
     * without counts.
     */
    public double displacedEvents(int i) {
        return excess == null ? Double.NaN : excess.units().get(unit(i)).displaced().value();
    }

    /** The unit index, checked against the report's units. */
    private int unit(int i) {
        int n = residualScales.length;
        if (i < 0 || i >= n) {
            throw new IllegalArgumentException("unit index " + i + " is out of range: accepted are 0.." + (n - 1) + " ("
                    + n + " units)");
        }
        return i;
    }

    @Override
    public String toString() {
        return "PeriodReport[period " + period + ", " + scores.units().size() + " units, " + scores.flaggedCount()
                + " flagged at FDR " + scores.fdr() + (excess != null ? ", with excess counts" : "") + "]";
    }
}
