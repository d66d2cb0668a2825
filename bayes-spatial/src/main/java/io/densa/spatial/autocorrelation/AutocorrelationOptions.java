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
 *
 * <p>A record: the canonical constructor checks every component as the with-methods do.
 *
 * @param permutations     number of random permutations R, 0 (no permutation test) to 10,000,000
 * @param seed             seed of the permutations
 * @param islandPolicy     treatment of units without neighbours
 * @param parallel         whether permutations may use the common ForkJoin pool
 * @param progressListener the progress listener ({@link ProgressListener#NONE} by default)
 */
public record AutocorrelationOptions(int permutations, long seed, IslandPolicy islandPolicy, boolean parallel,
        ProgressListener progressListener) {
    private static final AutocorrelationOptions DEFAULTS =
            new AutocorrelationOptions(0, 0L, IslandPolicy.ERROR, true, ProgressListener.NONE);

    /** Checks every component. */
    public AutocorrelationOptions {
        if (!(permutations >= 0 && permutations <= 10_000_000)) {
            throw new IllegalArgumentException("permutation count " + permutations + " must be in 0..10000000");
        }
        Objects.requireNonNull(islandPolicy, "policy");
        Objects.requireNonNull(progressListener, "listener");
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
        return new AutocorrelationOptions(count, seed, islandPolicy, parallel, progressListener);
    }

    /** With the given treatment of units without neighbours. */
    public AutocorrelationOptions withIslandPolicy(IslandPolicy policy) {
        return new AutocorrelationOptions(permutations, seed, policy, parallel, progressListener);
    }

    /** Whether permutations may use the common ForkJoin pool (results do not depend on it). */
    public AutocorrelationOptions withParallel(boolean parallel) {
        return new AutocorrelationOptions(permutations, seed, islandPolicy, parallel, progressListener);
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
        return new AutocorrelationOptions(permutations, seed, islandPolicy, parallel, listener);
    }

    @Override
    public String toString() {
        return "AutocorrelationOptions[permutations=" + permutations + ", seed=" + seed + ", islands="
                + islandPolicy + ", parallel=" + parallel
                + (progressListener == ProgressListener.NONE ? "" : ", with progress") + "]";
    }
}
