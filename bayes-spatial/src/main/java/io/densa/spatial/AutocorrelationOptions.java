package io.densa.spatial;

import java.util.Objects;

/**
 * Immutable options of the autocorrelation statistics ({@link MoranI}, {@link GearyC},
 * {@link LocalMoran}): number of random permutations and their seed, the island policy, and
 * whether the permutations may run in parallel.
 *
 * <p>Defaults ({@link #withDefaults()}): no permutations, islands are an error, parallel on.
 * Parallel and serial runs give bit-identical results: permutations are drawn in fixed blocks,
 * each with its own random generator seeded from (seed, block) (global statistics) or from
 * (seed, unit) (local statistics), and combined in order.
 */
public final class AutocorrelationOptions {
    private static final AutocorrelationOptions DEFAULTS =
            new AutocorrelationOptions(0, 0L, SpatialWeights.IslandPolicy.ERROR, true);

    private final int permutations;
    private final long seed;
    private final SpatialWeights.IslandPolicy islandPolicy;
    private final boolean parallel;

    private AutocorrelationOptions(int permutations, long seed, SpatialWeights.IslandPolicy islandPolicy,
            boolean parallel) {
        this.permutations = permutations;
        this.seed = seed;
        this.islandPolicy = islandPolicy;
        this.parallel = parallel;
    }

    /** No permutations, {@link SpatialWeights.IslandPolicy#ERROR}, parallel. */
    public static AutocorrelationOptions withDefaults() {
        return DEFAULTS;
    }

    /**
     * With a permutation test of {@code count} random permutations of the values (conditional
     * on the observed values), drawn from generators derived from {@code seed}.
     *
     * @param count number of permutations R, 0 (none) to 10,000,000; 999 or 9,999 are usual
     * @param seed  any value; equal seeds give equal results
     * @throws IllegalArgumentException if count is negative or too large
     */
    public AutocorrelationOptions withPermutations(int count, long seed) {
        if (!(count >= 0 && count <= 10_000_000)) {
            throw new IllegalArgumentException("permutation count " + count + " must be in 0..10000000");
        }
        return new AutocorrelationOptions(count, seed, islandPolicy, parallel);
    }

    /** With the given treatment of units without neighbours. */
    public AutocorrelationOptions withIslandPolicy(SpatialWeights.IslandPolicy policy) {
        return new AutocorrelationOptions(permutations, seed, Objects.requireNonNull(policy, "policy"), parallel);
    }

    /** Whether permutations may use the common ForkJoin pool (results do not depend on it). */
    public AutocorrelationOptions withParallel(boolean parallel) {
        return new AutocorrelationOptions(permutations, seed, islandPolicy, parallel);
    }

    /** Number of permutations (0 = no permutation test). */
    public int permutations() {
        return permutations;
    }

    /** Seed of the permutations. */
    public long seed() {
        return seed;
    }

    /** Island policy. */
    public SpatialWeights.IslandPolicy islandPolicy() {
        return islandPolicy;
    }

    /** Whether parallel execution is allowed. */
    public boolean parallel() {
        return parallel;
    }

    @Override
    public String toString() {
        return "AutocorrelationOptions[permutations=" + permutations + ", seed=" + seed + ", islands="
                + islandPolicy + ", parallel=" + parallel + "]";
    }
}
