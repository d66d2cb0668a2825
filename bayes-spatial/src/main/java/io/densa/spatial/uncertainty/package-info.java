/**
 * Uncertainty of kriged and of estimated densities in the data's units, and checks of the model
 * behind it.
 *
 * <h2>Semantics</h2>
 * {@link io.densa.spatial.uncertainty.PredictiveDistribution} gives the Gaussian law of the
 * coordinates of a kriged density at a location under the proportional covariance model
 * (covariance = kriging variance × Σ/tr Σ, {@link io.densa.spatial.uncertainty.CoordinateLaw}) and
 * seeded Monte Carlo summaries of quantiles, exceedance probabilities and means at locations
 * ({@link io.densa.spatial.uncertainty.LocationUncertainty}) or per grid cell in the tile stream
 * ({@link io.densa.spatial.uncertainty.UncertaintyTile}, {@link io.densa.spatial.uncertainty.IntervalLayer}),
 * configured by {@link io.densa.spatial.uncertainty.UncertaintyOptions}. The same summaries for
 * densities estimated from counts or samples, from each estimate's reported covariance:
 * {@link io.densa.spatial.uncertainty.EstimateUncertainty} ({@link
 * io.densa.spatial.uncertainty.UnitUncertainty}). Checks of the model:
 * {@link io.densa.spatial.uncertainty.ProportionalityCheck} (principal-direction variograms against
 * the trace-variogram) and {@link io.densa.spatial.uncertainty.AnisotropyTest} (directional
 * trace-variogram levels), both with Monte Carlo p-values from fields simulated under the model.
 *
 * <h2>Dependencies</h2>
 * This package builds on {@code io.densa.spatial.kriging} (a fitted
 * {@link io.densa.spatial.kriging.Kriging}, its public grid stream and
 * {@link io.densa.spatial.kriging.FieldSimulator}) and {@code io.densa.spatial.variogram}; nothing
 * in those packages depends on it.
 *
 * <h2>Guarantees</h2>
 * Every random result takes a seed and uses one stream per location or grid cell, so results do
 * not depend on threads or tiling. Results are immutable records; bad input throws
 * {@link java.lang.IllegalArgumentException}.
 */
package io.densa.spatial.uncertainty;
