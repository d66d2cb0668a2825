/**
 * Spatial autocorrelation: global Moran's I (of values and of densities), Geary's c and local
 * Moran's I, with moments under normality and randomisation and permutation tests.
 *
 * <h2>Semantics</h2>
 * Each statistic takes {@link io.densa.spatial.SpatialWeights} and one value (or density) per
 * unit; {@link io.densa.spatial.autocorrelation.AutocorrelationOptions} set the permutations and
 * their seed, the {@link io.densa.spatial.autocorrelation.IslandPolicy} and parallelism. Results
 * are records with the statistic, its {@link io.densa.spatial.autocorrelation.AutocorrelationMoments}
 * and, when permutations were asked for, an
 * {@link io.densa.spatial.autocorrelation.AutocorrelationPermutation} summary.
 *
 * <h2>Guarantees</h2>
 * Permutations draw from per-unit or per-block streams of the seed, so parallel and serial runs
 * give bit-identical results. Bad input throws {@link java.lang.IllegalArgumentException} naming
 * the unit; a degenerate null variance throws {@link io.densa.core.DensaException}. Finite input
 * gives finite output: the global statistics compute on weights and values scaled by powers of
 * two where sums would over- or underflow.
 */
package io.densa.spatial.autocorrelation;
