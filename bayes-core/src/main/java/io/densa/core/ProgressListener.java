package io.densa.core;

/**
 * Receives progress of long computations (batch estimation, resampling, cross-validation, grid
 * prediction). The library never prints: callers that want progress lines pass a listener.
 *
 * <p>Calls may come from worker threads of the common ForkJoin pool, so an implementation must
 * be thread-safe; it should return quickly. {@code done} is non-decreasing for one task and
 * reaches {@code total} when the task finishes.
 */
@FunctionalInterface
public interface ProgressListener {
    /** A listener that ignores every report. */
    ProgressListener NONE = (task, done, total) -> { };

    /**
     * Reports progress.
     *
     * @param task  short name of the computation (e.g. "bootstrap", "grid tiles")
     * @param done  units of work finished so far
     * @param total total units of work
     */
    void progress(String task, long done, long total);
}
