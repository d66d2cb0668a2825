package io.densa.spark;

import java.io.Serializable;
import java.util.function.Supplier;

/**
 * A value rebuilt at most once per JVM from the serialisable definition that holds it: the value
 * itself is transient (it never travels with a task), and the first caller in each JVM builds it
 * while concurrent callers wait for that one build.
 *
 * @param <T> the type of the value
 */
final class PerJvm<T> implements Serializable {
    private static final long serialVersionUID = 1L;

    private transient volatile T value;

    /** The value, built by {@code build} on the first call in this JVM. */
    T get(Supplier<T> build) {
        T v = value;
        if (v == null) {
            synchronized (this) { // one build per JVM even when several tasks start at once
                v = value;
                if (v == null) {
                    v = build.get();
                    value = v;
                }
            }
        }
        return v;
    }
}
