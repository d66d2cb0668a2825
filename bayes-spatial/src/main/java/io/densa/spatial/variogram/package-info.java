/**
 * Trace-variograms of densities: the empirical variogram, variogram models and their fitting.
 *
 * <h2>Semantics</h2>
 * The trace-semivariogram γ(h) = ½ E‖X(s) ⊖ X(s+h)‖²_B is computed from distances between the
 * coordinate rows of a {@link io.densa.core.DensitySet}
 * ({@link io.densa.spatial.variogram.EmpiricalVariogram#of} with
 * {@link io.densa.spatial.variogram.VariogramOptions}: bins, maximum lag, direction sectors,
 * cloud; sparse bins are merged, so none is empty). {@link io.densa.spatial.variogram.VariogramFitting#fit}
 * with {@link io.densa.spatial.variogram.VariogramFitOptions} gives a
 * {@link io.densa.spatial.variogram.VariogramFit} holding a
 * {@link io.densa.spatial.variogram.VariogramModel} (nested structures; exponential, Gaussian and
 * Matérn ranges are practical ranges: correlation e^{−3} there) and the fit's warnings (a range beyond the
 * largest lag, a parameter on a bound, ...).
 *
 * <h2>Guarantees</h2>
 * Results are immutable records with arrays copied in and out. Parallel binning runs in fixed
 * blocks combined in order, so results are bit-identical to the serial path. Bad input throws
 * {@link java.lang.IllegalArgumentException}; finite input gives finite output (squared B2
 * distances are scaled where they would over- or underflow); no Commons Math exception escapes.
 */
package io.densa.spatial.variogram;
