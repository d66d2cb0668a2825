package io.densa.spatial.autocorrelation;

/**
 * What a statistic does with islands, units without neighbours in the spatial weights
 * ({@link io.densa.spatial.SpatialWeights#islands()}); set by
 * {@link AutocorrelationOptions#withIslandPolicy}.
 */
public enum IslandPolicy {
    /** Throw an {@link IllegalArgumentException} naming the islands (the default). */
    ERROR,
    /**
     * Remove the islands (their rows and columns, and their values) and analyse the other
     * units; results report which units were excluded.
     */
    EXCLUDE
}
