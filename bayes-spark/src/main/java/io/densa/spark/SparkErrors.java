package io.densa.spark;

import io.densa.core.DensaException;
import io.densa.core.NumericalDiagnostics;
import java.util.Objects;
import java.util.function.Supplier;

/**
 * Turns a failed Spark job back into the exception Densa threw inside the task: Spark wraps a task's
 * exception in a {@code SparkException} ("Job aborted due to stage failure: … Lost task …") whose
 * message buries the cause under a stack trace. {@link #unwrap} finds the first
 * {@link IllegalArgumentException}, {@link IllegalStateException} or {@link DensaException} in the
 * cause chain and rethrows one of the same kind with the same message (the Spark exception as its
 * cause); when the cause did not survive the trip from the executor, the message line Spark
 * recorded for it is used. Every action this module runs goes through {@link #run}.
 */
public final class SparkErrors {
    private static final String[] KINDS = {"java.lang.IllegalArgumentException: ", "java.lang.IllegalStateException: ",
        DensaException.class.getName() + ": "};

    private SparkErrors() {
    }

    /**
     * Diagnostics of a Densa failure that reached the driver only as the text of a Spark error (the
     * executor's exception object, with its own diagnostics, was not passed on).
     *
     * @param text the failure's message as Spark reported it
     */
    public record RemoteFailure(String text) implements NumericalDiagnostics {
        /** Validates. */
        public RemoteFailure {
            Objects.requireNonNull(text, "text");
        }
    }

    /** Runs the action, rethrowing a Densa exception from a failed job as described above. */
    public static <T> T run(Supplier<T> action) {
        try {
            return action.get();
        } catch (Exception e) { // Spark's SparkException is checked but thrown undeclared from Scala code
            throw SparkErrors.<RuntimeException>sneaky(unwrap(e));
        }
    }

    /**
     * Persists the dataset (memory and disk) and runs its job now, so that bad input fails here
     * with Densa's message ({@link #run}); on failure the dataset is unpersisted again.
     */
    static <T> org.apache.spark.sql.Dataset<T> materialise(org.apache.spark.sql.Dataset<T> data) {
        org.apache.spark.sql.Dataset<T> kept = data.persist(org.apache.spark.storage.StorageLevel.MEMORY_AND_DISK());
        try {
            run(kept::count);
        } catch (RuntimeException e) {
            kept.unpersist();
            throw e;
        }
        return kept;
    }

    @SuppressWarnings("unchecked")
    private static <E extends Throwable> E sneaky(Throwable t) throws E {
        throw (E) t;
    }

    /**
     * The Densa exception carried by a failed job, or the exception itself when it carries none.
     *
     * @param e an exception thrown by a Spark action ({@code SparkException} is a checked exception that
     *          Spark's Scala code throws undeclared)
     * @return the exception to throw: a Densa exception, or e itself
     */
    public static Exception unwrap(Exception e) {
        for (Throwable t = e; t != null; t = t.getCause()) {
            if (t instanceof DensaException) {
                if (t == e) {
                    return e;
                }
                DensaException d = new DensaException(t.getMessage(), ((DensaException) t).diagnostics());
                d.initCause(e);
                return d;
            }
            if (t instanceof IllegalArgumentException) {
                return t == e ? e : new IllegalArgumentException(t.getMessage(), e);
            }
            if (t instanceof IllegalStateException) {
                return t == e ? e : new IllegalStateException(t.getMessage(), e);
            }
            if (t.getCause() == t) {
                break;
            }
        }
        String m = e.getMessage();
        if (m != null) {
            for (int i = 0; i < KINDS.length; i++) {
                int at = m.indexOf(KINDS[i]);
                if (at >= 0) {
                    int from = at + KINDS[i].length();
                    int end = m.indexOf('\n', from);
                    String text = (end < 0 ? m.substring(from) : m.substring(from, end)).trim();
                    if (i == 0) {
                        return new IllegalArgumentException(text, e);
                    }
                    if (i == 1) {
                        return new IllegalStateException(text, e);
                    }
                    DensaException d = new DensaException(text, new RemoteFailure(text));
                    d.initCause(e);
                    return d;
                }
            }
        }
        return e;
    }
}
