package io.densa.spatial.autocorrelation;

import io.densa.core.ProgressListener;
import java.util.Objects;

/**
 * Immutable options of the autocorrelation statistics ({@link MoranI}, {@link GearyC},
 * {@link LocalMoran}): number of random permutations and their seed, the island policy, and
 * whether the permutations may run in parallel.
 *
 * <p>Defaults ({@link #withDefaults()}): no permutations, islands are an error, parallel on, no
 * progress reports ({@link ProgressListener#NONE}).
 * Parallel and serial runs give bit-identical results: permutations are drawn in fixed blocks,
 * each with its own random generator seeded from (seed, block) (global statistics) or from
 * (seed, unit) (local statistics), and combined in order.
 */
public final class AutocorrelationOptions {
    private static final AutocorrelationOptions DEFAULTS =
            new AutocorrelationOptions(0, 0L, IslandPolicy.ERROR, true, ProgressListener.NONE);

    private final int permutations;
    private final long seed;
    private final IslandPolicy islandPolicy;
    private final boolean parallel;
    private final ProgressListener progress;

    private AutocorrelationOptions(int permutations, long seed, IslandPolicy islandPolicy,
            boolean parallel, ProgressListener progress) {
        this.permutations = permutations;
        this.seed = seed;
        this.islandPolicy = islandPolicy;
        this.parallel = parallel;
        this.progress = progress;
    }

    /** No permutations, {@link IslandPolicy#ERROR}, parallel. */
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
        return new AutocorrelationOptions(count, seed, islandPolicy, parallel, progress);
    }

    /** With the given treatment of units without neighbours. */
    public AutocorrelationOptions withIslandPolicy(IslandPolicy policy) {
        return new AutocorrelationOptions(permutations, seed, Objects.requireNonNull(policy, "policy"), parallel,
                progress);
    }

    /** Whether permutations may use the common ForkJoin pool (results do not depend on it). */
    public AutocorrelationOptions withParallel(boolean parallel) {
        return new AutocorrelationOptions(permutations, seed, islandPolicy, parallel, progress);
    }

    /**
     * With a listener that receives the progress of the permutation tests: task
     * {@code "Moran's I permutations"}, {@code "Geary's c permutations"} or
     * {@code "Moran's I of densities permutations"} counted in permutations, and
     * {@code "local Moran's I permutations"} counted in units. Calls may come from worker threads
     * of the common pool, are serialised, and their count is non-decreasing and reaches the
     * total. The listener does not change any result.
     *
     * @param listener a thread-safe listener, or {@link ProgressListener#NONE}
     */
    public AutocorrelationOptions withProgressListener(ProgressListener listener) {
        return new AutocorrelationOptions(permutations, seed, islandPolicy, parallel,
                Objects.requireNonNull(listener, "listener"));
    }

    /** The progress listener ({@link ProgressListener#NONE} by default). */
    public ProgressListener progressListener() {
        return progress;
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
    public IslandPolicy islandPolicy() {
        return islandPolicy;
    }

    /** Whether parallel execution is allowed. */
    public boolean parallel() {
        return parallel;
    }

    @Override
    public String toString() {
        return "AutocorrelationOptions[permutations=" + permutations + ", seed=" + seed + ", islands="
                + islandPolicy + ", parallel=" + parallel + (progress == ProgressListener.NONE ? "" : ", with progress")
                + "]";
    }
}
