/**
 * Kriging of densities: ordinary, simple and universal kriging, predictions at points, blocks
 * and grids, cross-validation.
 *
 * <h2>Semantics</h2>
 * A kriged density ⊕_i λ_i ⊙ X(s_i) is the weighted sum of coordinate rows, so predictions are in
 * the data's space. {@link io.densa.spatial.kriging.Kriging#ordinary},
 * {@link io.densa.spatial.kriging.Kriging#simple} and {@link io.densa.spatial.kriging.Kriging#universal}
 * (or {@link io.densa.spatial.kriging.UniversalFit#estimate}, with the residual variogram
 * iterated) take a {@link io.densa.spatial.variogram.VariogramModel} and
 * {@link io.densa.spatial.kriging.KrigingOptions} (neighbourhood, measurement-error variances);
 * then {@link io.densa.spatial.kriging.Kriging#predict},
 * {@link io.densa.spatial.kriging.Kriging#predictBlock},
 * {@link io.densa.spatial.kriging.Kriging#predictGrid} (tiles streamed to a consumer; with a
 * {@link io.densa.spatial.kriging.CovariateGrid} for an external drift) and
 * {@link io.densa.spatial.kriging.Kriging#crossValidate}.
 *
 * <p>Uncertainty in the data's units (predictive distributions, Monte Carlo intervals) and the
 * checks of the proportional covariance model live in {@code io.densa.spatial.uncertainty}, which
 * builds on this package; {@link io.densa.spatial.kriging.FieldSimulator} (fields simulated under
 * a kriging's model) and {@link io.densa.spatial.kriging.GridTiles#map} (per-tile work on the grid
 * stream) are the two entry points it uses.
 *
 * <h2>Guarantees</h2>
 * A prepared {@link io.densa.spatial.kriging.Kriging} is immutable and thread-safe; results are
 * immutable records. Parallel grid prediction uses the common ForkJoin pool in fixed blocks
 * combined in order, so results are bit-identical to the serial path. Bad input throws
 * {@link java.lang.IllegalArgumentException} naming the location or index; a singular or
 * ill-conditioned kriging system, or weights that miss the unbiasedness constraints (far outside
 * the data), throws {@link io.densa.core.DensaException} with a
 * {@link io.densa.spatial.kriging.KrigingDiagnostics} record. Every prediction reports its
 * distance to the nearest data location, so that extrapolation can be told apart.
 */
package io.densa.spatial.kriging;
