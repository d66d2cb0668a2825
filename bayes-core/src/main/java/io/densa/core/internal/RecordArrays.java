package io.densa.core.internal;

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

    /** Content equality of the components of two records of the same type. */
    public static boolean equal(Object[] a, Object[] b) {
        return Arrays.deepEquals(a, b);
    }

    /** Content hash of a record's components. */
    public static int hash(Object[] parts) {
        return Arrays.deepHashCode(parts);
    }

    /** "Name[c1=v1, c2=v2, ...]" with arrays printed by content. */
    public static String describe(String name, String[] names, Object[] parts) {
        StringBuilder sb = new StringBuilder(name).append('[');
        for (int i = 0; i < parts.length; i++) {
            if (i > 0) {
                sb.append(", ");
            }
            String v = Arrays.deepToString(new Object[] {parts[i]});
            sb.append(names[i]).append('=').append(v, 1, v.length() - 1);
        }
        return sb.append(']').toString();
    }
}
