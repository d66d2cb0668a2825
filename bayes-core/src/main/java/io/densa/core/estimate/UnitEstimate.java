package io.densa.core.estimate;

import io.densa.core.Density;

/**
 * One estimated density with its diagnostics.
 *
 * @param density     the estimate
 * @param diagnostics how it was obtained and how precise it is
 */
public record UnitEstimate(Density density, EstimationDiagnostics diagnostics) {
}
