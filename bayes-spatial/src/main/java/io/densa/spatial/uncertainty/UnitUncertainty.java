package io.densa.spatial.uncertainty;

import java.util.List;

/**
 * Monte Carlo summaries of the quantities derived from one estimated density
 * ({@link EstimateUncertainty#summarise}).
 *
 * @param id          the unit's identifier (as in the estimate's diagnostics)
 * @param quantiles   one summary per quantile probability, in the order of
 *                    {@link UncertaintyOptions#quantiles()} (in data units when set)
 * @param exceedances one summary of P(X &gt; t) per threshold, in the order of
 *                    {@link UncertaintyOptions#exceedances()}
 * @param mean        the summary of E[u(X)], or null when not requested
 * @param exactDraws  draws (of n + 1, the plug-in included) evaluated by the exact methods because
 *                    the node rule's error bound exceeded its tolerance on the rule and on its
 *                    two refinements
 */
public record UnitUncertainty(String id, List<DerivedInterval> quantiles, List<DerivedInterval> exceedances,
        DerivedInterval mean, int exactDraws) {

    /** Copies the lists into unmodifiable lists. */
    public UnitUncertainty {
        quantiles = List.copyOf(quantiles);
        exceedances = List.copyOf(exceedances);
    }
}
