package io.densa.core.internal;

import java.util.Arrays;

/**
 * Evaluation of the raw functions φ_1..φ_K of a basis (before centring and orthonormalisation):
 * B-splines of order k on knots a = λ_0 &lt; … &lt; λ_{g+1} = b with k-fold boundary knots, the
 * last one dropped (de Boor (1978), A Practical Guide to Splines, Springer, the triangular
 * recurrence); Legendre polynomials P_1..P_d of the variable mapped affinely onto [−1, 1]
 * (three-term recurrence, Abramowitz &amp; Stegun (1964), 22.7.10); indicators of the bins
 * [e_j, e_{j+1}) of a step basis (the last bin closed), the last one dropped; on a circle
 * [a, a + P): the N periodic B-splines of order k on N knots a = t_0 &lt; … &lt; t_{N−1} continued
 * around the circle (they sum to 1, de Boor (1978), so the last one is dropped, K = N − 1) and
 * the Fourier functions cos(2πj(x − a)/P), sin(2πj(x − a)/P), j = 1..H (K = 2H). Both wrap x modulo P.
 * The Fourier functions are evaluated densely (first index 0). The periodic B-splines keep local
 * support although the circle has no ends: periodic function j (the one starting at knot t_j) has raw
 * index {@link #periodicIndex(int) 2j} in the first half of the circle and 2(N − 1 − j) + 1 in the
 * second (a zigzag), so the k functions nonzero at a point, consecutive around the circle, always lie
 * within 2k consecutive raw indices: the local window is 2k wide (the whole basis when N &lt; 2k),
 * and the function with raw index N − 1 is the dropped one.
 *
 * <p>Internal: not exported outside the Densa modules; may change without notice. The arguments are
 * validated by {@code io.densa.core.Basis}, which owns one instance; the factories here only copy.
 * Immutable and thread-safe.
 */
public final class RawBasis {
    private static final int SPLINE = 0;
    private static final int POLYNOMIAL = 1;
    private static final int STEP = 2;
    private static final int PERIODIC = 3;
    private static final int FOURIER = 4;

    private final int kind;
    private final int order; // spline order, polynomial degree, or 0 for steps
    private final double[] knots; // spline: a, interior..., b; step: edges; poly: a, b
    private final double[] ext; // spline extended knot vector
    private final int size; // K
    private final int window; // local support width of periodic splines

    private RawBasis(int kind, int order, double[] knots) {
        this.kind = kind;
        this.order = order;
        this.knots = knots;
        window = kind == PERIODIC ? Math.min(2 * order, knots.length - 1) : 0;
        if (kind == SPLINE) {
            int g = knots.length - 2;
            ext = new double[g + 2 * order];
            for (int i = 0; i < order; i++) {
                ext[i] = knots[0];
                ext[g + order + i] = knots[g + 1];
            }
            System.arraycopy(knots, 1, ext, order, g);
            size = g + order - 1;
        } else if (kind == POLYNOMIAL) {
            ext = null;
            size = order;
        } else if (kind == PERIODIC) {
            ext = periodicKnots(order, knots);
            size = knots.length - 2;
        } else if (kind == FOURIER) {
            ext = null;
            size = 2 * order;
        } else {
            ext = null;
            size = knots.length - 2;
        }
    }

    /**
     * B-splines of the given order on the breakpoints a, interior..., b (copied; strictly
     * increasing, checked by the caller).
     */
    public static RawBasis spline(int order, double[] knots) {
        return new RawBasis(SPLINE, order, knots.clone());
    }

    /** Legendre polynomials of degrees 1..degree on [a, b]. */
    public static RawBasis polynomial(int degree, double a, double b) {
        return new RawBasis(POLYNOMIAL, degree, new double[] {a, b});
    }

    /** Indicators of the bins between the given edges (copied; at least 3, strictly increasing). */
    public static RawBasis step(double[] edges) {
        return new RawBasis(STEP, 0, edges.clone());
    }

    /**
     * Periodic B-splines of the given order on the knots a = t_0 &lt; t_1 &lt; … &lt; t_{N−1} of the
     * circle, given with t_N = b = a + P appended (copied; strictly increasing, N = knots.length − 1 ≥
     * order, checked by the caller).
     */
    public static RawBasis periodicSpline(int order, double[] knots) {
        return new RawBasis(PERIODIC, order, knots.clone());
    }

    /** cos and sin of 2πj(x − a)/(b − a), j = 1..harmonics, on the circle [a, b). */
    public static RawBasis fourier(int harmonics, double a, double b) {
        return new RawBasis(FOURIER, harmonics, new double[] {a, b});
    }

    /** True for periodic B-splines. */
    public boolean isPeriodicSpline() {
        return kind == PERIODIC;
    }

    /** True for the Fourier functions. */
    public boolean isFourier() {
        return kind == FOURIER;
    }

    /** True for the bases on a circle (periodic B-splines, Fourier). */
    public boolean isPeriodic() {
        return kind == PERIODIC || kind == FOURIER;
    }

    /**
     * x wrapped onto the circle [a, b) of a periodic basis: a + ((x − a) mod (b − a)); x itself
     * when it already lies in [a, b) or the basis is not periodic.
     */
    public double wrap(double x) {
        double a = knots[0], b = knots[knots.length - 1];
        if (!isPeriodic() || x >= a && x < b) {
            return x;
        }
        double p = b - a;
        double r = (x - a) - p * Math.floor((x - a) / p);
        double y = a + r;
        return y >= b || y < a ? a : y;
    }

    /** True for B-splines. */
    public boolean isSpline() {
        return kind == SPLINE;
    }

    /** True for Legendre polynomials. */
    public boolean isPolynomial() {
        return kind == POLYNOMIAL;
    }

    /** True for step functions. */
    public boolean isStep() {
        return kind == STEP;
    }

    /** Spline order, polynomial degree, or 0 for steps. */
    public int order() {
        return order;
    }

    /** Number of raw functions K. */
    public int size() {
        return size;
    }

    /** Breakpoints (a, interior..., b; the edges; or {a, b}), a fresh copy. */
    public double[] knots() {
        return knots.clone();
    }

    /** The breakpoints themselves, not a copy, for hot loops: do not modify. */
    public double[] knotsView() {
        return knots;
    }

    /** Number of nonzero raw functions at a point (local support width). */
    public int supportWidth() {
        if (kind == PERIODIC) {
            return window;
        }
        if (kind == FOURIER) {
            return size;
        }
        if (kind == SPLINE) {
            return order;
        }
        return kind == STEP ? 1 : size;
    }

    /** Length of the scratch array {@link #evalLocal} and {@link #combine} need. */
    public int scratchSize() {
        if (kind == PERIODIC) {
            return window + 3 * order;
        }
        return kind == SPLINE ? 3 * order : supportWidth();
    }

    /**
     * Evaluates the raw functions that may be nonzero at x into vals[0..supportWidth) (vals of
     * length ≥ {@link #scratchSize()}) and returns
     * the raw index of vals[0]; indices ≥ size() are to be ignored (the dropped function).
     */
    public int evalLocal(double x, double[] vals) {
        if (kind == SPLINE) {
            return splineLocal(x, vals);
        }
        if (kind == STEP) {
            int j = bin(x);
            vals[0] = 1.0;
            return j;
        }
        if (kind == PERIODIC) {
            return periodicLocal(wrap(x), vals);
        }
        if (kind == FOURIER) {
            double a = knots[0], b = knots[1];
            double u = 2 * Math.PI * ((wrap(x) - a) / (b - a));
            for (int j = 1; j <= order; j++) {
                vals[2 * j - 2] = Math.cos(j * u);
                vals[2 * j - 1] = Math.sin(j * u);
            }
            return 0;
        }
        double a = knots[0], b = knots[1];
        double t = (2 * x - a - b) / (b - a);
        double p0 = 1, p1 = t;
        vals[0] = t;
        for (int j = 2; j <= order; j++) {
            double p2 = ((2.0 * j - 1) * t * p1 - (j - 1.0) * p0) / j;
            p0 = p1;
            p1 = p2;
            vals[j - 1] = p2;
        }
        return 0;
    }

    /** Dense raw values φ_1..φ_K at x. */
    public void evalDense(double x, double[] out) {
        Arrays.fill(out, 0, size, 0.0);
        double[] vals = new double[scratchSize()];
        int first = evalLocal(x, vals);
        int w = supportWidth();
        for (int i = 0; i < w; i++) {
            int j = first + i;
            if (j < size) {
                out[j] = vals[i];
            }
        }
    }

    /** Σ_j φ_j(x) coef[j], using local support. */
    public double combine(double x, double[] coef, double[] scratch) {
        int first = evalLocal(x, scratch);
        int w = supportWidth();
        double s = 0;
        for (int i = 0; i < w; i++) {
            int j = first + i;
            if (j < size) {
                s += scratch[i] * coef[j];
            }
        }
        return s;
    }

    public int bin(double x) {
        int lo = 0, hi = knots.length - 2; // bins 0..D-1
        if (x >= knots[hi]) {
            return hi;
        }
        return Sorted.lastAtMost(knots, lo, hi, x);
    }

    /**
     * The knots of a periodic spline continued around the circle: ext[i] = t_{(i − p) mod N} + P ⌊(i −
     * p)/N⌋ for i = 0..N + 2p (p = order − 1), so ext[p] = a and ext[p + N] = b; B-spline i on
     * ext[i..i + k] is periodic function (i − p) mod N.
     */
    public static double[] periodicKnots(int order, double[] knots) {
        int p = order - 1;
        int n = knots.length - 1;
        double period = knots[n] - knots[0];
        double[] e = new double[n + 2 * p + 1];
        for (int i = 0; i < e.length; i++) {
            int r = i - p;
            e[i] = knots[Math.floorMod(r, n)] + period * Math.floorDiv(r, n);
        }
        for (int i = 0; i <= n; i++) {
            e[p + i] = knots[i]; // the stored knots themselves, b included
        }
        return e;
    }

    /**
     * Raw index of periodic B-spline j (the one starting at knot t_j, 0 ≤ j &lt; N): 2j for j &lt;
     * ⌈N/2⌉, 2(N − 1 − j) + 1 otherwise; index N − 1 is the dropped function.
     */
    public int periodicIndex(int j) {
        int n = knots.length - 1;
        return j < (n + 1) / 2 ? 2 * j : 2 * (n - 1 - j) + 1;
    }

    /**
     * Values of the periodic B-splines at y in [a, b) in their local window: the B-splines of order k
     * on the knots continued around the circle ({@link #periodicKnots}), evaluated by de Boor's
     * triangular recurrence (de Boor (1978)), B-spline i being periodic function (i − p) mod N, placed
     * at its {@link #periodicIndex raw index} minus the returned first index. Uses vals[W..W + 3k) as
     * work space.
     */
    private int periodicLocal(double y, double[] vals) {
        int k = order;
        int p = k - 1;
        int nk = knots.length - 1; // N
        int s = Math.max(p, Sorted.lastAtMost(ext, p, p + nk - 1, y)); // ext[s] <= y < ext[s + 1]
        int o = window; // work space
        vals[o] = 1.0;
        for (int j = 1; j <= p; j++) {
            vals[o + k + j] = y - ext[s + 1 - j];
            vals[o + 2 * k + j] = ext[s + j] - y;
            double saved = 0.0;
            for (int r = 0; r < j; r++) {
                double temp = vals[o + r] / (vals[o + 2 * k + r + 1] + vals[o + k + j - r]);
                vals[o + r] = saved + vals[o + 2 * k + r + 1] * temp;
                saved = vals[o + k + j - r] * temp;
            }
            vals[o + j] = saved;
        }
        int lo = Integer.MAX_VALUE;
        for (int i = 0; i <= p; i++) {
            lo = Math.min(lo, periodicIndex(Math.floorMod(s - 2 * p + i, nk)));
        }
        int first = Math.max(0, Math.min(lo, nk - window));
        Arrays.fill(vals, 0, window, 0.0);
        for (int i = 0; i <= p; i++) {
            vals[periodicIndex(Math.floorMod(s - 2 * p + i, nk)) - first] += vals[o + i];
        }
        return first;
    }

    private int splineLocal(double x, double[] n) {
        int k = order;
        int p = k - 1;
        int m = size + 1; // number of B-splines
        // span s with ext[s] <= x < ext[s+1], p <= s <= m-1
        int s;
        if (x >= ext[m]) {
            s = m - 1;
        } else if (x <= ext[p]) {
            s = p;
        } else {
            s = Sorted.lastAtMost(ext, p, m - 1, x);
        }
        // n[0..k) values, n[k..2k) left differences, n[2k..3k) right differences
        n[0] = 1.0;
        for (int j = 1; j <= p; j++) {
            n[k + j] = x - ext[s + 1 - j];
            n[2 * k + j] = ext[s + j] - x;
            double saved = 0.0;
            for (int r = 0; r < j; r++) {
                double temp = n[r] / (n[2 * k + r + 1] + n[k + j - r]);
                n[r] = saved + n[2 * k + r + 1] * temp;
                saved = n[k + j - r] * temp;
            }
            n[j] = saved;
        }
        return s - p;
    }

    @Override
    public boolean equals(Object o) {
        return this == o || o instanceof RawBasis other
                && kind == other.kind && order == other.order && Arrays.equals(knots, other.knots);
    }

    @Override
    public int hashCode() {
        return 31 * (31 * kind + order) + Arrays.hashCode(knots);
    }

    /** The same text as the basis it was built from. */
    @Override
    public String toString() {
        if (kind == SPLINE) {
            return "splines(order " + order + ", " + (knots.length - 2) + " interior knots, K=" + size + ")";
        }
        if (kind == POLYNOMIAL) {
            return "polynomials(degree " + order + ", K=" + size + ")";
        }
        if (kind == PERIODIC) {
            return "periodic splines(order " + order + ", " + (knots.length - 1) + " knots, period "
                    + (knots[knots.length - 1] - knots[0]) + ", K=" + size + ")";
        }
        if (kind == FOURIER) {
            return "fourier(" + order + " harmonics, period " + (knots[1] - knots[0]) + ", K=" + size + ")";
        }
        return "steps(" + (knots.length - 1) + " bins, K=" + size + ")";
    }
}
