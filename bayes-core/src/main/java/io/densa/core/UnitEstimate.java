package io.densa.core;

/**
 * One estimated density with its diagnostics.
 *
 * @param density     the estimate
 * @param diagnostics how it was obtained and how precise it is
 */
public record UnitEstimate(Density density, EstimationDiagnostics diagnostics) {
}
