package io.densa.examples;

import io.densa.core.BatchEstimate;
import io.densa.core.DensitySet;
import io.densa.core.EstimationDiagnostics;

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

    /** Summarises a batch from the estimator. */
    static Estimates of(BatchEstimate est) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (EstimationDiagnostics d : est.diagnostics()) {
            lo = Math.min(lo, d.effectiveDegreesOfFreedom());
            hi = Math.max(hi, d.effectiveDegreesOfFreedom());
        }
        return new Estimates(est.densities(), est.estimationVariances(), est.flaggedRows().size(), lo, hi);
    }
}
