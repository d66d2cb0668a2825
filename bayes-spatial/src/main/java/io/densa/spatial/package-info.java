/**
 * Spatial statistics of densities: this package holds what every spatial method shares —
 * locations and distances, the neighbour index and spatial weights. Variograms are in
 * {@link io.densa.spatial.variogram}, kriging in {@link io.densa.spatial.kriging}, spatial
 * autocorrelation in {@link io.densa.spatial.autocorrelation}.
 *
 * <h2>Semantics</h2>
 * Locations are planar or geographic ({@link io.densa.spatial.Locations}): planar distances are
 * Euclidean and never overflow or underflow for finite coordinates; geographic distances are
 * great-circle km on a sphere of the mean Earth radius. Neighbour queries go through a JTS STRtree
 * ({@link io.densa.spatial.NeighbourIndex}). {@link io.densa.spatial.SpatialWeights} are sparse,
 * non-negative and finite weights between n units (k nearest neighbours, distance bands, inverse
 * distance, polygon contiguity, or given), with their Cliff–Ord constants S0, S1, S2; a unit
 * without neighbours is an island, which the statistics handle by an
 * {@link io.densa.spatial.autocorrelation.IslandPolicy}.
 *
 * <h2>Guarantees</h2>
 * Value types are immutable and thread-safe; no argument is modified. Bad input throws
 * {@link java.lang.IllegalArgumentException} naming the location, unit or index. The packages
 * depend one way: autocorrelation on this package; kriging on variograms and this package;
 * variograms on this package.
 */
package io.densa.spatial;
