package io.densa.examples;

import io.densa.core.DensitySet;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;

/**
 * Densities estimated for a batch of units with what the report needs to say about them.
 *
 * @param densities           one density per unit
 * @param variances           B2 estimation variance per unit (trace of the coordinate covariance)
 * @param notConverged        units whose fit did not converge
 * @param minEdf              smallest effective degrees of freedom (NaN if not reported)
 * @param maxEdf              largest effective degrees of freedom (NaN if not reported)
 * @param problems            "id: reason" for every unit that did not converge
 * @param extrapolationShares per unit, the share of its squared B2 norm set by extrapolation
 *                            ({@link EstimationDiagnostics#extrapolationShare()})
 * @param extrapolated        ids of the units whose estimate is carried by extrapolation
 *                            ({@link EstimationDiagnostics#extrapolated()})
 * @param batch               the estimator's result itself (for intervals of derived quantities)
 */
record Estimates(DensitySet densities, double[] variances, int notConverged, double minEdf, double maxEdf,
        java.util.List<String> problems, double[] extrapolationShares, java.util.List<String> extrapolated,
        BatchEstimate batch) {

    /** Summarises a batch from the estimator. */
    static Estimates of(BatchEstimate est) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        java.util.List<String> problems = new java.util.ArrayList<>();
        for (EstimationDiagnostics d : est.diagnostics()) {
            lo = Math.min(lo, d.effectiveDegreesOfFreedom());
            hi = Math.max(hi, d.effectiveDegreesOfFreedom());
            if (!d.converged()) {
                problems.add(d.id() + ": " + d.reason());
            }
        }
        return new Estimates(est.densities(), est.estimationVariances(), est.flaggedRows().size(), lo, hi,
                java.util.List.copyOf(problems), est.extrapolationShares(), est.extrapolatedIds(), est);
    }
}
