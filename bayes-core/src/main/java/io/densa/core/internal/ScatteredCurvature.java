package io.densa.core.internal;

/**
 * Values of a function of one variable computed at scattered points (a search's evaluations,
 * in the order it made them) and the second derivative they give at one of those points.
 * Internal.
 */
public final class ScatteredCurvature {
    /**
     * Closest spacing of two points used together (in the units of the points; the smoothing
     * search's decades of λ): below it their difference would be mostly the error of the values
     * (the search fits' 10⁻⁹ relative in the penalised log-likelihood).
     */
    public static final double MIN_SPACING = 0.01;
    private final double[] g;
    private final double[] c;
    private int n;

    /** Room for capacity values (further ones are ignored). */
    public ScatteredCurvature(int capacity) {
        g = new double[capacity];
        c = new double[capacity];
    }

    /** The value v at x (kept only when finite and there is room). */
    public void add(double x, double v) {
        if (n < g.length && Double.isFinite(v)) {
            g[n] = x;
            c[n++] = v;
        }
    }

    /** The value kept at x0 (the first, if several), or NaN if none. */
    public double valueAt(double x0) {
        for (int i = 0; i < n; i++) {
            if (g[i] == x0) {
                return c[i];
            }
        }
        return Double.NaN;
    }

    /**
     * V''(x0) from the cubic through x0's value, the nearest value on each side and the next
     * nearest, no two closer than {@link #MIN_SPACING}: the second derivative of the interpolating
     * polynomial at an interior node (divided differences; Burden &amp; Faires (2011), Numerical
     * Analysis, 9th ed., §3.3 and §4.1; from memory, and elementary: exact for cubics, checked so in
     * {@code SearchCurvatureTest}). NaN when x0 was not evaluated or the values do not bracket it.
     */
    public double curvatureAt(double x0) {
        double[] t = new double[4];
        double[] y = new double[4];
        int self = -1, below = -1, above = -1;
        for (int i = 0; i < n; i++) {
            double d = g[i] - x0;
            if (d == 0) {
                self = i;
            } else if (d <= -MIN_SPACING && (below < 0 || d > g[below] - x0)) {
                below = i;
            } else if (d >= MIN_SPACING && (above < 0 || d < g[above] - x0)) {
                above = i;
            }
        }
        if (self < 0 || below < 0 || above < 0) {
            return Double.NaN;
        }
        int fourth = -1;
        for (int i = 0; i < n; i++) {
            double d = Math.abs(g[i] - x0);
            if (d >= MIN_SPACING && Math.abs(g[i] - g[below]) >= MIN_SPACING
                    && Math.abs(g[i] - g[above]) >= MIN_SPACING && (fourth < 0 || d < Math.abs(g[fourth] - x0))) {
                fourth = i;
            }
        }
        if (fourth < 0) {
            return Double.NaN;
        }
        int[] pick = {self, below, above, fourth};
        for (int j = 0; j < 4; j++) {
            t[j] = g[pick[j]] - x0;
            y[j] = c[pick[j]];
        }
        return cubicSecondDerivativeAtZero(t, y);
    }

    /**
     * p''(0) of the cubic p through (t_i, y_i), i = 0..3 (distinct t): Newton's divided differences
     * p(t) = y0 + d1 (t − t0) + d2 (t − t0)(t − t1) + d3 (t − t0)(t − t1)(t − t2).
     */
    public static double cubicSecondDerivativeAtZero(double[] t, double[] y) {
        double[] d = y.clone();
        for (int level = 1; level < 4; level++) {
            for (int i = 3; i >= level; i--) {
                d[i] = (d[i] - d[i - 1]) / (t[i] - t[i - level]);
            }
        }
        // p''(t) = 2 d2 + d3 (6t − 2(t0 + t1 + t2))
        return 2 * d[2] - 2 * d[3] * (t[0] + t[1] + t[2]);
    }
}
