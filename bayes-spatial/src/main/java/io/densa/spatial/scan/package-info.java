/**
 * Spatial scan statistics: the most likely cluster of raised counts among all circular zones of
 * units and its Monte Carlo p-value (Kulldorff (1997), A spatial scan statistic, Communications in
 * Statistics – Theory and Methods 26(6), 1481–1496).
 *
 * <h2>Semantics</h2>
 * {@link io.densa.spatial.scan.SpatialScan} takes the units' {@link io.densa.spatial.Locations}
 * (centroids), observed counts and expected counts (for example a baseline's expected events)
 * and returns a {@link io.densa.spatial.scan.SpatialScan.Result}: the zone with the largest
 * Poisson log-likelihood ratio, its members, observed, expected and excess counts, and the
 * p-value of the test of no cluster.
 *
 * <h2>Guarantees</h2>
 * Replicates draw from per-replicate streams of the seed, so parallel and serial runs give
 * bit-identical results. Bad input throws {@link java.lang.IllegalArgumentException} naming the
 * unit. Inputs are not modified; results are immutable.
 */
package io.densa.spatial.scan;
