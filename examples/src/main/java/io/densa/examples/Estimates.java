package io.densa.examples;

import io.densa.core.DensitySet;

/**
 * Densities estimated for a batch of units with what the report needs to say about them.
 *
 * @param densities    one density per unit
 * @param variances    B2 estimation variance per unit (trace of the coordinate covariance)
 * @param notConverged units whose fit did not converge
 * @param minEdf       smallest effective degrees of freedom (NaN if not reported)
 * @param maxEdf       largest effective degrees of freedom (NaN if not reported)
 */
record Estimates(DensitySet densities, double[] variances, int notConverged, double minEdf, double maxEdf) {
}
