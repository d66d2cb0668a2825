/**
 * Spatial statistics of densities: locations and distances, trace-variograms, variogram models
 * and fitting, kriging of densities, cross-validation, grid and block prediction.
 *
 * <h2>Semantics</h2>
 * Everything works on the coordinates of a {@link io.densa.core.DensitySet}: the
 * trace-semivariogram γ(h) = ½ E‖X(s) ⊖ X(s+h)‖²_B is computed from coordinate distances
 * ({@link io.densa.spatial.EmpiricalVariogram}), and a kriged density ⊕_i λ_i ⊙ X(s_i) is the
 * weighted sum of coordinate rows, so predictions are in the data's space
 * ({@link io.densa.spatial.Kriging}). Locations are planar or geographic
 * ({@link io.densa.spatial.Locations}); neighbour queries go through a JTS STRtree
 * ({@link io.densa.spatial.NeighbourIndex}).
 *
 * <h2>Workflow</h2>
 * <ol>
 * <li>{@link io.densa.spatial.EmpiricalVariogram#of} with {@link io.densa.spatial.VariogramOptions}
 *     (bins, maximum lag, direction sectors, cloud; sparse bins are merged, so none is empty);</li>
 * <li>{@link io.densa.spatial.VariogramFitting#fit} with {@link io.densa.spatial.VariogramFitOptions}
 *     gives a {@link io.densa.spatial.VariogramFit} holding a {@link io.densa.spatial.VariogramModel}
 *     (exponential and Gaussian ranges are practical ranges; Matérn uses a scale) and the
 *     fit's warnings (a range beyond the largest lag, a parameter on a bound, ...);</li>
 * <li>{@link io.densa.spatial.Kriging#ordinary}, {@link io.densa.spatial.Kriging#simple} or
 *     {@link io.densa.spatial.Kriging#universal} (or {@link io.densa.spatial.UniversalFit#estimate}
 *     with the residual variogram iterated) with {@link io.densa.spatial.KrigingOptions}
 *     (neighbourhood, measurement-error variances);</li>
 * <li>{@link io.densa.spatial.Kriging#predict}, {@link io.densa.spatial.Kriging#predictBlock},
 *     {@link io.densa.spatial.Kriging#predictGrid} (tiles streamed to a consumer; with a
 *     {@link io.densa.spatial.CovariateGrid} for an external drift) and
 *     {@link io.densa.spatial.Kriging#crossValidate};</li>
 * <li>uncertainty in the data's units: {@link io.densa.spatial.PredictiveDistribution} gives the
 *     Gaussian law of the coordinates at a location (proportional covariance model) and seeded
 *     Monte Carlo intervals of quantiles, exceedance probabilities and means at locations or per
 *     grid cell ({@link io.densa.spatial.UncertaintyOptions}); model checks:
 *     {@link io.densa.spatial.ProportionalityCheck} and {@link io.densa.spatial.AnisotropyTest}.</li>
 * </ol>
 *
 * <h2>Guarantees</h2>
 * Value and model types are immutable and thread-safe. Parallel work uses the common ForkJoin pool
 * in fixed blocks combined in order, so results are bit-identical to the serial path. Bad input
 * throws {@link java.lang.IllegalArgumentException} naming the location, bin or index; a singular
 * or ill-conditioned kriging system, or weights that miss the unbiasedness constraints (far
 * outside the data), throws {@link io.densa.core.DensaException} with a
 * {@link io.densa.spatial.KrigingDiagnostics} record. No Commons Math exception escapes, and finite
 * input gives finite output: distances, squared B2 distances and autocorrelation sums are scaled
 * where they would over- or underflow. Every prediction reports its distance to the nearest data
 * location, so that extrapolation can be told apart.
 */
package io.densa.spatial;
