package io.densa.core;

import java.lang.reflect.RecordComponent;
import java.util.Arrays;
import java.util.Collection;
import java.util.Map;
import java.util.OptionalDouble;
import java.util.function.Supplier;
import org.ejml.data.DMatrixRMaj;

/**
 * The contract every fuzzed call must keep (the project's rule "nothing silent"): finite input
 * gives finite output — no NaN or ±∞ in any returned number, diagnostics included — or an
 * {@link IllegalArgumentException}, {@link IllegalStateException} or {@link DensaException}
 * thrown by Densa code (never a subclass from another library, never another type); and no
 * input array is modified.
 *
 * <p>Test code; the same class is copied in each module's tests (modules do not share test code).
 */
final class FuzzCheck {
    /** A violation of the contract (foreign exception, non-finite output, modified input). */
    static final class Violation extends AssertionError {
        private static final long serialVersionUID = 1L;
        final String operation;

        Violation(String operation, String message, Throwable cause) {
            super(operation + ": " + message, cause);
            this.operation = operation;
        }
    }

    /**
     * Exploration mode (environment variable {@code DENSA_FUZZ_COLLECT}): violations are collected, one
     * example per signature, instead of failing the try; {@link #collected()} lists them.
     */
    private static final boolean COLLECT = System.getenv("DENSA_FUZZ_COLLECT") != null;
    private static final Map<String, String> COLLECTED = new java.util.concurrent.ConcurrentSkipListMap<>();

    /** Per operation: calls that returned, calls that threw an accepted exception (exploration mode). */
    private static final Map<String, long[]> OUTCOMES = new java.util.concurrent.ConcurrentSkipListMap<>();

    /** Accepted exceptions by operation and message shape (exploration mode). */
    private static final Map<String, Long> ACCEPTED = new java.util.concurrent.ConcurrentSkipListMap<>();

    private static final ThreadLocal<String> CONTEXT = ThreadLocal.withInitial(() -> "");

    /**
     * Describes the current try (property, case seed, configuration) for collected examples; the
     * text is built only in exploration mode.
     */
    static void context(Supplier<String> text) {
        if (COLLECT) {
            CONTEXT.set(text.get());
        }
    }

    /** Writes the collected violations (signature → first example), in exploration mode. */
    static void writeCollected(java.nio.file.Path file) throws java.io.IOException {
        if (!COLLECT) {
            return;
        }
        StringBuilder sb = new StringBuilder();
        COLLECTED.forEach((k, v) -> sb.append("FUZZ ").append(k).append("\n    ").append(v).append("\n"));
        OUTCOMES.forEach((k, v) -> sb.append("OUTCOME ").append(k).append(": returned ").append(v[0])
                .append(", threw an accepted exception ").append(v[1]).append("\n"));
        ACCEPTED.forEach((k, v) -> sb.append("ACCEPTED ").append(v).append(" × ").append(k).append("\n"));
        java.nio.file.Files.writeString(file, sb.toString());
    }

    /**
     * Runs op; checks the outcome and that the watched arrays are unchanged.
     *
     * @return the result, or null when op threw an allowed exception
     */
    <T> T run(String operation, Supplier<T> op, Object... watched) {
        Object[] copies = new Object[watched.length];
        for (int i = 0; i < watched.length; i++) {
            copies[i] = deepCopy(watched[i]);
        }
        T result = null;
        Throwable failure = null;
        try {
            result = op.get();
            requireFinite(operation, result, "result", 0);
        } catch (Violation v) {
            failure = v;
        } catch (IllegalArgumentException | IllegalStateException | DensaException e) {
            if (!(e instanceof DensaException) && e.getClass() != IllegalArgumentException.class
                    && e.getClass() != IllegalStateException.class) {
                failure = new Violation(operation, "foreign subclass " + e.getClass().getName(), e);
            } else if (!thrownByDensa(e)) {
                failure = new Violation(operation, e.getClass().getSimpleName() + " thrown outside Densa at "
                        + e.getStackTrace()[0], e);
            } else if (e.getMessage() == null || e.getMessage().isBlank()) {
                failure = new Violation(operation, "exception without a message", e);
            }
            result = null;
            if (COLLECT && failure == null) {
                ACCEPTED.merge(operation + " | " + String.valueOf(e.getMessage()).replaceAll("[-0-9.E]+", "#")
                        .substring(0, Math.min(100, String.valueOf(e.getMessage()).replaceAll("[-0-9.E]+", "#")
                        .length())), 1L, Long::sum);
            }
        } catch (Throwable t) {
            failure = new Violation(operation, "foreign exception " + t, t);
        }
        for (int i = 0; i < watched.length; i++) {
            if (!Arrays.deepEquals(new Object[] {copies[i]}, new Object[] {watched[i]})) {
                Violation v = new Violation(operation, "input " + i + " was modified", failure);
                failure = failure == null ? v : failure;
                if (failure != v) {
                    failure.addSuppressed(v);
                }
            }
        }
        if (COLLECT) {
            long[] o = OUTCOMES.computeIfAbsent(operation, x -> new long[2]);
            synchronized (o) {
                o[result != null || failure != null ? 0 : 1]++;
            }
        }
        if (failure != null) {
            if (COLLECT) {
                String msg = String.valueOf(failure.getMessage());
                String signature = operation + " | " + msg.replaceAll("[-0-9.E]+", "#").substring(0,
                        Math.min(120, msg.replaceAll("[-0-9.E]+", "#").length()));
                Throwable root = failure.getCause() == null ? failure : failure.getCause();
                StackTraceElement[] st = root.getStackTrace();
                String where = st.length > 0 ? st[0].toString() : "";
                COLLECTED.putIfAbsent(signature, msg + "\n      at " + where + "\n      case " + CONTEXT.get()
                        + "\n      inputs " + describe(watched));
                return null;
            }
            if (failure instanceof Violation) {
                throw (Violation) failure;
            }
            throw new Violation(operation, failure.toString(), failure);
        }
        return result;
    }

    /** Runs op for its checks only. */
    void check(String operation, Runnable op, Object... watched) {
        run(operation, () -> {
            op.run();
            return null;
        }, watched);
    }

    private static String describe(Object[] watched) {
        StringBuilder sb = new StringBuilder();
        for (Object o : watched) {
            sb.append(Arrays.deepToString(new Object[] {o})).append(' ');
        }
        return sb.length() > 600 ? sb.substring(0, 600) + "…" : sb.toString();
    }

    private static boolean thrownByDensa(Throwable e) {
        StackTraceElement[] st = e.getStackTrace();
        return st.length > 0 && st[0].getClassName().startsWith("io.densa.");
    }

    private static Object deepCopy(Object o) {
        if (o instanceof double[]) {
            return ((double[]) o).clone();
        }
        if (o instanceof int[]) {
            return ((int[]) o).clone();
        }
        if (o instanceof long[]) {
            return ((long[]) o).clone();
        }
        if (o instanceof Object[]) {
            Object[] a = ((Object[]) o).clone();
            for (int i = 0; i < a.length; i++) {
                a[i] = deepCopy(a[i]);
            }
            return a;
        }
        return o;
    }

    /** Throws a {@link Violation} naming the path of the first non-finite number in o. */
    static void requireFinite(String op, Object o, String path, int depth) {
        if (o == null || depth > 6) {
            return;
        }
        if (o instanceof Double || o instanceof Float) {
            double v = ((Number) o).doubleValue();
            if (!Double.isFinite(v)) {
                throw new Violation(op, "non-finite " + path + " = " + v, null);
            }
        } else if (o instanceof double[]) {
            double[] a = (double[]) o;
            for (int i = 0; i < a.length; i++) {
                if (!Double.isFinite(a[i])) {
                    throw new Violation(op, "non-finite " + path + "[" + i + "] = " + a[i], null);
                }
            }
        } else if (o instanceof double[][]) {
            double[][] a = (double[][]) o;
            for (int i = 0; i < a.length; i++) {
                requireFinite(op, a[i], path + "[" + i + "]", depth + 1);
            }
        } else if (o instanceof DMatrixRMaj) {
            DMatrixRMaj m = (DMatrixRMaj) o;
            requireFinite(op, Arrays.copyOf(m.data, m.numRows * m.numCols), path, depth + 1);
        } else if (o instanceof Density) {
            requireFinite(op, ((Density) o).coordinates(), path + ".coordinates", depth + 1);
        } else if (o instanceof DensitySet) {
            requireFinite(op, ((DensitySet) o).coordinatesRowMajor(), path + ".coordinates", depth + 1);
        } else if (o instanceof java.util.Optional) {
            requireFinite(op, ((java.util.Optional<?>) o).orElse(null), path, depth + 1);
        } else if (o instanceof OptionalDouble) {
            OptionalDouble d = (OptionalDouble) o;
            if (d.isPresent()) {
                requireFinite(op, d.getAsDouble(), path, depth + 1);
            }
        } else if (o instanceof Collection) {
            int i = 0;
            for (Object e : (Collection<?>) o) {
                requireFinite(op, e, path + "[" + i++ + "]", depth + 1);
            }
        } else if (o instanceof Map) {
            for (Map.Entry<?, ?> e : ((Map<?, ?>) o).entrySet()) {
                requireFinite(op, e.getValue(), path + "[" + e.getKey() + "]", depth + 1);
            }
        } else if (o instanceof Object[]) {
            Object[] a = (Object[]) o;
            for (int i = 0; i < a.length; i++) {
                requireFinite(op, a[i], path + "[" + i + "]", depth + 1);
            }
        } else if (o.getClass().isRecord()) {
            for (RecordComponent c : o.getClass().getRecordComponents()) {
                Object v;
                try {
                    v = c.getAccessor().invoke(o);
                } catch (ReflectiveOperationException e) {
                    throw new IllegalStateException(e);
                }
                requireFinite(op, v, path + "." + c.getName(), depth + 1);
            }
        }
    }
}
