package io.densa.spatial.internal;

import java.util.Arrays;

/**
 * A bounded max-heap of (distance, index) that keeps the smallest entries, ordered by (distance,
 * index), with an order-free hash of the set of indices it holds and a lookup of their distances
 * by index: the neighbour selection of neighbourhood grid kriging, which reuses a factorised system
 * when a cell's nearest stations are the same set as before. Mutable, one per thread. Internal.
 */
public final class NearestHeap {
    private final double[] d;
    private final int[] ix;
    private final int cap;
    private int size;

    /** A heap keeping the cap smallest entries. */
    public NearestHeap(int cap) {
        this.cap = cap;
        d = new double[cap];
        ix = new int[cap];
        table = new int[Integer.highestOneBit(Math.max(4, cap) * 4 - 1) << 1];
        stamp = new int[table.length];
        mask = table.length - 1;
    }

    public void clear() {
        size = 0;
    }

    private boolean greater(int a, int b) {
        return d[a] > d[b] || (d[a] == d[b] && ix[a] > ix[b]);
    }

    public void offer(double dist, int index) {
        if (size < cap) {
            d[size] = dist;
            ix[size] = index;
            int c = size++;
            while (c > 0) {
                int par = (c - 1) >> 1;
                if (greater(c, par)) {
                    swap(c, par);
                    c = par;
                } else {
                    break;
                }
            }
            return;
        }
        if (dist > d[0] || (dist == d[0] && index > ix[0])) {
            return;
        }
        d[0] = dist;
        ix[0] = index;
        int c = 0;
        while (true) {
            int l = 2 * c + 1, r = l + 1, big = c;
            if (l < size && greater(l, big)) {
                big = l;
            }
            if (r < size && greater(r, big)) {
                big = r;
            }
            if (big == c) {
                break;
            }
            swap(c, big);
            c = big;
        }
    }

    private void swap(int a, int b) {
        double td = d[a];
        d[a] = d[b];
        d[b] = td;
        int ti = ix[a];
        ix[a] = ix[b];
        ix[b] = ti;
    }

    public int[] sortedIndices() {
        int[] out = Arrays.copyOf(ix, size);
        Arrays.sort(out);
        return out;
    }

    public int size() {
        return size;
    }

    /**
     * Indexes the entries held (for {@link #distancesInOrderOf}) and returns a hash of their
     * set, independent of their order: the wrapping sum of a 64-bit mix of each index
     * (SplitMix64's finaliser; Steele, Lea &amp; Flood (2014), Fast splittable pseudorandom
     * number generators, OOPSLA; from memory). Equal sets hash equal; a lookup by it is
     * confirmed by {@link #distancesInOrderOf}.
     */
    public long indexSet() {
        long h = size;
        for (int a = 0; a < size; a++) {
            long z = ix[a] * 0x9E3779B97F4A7C15L;
            z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
            z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
            h += z ^ (z >>> 31);
        }
        fillTable();
        return h;
    }

    /**
     * If the stations (the first count of the array, in their order) are exactly the indices held (after {@link #indexSet}), writes
     * the held distances in the order of the stations into out and returns true; otherwise
     * returns false (out partly written).
     */
    public boolean distancesInOrderOf(int[] stations, int count, double[] out) {
        if (count != size) {
            return false;
        }
        for (int j = 0; j < size; j++) {
            int a = slot(stations[j]);
            if (a < 0) {
                return false;
            }
            out[j] = d[a];
        }
        return true;
    }

    // open addressing from index to heap position, rebuilt by indexSet; a slot is filled only
    // if its stamp is the current generation (no clearing between cells)
    private final int[] table;
    private final int[] stamp;
    private final int mask;
    private int generation;

    private void fillTable() {
        if (++generation == 0) {
            Arrays.fill(stamp, 0);
            generation = 1;
        }
        for (int a = 0; a < size; a++) {
            int s = spread(ix[a]) & mask;
            while (stamp[s] == generation) {
                s = (s + 1) & mask;
            }
            stamp[s] = generation;
            table[s] = a;
        }
    }

    /** Heap position of index i, or −1 if it is not held. */
    private int slot(int i) {
        int s = spread(i) & mask;
        while (stamp[s] == generation) {
            int a = table[s];
            if (ix[a] == i) {
                return a;
            }
            s = (s + 1) & mask;
        }
        return -1;
    }

    private static int spread(int i) {
        int h = i * 0x9E3779B9;
        return h ^ (h >>> 16);
    }
}
