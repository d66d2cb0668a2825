package io.densa.io.tables;

import java.util.Arrays;

/** Growable parallel arrays of (row, bin key, amount, position) entries. Package-private. */
final class GrowableEntries {
    int size;
    int[] unit = new int[64];
    int[] bin = new int[64];
    double[] amount = new double[64];
    long[] position = new long[64];

    void add(int u, int b, double a, long pos) {
        if (size == unit.length) {
            int n = size * 2;
            unit = Arrays.copyOf(unit, n);
            bin = Arrays.copyOf(bin, n);
            amount = Arrays.copyOf(amount, n);
            position = Arrays.copyOf(position, n);
        }
        unit[size] = u;
        bin[size] = b;
        amount[size] = a;
        position[size] = pos;
        size++;
    }
}
