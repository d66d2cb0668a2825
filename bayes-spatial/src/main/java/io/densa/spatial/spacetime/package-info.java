/**
 * Space–time geostatistics of densities observed at (location, time) pairs: the empirical
 * space–time trace-variogram, separable, product-sum and Gneiting-class models with weighted
 * least-squares fitting, and ordinary space–time kriging with leave-one-out cross-validation.
 *
 * <h2>Semantics</h2>
 * {@link io.densa.spatial.spacetime.SpaceTimeData} holds one density per observation, with its
 * location and a real time (for example a period index); lags are the locations' distance h and
 * |t_i − t_j| = u. {@link io.densa.spatial.spacetime.SpaceTimeVariogram#of} bins the pairs into
 * spatial × temporal {@link io.densa.spatial.spacetime.LagBins} (class 0 on each axis is lag exactly
 * 0) and gives γ̂(h, u) = ½ mean ‖X_i ⊖ X_j‖²_B with pair counts, from the clr coordinates in the
 * space's orthonormal basis. {@link io.densa.spatial.spacetime.SpaceTimeModel} is a stationary
 * trace-covariance C(h, u) with a space–time nugget; marginal structures are
 * {@link io.densa.spatial.variogram.VariogramModel}s, so ranges are practical ranges.
 * {@link io.densa.spatial.spacetime.SpaceTimeFitting#fit} fits one family by Cressie's weighted
 * (or ordinary) least squares within bounds and names the parameters that ended on a bound
 * ({@link io.densa.spatial.spacetime.SpaceTimeFit}).
 * {@link io.densa.spatial.spacetime.SpaceTimeKriging} predicts a density at any location and time
 * (a missing period of a unit, the next period at a location) with its trace kriging variance, and
 * cross-validates by leaving one observation out.
 *
 * <h2>Guarantees</h2>
 * Values and results are immutable, with arrays copied in and out; no input is modified. Bad input
 * throws {@link java.lang.IllegalArgumentException} naming the row, class or parameter; a
 * covariance matrix that is not positive definite, or a criterion that is nowhere finite, throws
 * {@link io.densa.core.DensaException} with {@link io.densa.spatial.spacetime.SpaceTimeDiagnostics};
 * no Commons Math exception escapes.
 */
package io.densa.spatial.spacetime;
