package io.densa.spatial.kriging;

import io.densa.core.DensaException;
import io.densa.spatial.NeighbourIndex;
import io.densa.spatial.Locations;
import java.util.Arrays;

/**
 * Which data locations enter the kriging system at a target: all of them (global, one
 * factorisation shared by every target), the k nearest, or those within a radius (at most a
 * given number, the nearest first).
 *
 * <p>Immutable.
 */
public final class Neighbourhood {
    enum Kind { GLOBAL, NEAREST, RADIUS }

    private final Kind kind;
    private final int count;
    private final double radius;

    private Neighbourhood(Kind kind, int count, double radius) {
        this.kind = kind;
        this.count = count;
        this.radius = radius;
    }

    /** All locations. */
    public static Neighbourhood global() {
        return new Neighbourhood(Kind.GLOBAL, Integer.MAX_VALUE, Double.POSITIVE_INFINITY);
    }

    /**
     * The k nearest locations (ties by smaller index).
     *
     * @throws IllegalArgumentException if k &lt; 1
     */
    public static Neighbourhood nearest(int k) {
        if (k < 1) {
            throw new IllegalArgumentException("neighbour count must be >= 1, got " + k);
        }
        return new Neighbourhood(Kind.NEAREST, k, Double.POSITIVE_INFINITY);
    }

    /**
     * Locations within distance r of the target, at most maxCount of them (the nearest).
     *
     * @throws IllegalArgumentException unless r &gt; 0 is finite and maxCount ≥ 1
     */
    public static Neighbourhood radius(double r, int maxCount) {
        if (!(r > 0) || Double.isInfinite(r)) {
            throw new IllegalArgumentException("radius must be finite and > 0, got " + r);
        }
        if (maxCount < 1) {
            throw new IllegalArgumentException("maximum neighbour count must be >= 1, got " + maxCount);
        }
        return new Neighbourhood(Kind.RADIUS, maxCount, r);
    }

    Kind kind() {
        return kind;
    }

    /** Maximum number of neighbours (Integer.MAX_VALUE for global). */
    public int count() {
        return count;
    }

    /** Search radius (+∞ unless a radius neighbourhood). */
    public double radius() {
        return radius;
    }

    /** True for the global neighbourhood. */
    public boolean isGlobal() {
        return kind == Kind.GLOBAL;
    }

    /**
     * Neighbour indices (ascending) of a target among n stations, leaving out station {@code exclude}
     * (−1 for none); package-private, for {@link Kriging}.
     *
     * @param need the number of neighbours the kriging type needs (a DensaException below it)
     */
    int[] select(NeighbourIndex index, int n, int need, Kriging.Type type, double x, double yy, int exclude) {
        Neighbourhood hood = this;
        int[] nb;
        switch (hood.kind()) {
            case GLOBAL: {
                nb = new int[exclude >= 0 ? n - 1 : n];
                int c = 0;
                for (int i = 0; i < n; i++) {
                    if (i != exclude) {
                        nb[c++] = i;
                    }
                }
                return nb;
            }
            case NEAREST:
                nb = index.nearest(x, yy, exclude >= 0 ? hood.count() + 1 : hood.count());
                break;
            default:
                nb = index.within(x, yy, hood.radius());
                break;
        }
        int[] kept = new int[nb.length];
        int c = 0;
        for (int j : nb) {
            if (j != exclude && c < hood.count()) {
                kept[c++] = j;
            }
        }
        nb = Arrays.copyOf(kept, c);
        if (nb.length < Math.min(need, n - (exclude >= 0 ? 1 : 0))) {
            throw new DensaException("only " + nb.length + " data location(s) within radius " + hood.radius()
                    + " of target (" + x + ", " + yy + "); " + type + " kriging needs " + need,
                    new KrigingDiagnostics(nb.length, Double.NaN, nb, "too few neighbours"));
        }
        Arrays.sort(nb);
        return nb;
    }

    /** Equal when of the same kind with the same count and radius. */
    @Override
    public boolean equals(Object o) {
        return o instanceof Neighbourhood other && kind == other.kind && count == other.count
                && Double.compare(radius, other.radius) == 0;
    }

    @Override
    public int hashCode() {
        return 31 * (31 * kind.hashCode() + count) + Double.hashCode(radius);
    }

    @Override
    public String toString() {
        return kind == Kind.GLOBAL ? "Neighbourhood[global]" : kind == Kind.NEAREST ? "Neighbourhood[nearest " + count
                + "]" : "Neighbourhood[radius " + radius + ", max " + count + "]";
    }
}
