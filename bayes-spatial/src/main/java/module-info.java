/**
 * Densa spatial statistics: locations, neighbour index and spatial weights
 * ({@code io.densa.spatial}), variograms ({@code io.densa.spatial.variogram}), kriging
 * ({@code io.densa.spatial.kriging}), predictive uncertainty and model checks
 * ({@code io.densa.spatial.uncertainty}), spatial autocorrelation
 * ({@code io.densa.spatial.autocorrelation}) and the spatial scan statistic
 * ({@code io.densa.spatial.scan}). {@code io.densa.spatial.internal} is not exported.
 */
module io.densa.spatial {
    requires transitive io.densa.core;
    // Polygon and Geometry in public signatures (SpatialWeights.contiguity, Grid.withMask, Kriging.predictBlock)
    requires transitive org.locationtech.jts;
    // special functions and BOBYQA in variogram fitting (not in signatures)
    requires commons.math3;
    // the tests, patched into this module, use EJML decompositions as independent references
    requires ejml.ddense;

    exports io.densa.spatial;
    exports io.densa.spatial.variogram;
    exports io.densa.spatial.kriging;
    exports io.densa.spatial.uncertainty;
    exports io.densa.spatial.autocorrelation;
    exports io.densa.spatial.scan;
    exports io.densa.spatial.spacetime;
}
