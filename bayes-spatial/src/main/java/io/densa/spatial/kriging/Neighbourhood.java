package io.densa.spatial.kriging;

import io.densa.spatial.Locations;

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

    @Override
    public String toString() {
        return kind == Kind.GLOBAL ? "Neighbourhood[global]" : kind == Kind.NEAREST ? "Neighbourhood[nearest " + count
                + "]" : "Neighbourhood[radius " + radius + ", max " + count + "]";
    }
}
