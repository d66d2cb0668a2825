package io.densa.spatial.variogram;

import io.densa.core.NumericalDiagnostics;

/**
 * Diagnostics attached to a {@link io.densa.core.DensaException} when a variogram fit's criterion
 * is not finite: the parameters at which it failed (the starting values, or the end point of the
 * optimiser).
 *
 * @param family      the family being fitted
 * @param partialSill the partial sill at the failure
 * @param range       the range parameter (the exponent for the power model) at the failure
 * @param nugget      the nugget at the failure (0 when no nugget is fitted)
 */
public record VariogramFitDiagnostics(VariogramModel.Family family, double partialSill, double range, double nugget)
        implements NumericalDiagnostics {
}
