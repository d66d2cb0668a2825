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
 * @param excess    excess counts with intervals per unit, or null when the period has no counts
 */
public record PeriodReport(int period, DensitySet expected, DensitySet residuals, AnomalyScoring.Report scores,
        ExcessCounts.Result excess) {
    /** Whether unit i is flagged. */
    public boolean flagged(int i) {
        return scores.units().get(i).flagged();
    }

    /** Overall excess of unit i (observed − expected events), NaN without counts. */
    public double overallExcess(int i) {
        return excess == null ? Double.NaN : excess.units().get(i).overall().excess();
    }

    @Override
    public String toString() {
        return "PeriodReport[period " + period + ", " + scores.units().size() + " units, " + scores.flaggedCount()
                + " flagged at FDR " + scores.fdr() + (excess != null ? ", with excess counts" : "") + "]";
    }
}
