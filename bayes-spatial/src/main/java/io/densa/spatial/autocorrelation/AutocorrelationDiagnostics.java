package io.densa.spatial.autocorrelation;

import io.densa.core.NumericalDiagnostics;

/**
 * Diagnostics attached to a {@link io.densa.core.DensaException} when the null distribution of an
 * autocorrelation statistic is degenerate: its variance under the null hypothesis is not positive
 * (relative to the squared expectation) or not finite, so no normal-approximation test exists.
 *
 * @param statistic  the statistic, for example "Moran's I"
 * @param assumption the null hypothesis, "normality" or "randomisation"
 * @param variance   the variance of the statistic under that null
 * @param units      the number of units analysed
 */
public record AutocorrelationDiagnostics(String statistic, String assumption, double variance, int units)
        implements NumericalDiagnostics {
}
