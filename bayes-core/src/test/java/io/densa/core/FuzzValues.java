package io.densa.core;

import java.util.Arrays;
import java.util.Random;

/**
 * Generators of finite but extreme inputs for the seeded fuzz, drawn directly from the
 * property's seeded {@link Random} (cheap: no shrinking, no combinatorial edge cases; the edge
 * values are drawn explicitly). Test code; copied in each module's tests.
 */
final class FuzzValues {
    private static final double[] SPECIAL = {0.0, -0.0, Double.MIN_VALUE, -Double.MIN_VALUE, 3 * Double.MIN_VALUE,
        Double.MIN_NORMAL, Double.MAX_VALUE, -Double.MAX_VALUE, 1.0, -1.0, 0.5, 1e-300, 1e300, -1e300, 1e-170, 1e154,
        Math.nextUp(1.0), 4.9e-322};

    private FuzzValues() {
    }

    /** sign · m · 10^e with e uniform in [lo, hi], m in [1, 10), clamped to the finite range. */
    static double magnitude(Random r, int lo, int hi) {
        double v = (1 + 9 * r.nextDouble()) * Math.pow(10, lo + r.nextInt(hi - lo + 1));
        v = Double.isFinite(v) ? v : Double.MAX_VALUE;
        return r.nextBoolean() ? v : -v;
    }

    /** Finite doubles of every kind: moderate, tiny, huge, subnormal, signed zeros, small integers. */
    static double extreme(Random r) {
        switch (r.nextInt(14)) {
            case 0:
            case 1:
                return magnitude(r, -324, -100);
            case 2:
            case 3:
                return magnitude(r, 100, 308);
            case 4:
            case 5:
                return magnitude(r, -12, 12);
            case 6:
            case 7:
                return SPECIAL[r.nextInt(SPECIAL.length)];
            case 8:
            case 9:
                return r.nextInt(7) - 3;
            default:
                return 10 * r.nextDouble() - 5;
        }
    }

    /** Moderate values with occasional tiny, large or special ones (for expensive operations). */
    static double mild(Random r) {
        int c = r.nextInt(10);
        return c < 6 ? 4 * r.nextGaussian() : c < 8 ? r.nextInt(5) - 2 : extreme(r);
    }

    static double nonNegative(Random r) {
        return Math.abs(extreme(r));
    }

    interface Draw {
        double next(Random r);
    }

    /**
     * Coordinates of one density for the evaluation properties: one scale per density, mostly
     * moderate, sometimes sharp (up to 1e14, where evaluation is rejected as unresolvable), tiny or
     * huge, times {@link #mild} values.
     */
    static double[] evaluationCoordinates(Random r, int length) {
        int kind = r.nextInt(10);
        double scale = kind < 6 ? 1 : kind < 8 ? Math.pow(10, 2 + r.nextInt(13)) : Math.abs(extreme(r));
        return vector(r, length, q -> scale * mild(q));
    }

    /** An array: independent values, a constant, or values from a pool of one to three (ties). */
    static double[] vector(Random r, int length, Draw d) {
        double[] a = new double[length];
        int shape = r.nextInt(9);
        if (shape == 0) {
            Arrays.fill(a, d.next(r));
        } else if (shape <= 2) {
            double[] pool = new double[1 + r.nextInt(3)];
            for (int i = 0; i < pool.length; i++) {
                pool[i] = d.next(r);
            }
            for (int i = 0; i < length; i++) {
                a[i] = pool[r.nextInt(pool.length)];
            }
        } else {
            for (int i = 0; i < length; i++) {
                a[i] = d.next(r);
            }
        }
        return a;
    }

    /** A size: mostly small, sometimes 0, 1 or 2, sometimes up to max. */
    static int size(Random r, int max) {
        int c = r.nextInt(10);
        return c == 0 ? r.nextInt(3) : c < 8 ? 3 + r.nextInt(Math.max(1, Math.min(max, 12) - 2)) : r.nextInt(max + 1);
    }

    /** A probability-like value: mostly in [0, 1], with the ends, tiny ones and out-of-range ones. */
    static double probability(Random r) {
        int c = r.nextInt(8);
        return c < 5 ? r.nextDouble() : c == 5 ? new double[] {0, 1, Double.MIN_VALUE, Math.nextDown(1.0), 0.5,
            1e-300}[r.nextInt(6)] : extreme(r);
    }

    /** A point relative to [a, b]: inside, at the ends, just outside, far outside, ±∞. */
    static double point(Random r, double a, double b) {
        int c = r.nextInt(10);
        if (c < 6) {
            return a + (b - a) * r.nextDouble();
        }
        if (c < 9) {
            return new double[] {a, b, Math.nextDown(a), Math.nextUp(b), 0.5 * (a + b), Double.POSITIVE_INFINITY,
                Double.NEGATIVE_INFINITY, a - (b - a), b + 1e-9 * (b - a)}[r.nextInt(9)];
        }
        return extreme(r);
    }
}
