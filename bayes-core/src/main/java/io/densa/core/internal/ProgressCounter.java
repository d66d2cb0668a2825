package io.densa.core.internal;

import io.densa.core.ProgressListener;
import java.util.Objects;

/**
 * Thread-safe progress counter of one task: worker threads add finished units and the listener
 * sees a non-decreasing count (calls are serialised) that reaches the total. Costs nothing for
 * {@link ProgressListener#NONE}. Internal; not public API.
 */
public final class ProgressCounter {
    private final ProgressListener listener;
    private final String task;
    private final long total;
    private long done;

    /**
     * @param listener where reports go (not null)
     * @param task     task name passed to the listener
     * @param total    total units of work
     */
    public ProgressCounter(ProgressListener listener, String task, long total) {
        this.listener = Objects.requireNonNull(listener, "listener");
        this.task = task;
        this.total = total;
    }

    /** Adds finished units and reports the new count. */
    public void advance(long units) {
        if (listener == ProgressListener.NONE) {
            return;
        }
        synchronized (this) {
            done += units;
            listener.progress(task, done, total);
        }
    }
}
