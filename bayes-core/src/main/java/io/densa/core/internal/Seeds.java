package io.densa.core.internal;

import java.util.SplittableRandom;

/**
 * Reproducible random streams for parallel resampling: one independent generator per unit or
 * block, derived from the user's seed and the index by the SplitMix64 finaliser (Steele, Lea &amp;
 * Flood (2014), Fast splittable pseudorandom number generators, OOPSLA — from memory), so that
 * results do not depend on the number of threads. Internal; not public API.
 */
public final class Seeds {
    private static final long GOLDEN = 0x9E3779B97F4A7C15L;

    private Seeds() {
    }

    /** A well-mixed 64-bit seed for stream {@code index} of {@code seed}. */
    public static long mix(long seed, long index) {
        long z = seed + (index + 1) * GOLDEN;
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }

    /** The generator of stream {@code index} of {@code seed}. */
    public static SplittableRandom stream(long seed, long index) {
        return new SplittableRandom(mix(seed, index));
    }

    /** Fisher–Yates shuffle (Durstenfeld 1964) of the whole array, in place. */
    public static void shuffle(int[] a, SplittableRandom rng) {
        for (int i = a.length - 1; i > 0; i--) {
            int j = rng.nextInt(i + 1);
            int t = a[i];
            a[i] = a[j];
            a[j] = t;
        }
    }

    /** Seeded permutation of 0..n−1 (the Fisher–Yates shuffle {@link #shuffle} of the identity). */
    public static int[] permutation(int n, SplittableRandom rnd) {
        int[] p = new int[n];
        for (int i = 0; i < n; i++) {
            p[i] = i;
        }
        shuffle(p, rnd);
        return p;
    }

    /**
     * Fold index of every row for k-fold cross-validation: rows in the order of a seeded
     * {@link #permutation} fall into folds of balanced sizes.
     *
     * @throws IllegalArgumentException unless 2 ≤ k ≤ n
     */
    public static int[] folds(int n, int k, long seed) {
        if (k < 2 || k > n) {
            throw new IllegalArgumentException("fold count must be in [2, n = " + n + "], got " + k);
        }
        int[] perm = permutation(n, new SplittableRandom(seed));
        int[] fold = new int[n];
        for (int r = 0; r < n; r++) {
            fold[perm[r]] = (int) ((long) r * k / n);
        }
        return fold;
    }
}
