package io.densa.spatial;

import io.densa.core.ProgressListener;

/**
 * Thread-safe progress counter of one task: worker threads add finished units, and the listener
 * sees a non-decreasing count (calls are serialised) that reaches the total. Package-private.
 */
final class AutocorrelationProgress {
    private final ProgressListener listener;
    private final String task;
    private final long total;
    private long done;

    AutocorrelationProgress(ProgressListener listener, String task, long total) {
        this.listener = listener;
        this.task = task;
        this.total = total;
    }

    /** Adds finished units and reports the new count (nothing for {@link ProgressListener#NONE}). */
    void advance(long units) {
        if (listener == ProgressListener.NONE) {
            return;
        }
        synchronized (this) {
            done += units;
            listener.progress(task, done, total);
        }
    }
}
