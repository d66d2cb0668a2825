package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;

/**
 * Densities from samples with Densa's penalised-likelihood estimator: roughness penalty on the
 * third derivative of the clr and one common smoothing parameter (the median of the per-monitor marginal-likelihood choices).
 */
final class SampleDensities {
    private SampleDensities() {
    }

    static String describe() {
        return "Densa's penalised-likelihood estimator with a roughness penalty on the third derivative of the clr "
                + "(whose null space holds the normal densities, a natural default for log concentrations) and one "
                + "common smoothing parameter, the median of the per-monitor marginal-likelihood choices (the estimator's default)";
    }

    static Estimates estimate(BayesSpace space, double[][] values, String[] ids) {
        // Tolerance 1e-10 instead of the default 1e-12: with this penalty a few fits stall at Newton
        // decrements near 1e-9 (rounding level for a log-likelihood of a few hundred) and would be
        // reported as not converged although the estimate no longer moves.
        PenalizedLikelihoodEstimator base = PenalizedLikelihoodEstimator.withDefaults(space).withPenaltyOrder(3)
                .withTolerance(1e-10);
        BatchEstimate first = base.fitAllSamples(values, null, ids);
        double[] lambda = first.diagnostics().stream().mapToDouble(EstimationDiagnostics::smoothing).sorted()
                .toArray();
        BatchEstimate est = base.withSmoothing(lambda[lambda.length / 2]).fitAllSamples(values, null, ids);
        return Estimates.of(est);
    }
}
