package io.densa.core.internal;

import java.lang.reflect.RecordComponent;
import java.util.Arrays;

/**
 * Defensive copies and content-based equality for the public result records with array
 * components: records compare arrays by reference, so each such record copies
 * its arrays in and out and compares, hashes and prints them by content. Internal: not exported
 * outside the Densa modules; may change without notice.
 */
public final class RecordArrays {
    private RecordArrays() {
    }

    public static int[] copy(int[] a) {
        return a == null ? null : a.clone();
    }

    public static double[] copy(double[] a) {
        return a == null ? null : a.clone();
    }

    public static double[][] copy(double[][] a) {
        if (a == null) {
            return null;
        }
        double[][] out = new double[a.length][];
        for (int i = 0; i < a.length; i++) {
            out[i] = a[i] == null ? null : a[i].clone();
        }
        return out;
    }

    /**
     * Content equality of two records of the same class: every component compared through its
     * accessor, arrays (nested too) element by element. One rule for every result record with
     * array components, so that a new component cannot be forgotten in equals.
     */
    public static boolean equal(Record self, Object other) {
        return other != null && other.getClass() == self.getClass()
                && Arrays.deepEquals(components(self), components((Record) other));
    }

    /** Content hash of a record's components (arrays by content), consistent with {@link #equal}. */
    public static int hash(Record self) {
        return Arrays.deepHashCode(components(self));
    }

    /**
     * "Name[c1=v1, c2=v2, ...]" as {@link Record#toString()} prints it, but with arrays printed by
     * content, each array (and each nested row) abbreviated after {@value #SHOWN} elements.
     */
    public static String describe(Record self) {
        RecordComponent[] rc = self.getClass().getRecordComponents();
        String[] names = new String[rc.length];
        for (int i = 0; i < rc.length; i++) {
            names[i] = rc[i].getName();
        }
        return describe(self.getClass().getSimpleName(), names, components(self));
    }

    /** The values of a record's components in declaration order, read through their public accessors. */
    private static Object[] components(Record r) {
        RecordComponent[] rc = r.getClass().getRecordComponents();
        Object[] out = new Object[rc.length];
        for (int i = 0; i < rc.length; i++) {
            try {
                out[i] = rc[i].getAccessor().invoke(r);
            } catch (ReflectiveOperationException e) {
                throw new IllegalStateException("record component " + rc[i].getName() + " of "
                        + r.getClass().getName() + " is not readable", e);
            }
        }
        return out;
    }

    /** Array elements printed by {@link #describe} before it abbreviates. */
    public static final int SHOWN = 6;

    /**
     * "Name[c1=v1, c2=v2, ...]" with arrays printed by content, each array (and each nested row)
     * abbreviated after {@value #SHOWN} elements as "[a, b, …, f, … (length n)]", so that a large
     * result prints readably (in JShell, for example).
     */
    private static String describe(String name, String[] names, Object[] parts) {
        StringBuilder sb = new StringBuilder(name).append('[');
        for (int i = 0; i < parts.length; i++) {
            if (i > 0) {
                sb.append(", ");
            }
            sb.append(names[i]).append('=');
            append(sb, parts[i]);
        }
        return sb.append(']').toString();
    }

    private static void append(StringBuilder sb, Object v) {
        if (v == null || !v.getClass().isArray()) {
            sb.append(v);
            return;
        }
        int n = java.lang.reflect.Array.getLength(v);
        sb.append('[');
        for (int j = 0; j < Math.min(n, SHOWN); j++) {
            if (j > 0) {
                sb.append(", ");
            }
            append(sb, java.lang.reflect.Array.get(v, j));
        }
        if (n > SHOWN) {
            sb.append(", … (length ").append(n).append(')');
        }
        sb.append(']');
    }
}
