package io.densa.spatial.uncertainty;

import java.util.List;

/**
 * Predictive law and Monte Carlo summaries at one location ({@link PredictiveDistribution#summarise}).
 *
 * @param law         the Gaussian law of the coordinates there
 * @param quantiles   one summary per quantile probability, in the order of
 *                    {@link UncertaintyOptions#quantiles()} (in data units when set)
 * @param exceedances one summary of P(X &gt; t) per threshold, in the order of
 *                    {@link UncertaintyOptions#exceedances()}
 * @param mean        the summary of E[u(X)], or null when not requested
 * @param exactDraws  draws (of n + 1, the plug-in included) evaluated by the exact methods because
 *                    the node rule's error bound exceeded its tolerance on the rule and on its
 *                    two refinements (all of them with
 *                    {@link UncertaintyOptions.Evaluation#EXACT})
 */
public record LocationUncertainty(CoordinateLaw law, List<DerivedInterval> quantiles,
        List<DerivedInterval> exceedances, DerivedInterval mean, int exactDraws) {

    /** Copies the lists into unmodifiable lists. */
    public LocationUncertainty {
        quantiles = List.copyOf(quantiles);
        exceedances = List.copyOf(exceedances);
    }
}
