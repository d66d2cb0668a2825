package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.PenalizedLikelihoodEstimator.EmptyEnds;

/**
 * Age densities from counts by single year of age with Densa's penalised-likelihood estimator
 * (multinomial likelihood of the 100 one-year bins, roughness penalty on the second derivative
 * of the clr) with one common smoothing parameter, so that small districts keep a smooth profile.
 */
final class AgeDensities {
    static final double[] EDGES = new double[AgeScenario.AGES + 1];

    static {
        for (int a = 0; a <= AgeScenario.AGES; a++) {
            EDGES[a] = a;
        }
    }

    private AgeDensities() {
    }

    static String describe() {
        return "Densa's penalised-likelihood estimator (multinomial likelihood of the 100 one-year bins, roughness "
                + "penalty on the second derivative of the clr) with one common smoothing parameter for all "
                + "district-seasons: the median of the per-unit marginal-likelihood choices (the estimator's default) of "
                + "the largest quarter of the districts in the first season, where the counts determine λ well. With a "
                + "common λ the penalty weighs relatively more for small districts, which then keep a smooth profile "
                + "instead of chasing single visits (a choice per unit from a few dozen counts can undersmooth and give "
                + "near-zero densities between them, whose log-ratios would dominate the B2 geometry)";
    }

    static String varianceSource() {
        return "the trace of the estimator's sandwich covariance";
    }

    /**
     * A common smoothing parameter: the median of the estimator's default per-unit choices
     * (marginal likelihood) over the largest quarter of the units. With one λ for all, the penalty weighs relatively more for
     * small units, which then borrow the smooth shape instead of chasing single events.
     */
    static double commonSmoothing(BayesSpace space, int[][] counts) {
        return commonSmoothing(space, EDGES, counts);
    }

    /** {@link #commonSmoothing(BayesSpace, int[][])} for counts over the given bin edges. */
    static double commonSmoothing(BayesSpace space, double[] edges, int[][] counts) {
        int n = counts.length;
        Integer[] order = new Integer[n];
        long[] totals = new long[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
            for (int c : counts[i]) {
                totals[i] += c;
            }
        }
        java.util.Arrays.sort(order, (a, b) -> Long.compare(totals[b], totals[a]));
        int top = Math.max(3, n / 4);
        int[][] big = new int[top][];
        for (int k = 0; k < top; k++) {
            big[k] = counts[order[k]];
        }
        BatchEstimate est = PenalizedLikelihoodEstimator.withDefaults(space).withEmptyEnds(EmptyEnds.COUNTED).fitAll(edges, big, null);
        double[] lambda = est.diagnostics().stream().mapToDouble(EstimationDiagnostics::smoothing).sorted().toArray();
        return lambda[lambda.length / 2];
    }

    static Estimates estimate(BayesSpace space, int[][] counts, String[] ids, double lambda) {
        BatchEstimate est = PenalizedLikelihoodEstimator.withDefaults(space).withEmptyEnds(EmptyEnds.COUNTED).withSmoothing(lambda)
                .fitAll(EDGES, counts, ids);
        return Estimates.of(est);
    }
}
