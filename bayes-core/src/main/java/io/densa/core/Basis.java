package io.densa.core;

import java.util.Arrays;
import java.util.Objects;

/**
 * The family of functions that spans a Bayes space's clr subspace, before orthonormalisation.
 *
 * <p>A space takes K "raw" functions φ_1..φ_K whose P-centred versions are linearly
 * independent, and orthonormalises them in L2(P) (see {@link BayesSpace}). The raw functions are:
 * <ul>
 *   <li>{@link Kind#SPLINE}: B-splines of order k (degree k − 1) on knots a = λ_0 &lt; … &lt;
 *   λ_{g+1} = b with k-fold boundary knots; the g + k B-splines span constants, so the last one
 *   is dropped and K = g + k − 1 (de Boor (1978), A Practical Guide to Splines, Springer;
 *   the zero-integral span is the one of Machalová et al. (2021), Compositional splines for
 *   representation of density functions, Computational Statistics 36,
 *   doi:10.1007/s00180-020-01042-7);</li>
 *   <li>{@link Kind#POLYNOMIAL}: Legendre polynomials P_1..P_d of the affinely mapped variable,
 *   K = d;</li>
 *   <li>{@link Kind#STEP}: indicators of bins [e_j, e_{j+1}) (the last bin closed), the last
 *   one dropped, K = D − 1.</li>
 * </ul>
 * Immutable; equality is exact on kind and parameters.
 */
public final class Basis {
    /** Kind of basis. */
    public enum Kind {
        /** B-splines of a given order on given knots (the default). */
        SPLINE,
        /** Orthonormal polynomials of a given degree. */
        POLYNOMIAL,
        /** Step functions on given bin edges (Aitchison geometry of D-part compositions). */
        STEP
    }

    private final Kind kind;
    private final int order; // spline order, polynomial degree, or 0 for steps
    private final double[] knots; // spline: a, interior..., b; step: edges; poly: a, b
    private final double[] ext; // spline extended knot vector
    private final int size; // K

    private Basis(Kind kind, int order, double[] knots) {
        this.kind = kind;
        this.order = order;
        this.knots = knots;
        if (kind == Kind.SPLINE) {
            int g = knots.length - 2;
            ext = new double[g + 2 * order];
            for (int i = 0; i < order; i++) {
                ext[i] = knots[0];
                ext[g + order + i] = knots[g + 1];
            }
            System.arraycopy(knots, 1, ext, order, g);
            size = g + order - 1;
        } else if (kind == Kind.POLYNOMIAL) {
            ext = null;
            size = order;
        } else {
            ext = null;
            size = knots.length - 2;
        }
    }

    static Basis spline(double a, double b, int order, double[] interior) {
        if (!(order >= 2 && order <= 12)) {
            throw new IllegalArgumentException("spline order must be in [2, 12] (4 = cubic), got " + order);
        }
        Objects.requireNonNull(interior, "interior knots");
        double[] k = new double[interior.length + 2];
        k[0] = a;
        k[k.length - 1] = b;
        for (int i = 0; i < interior.length; i++) {
            double t = interior[i];
            if (!Double.isFinite(t)) {
                throw new IllegalArgumentException("interior knot " + i + " is not finite: " + t);
            }
            if (!(t > a && t < b)) {
                throw new IllegalArgumentException("interior knot " + i + " = " + t
                        + " lies outside the open domain (" + a + ", " + b + ")");
            }
            if (i > 0 && !(t > interior[i - 1])) {
                throw new IllegalArgumentException("interior knots must be strictly increasing: knot " + i + " = "
                        + t + " follows " + interior[i - 1]);
            }
            k[i + 1] = t;
        }
        return new Basis(Kind.SPLINE, order, k);
    }

    static Basis polynomial(double a, double b, int degree) {
        if (!(degree >= 1 && degree <= 40)) {
            throw new IllegalArgumentException("polynomial degree must be in [1, 40], got " + degree);
        }
        return new Basis(Kind.POLYNOMIAL, degree, new double[] {a, b});
    }

    static Basis step(double[] edges) {
        Objects.requireNonNull(edges, "edges");
        if (edges.length < 3) {
            throw new IllegalArgumentException("step basis needs at least 2 bins (3 edges), got "
                    + edges.length + " edges");
        }
        for (int i = 0; i < edges.length; i++) {
            if (!Double.isFinite(edges[i])) {
                throw new IllegalArgumentException("bin edge " + i + " is not finite: " + edges[i]);
            }
            if (i > 0 && !(edges[i] > edges[i - 1])) {
                throw new IllegalArgumentException("bin edges must be strictly increasing: edge " + i + " = "
                        + edges[i] + " follows " + edges[i - 1]);
            }
        }
        return new Basis(Kind.STEP, 0, edges.clone());
    }

    /** The kind of basis. */
    public Kind kind() {
        return kind;
    }

    /** Spline order (4 = cubic), polynomial degree, or 0 for steps. */
    public int order() {
        return order;
    }

    /** Number of basis functions K (the space's dimension). */
    public int size() {
        return size;
    }

    /**
     * Breakpoints: the knots a, interior..., b of a spline basis, the bin edges of a step basis,
     * or {a, b} for polynomials (a fresh copy).
     */
    public double[] breakpoints() {
        return knots.clone();
    }

    double[] knotsInternal() {
        return knots;
    }

    /** Number of nonzero raw functions at a point (local support width). */
    int supportWidth() {
        switch (kind) {
            case SPLINE:
                return order;
            case STEP:
                return 1;
            default:
                return size;
        }
    }

    /** Length of the scratch array {@link #evalLocal} and {@link #combine} need. */
    int scratchSize() {
        return kind == Kind.SPLINE ? 3 * order : supportWidth();
    }

    /**
     * Evaluates the raw functions that may be nonzero at x into vals[0..supportWidth) (vals of
     * length ≥ {@link #scratchSize()}) and returns
     * the raw index of vals[0]; indices ≥ size() are to be ignored (the dropped function).
     */
    int evalLocal(double x, double[] vals) {
        switch (kind) {
            case SPLINE:
                return splineLocal(x, vals);
            case STEP: {
                int j = bin(x);
                vals[0] = 1.0;
                return j;
            }
            default: {
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
        }
    }

    /** Dense raw values φ_1..φ_K at x. */
    void evalDense(double x, double[] out) {
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
    double combine(double x, double[] coef, double[] scratch) {
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

    int bin(double x) {
        int lo = 0, hi = knots.length - 2; // bins 0..D-1
        if (x >= knots[hi]) {
            return hi;
        }
        while (lo < hi) {
            int mid = (lo + hi + 1) >>> 1;
            if (knots[mid] <= x) {
                lo = mid;
            } else {
                hi = mid - 1;
            }
        }
        return lo;
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
            int lo = p, hi = m - 1;
            while (lo < hi) {
                int mid = (lo + hi + 1) >>> 1;
                if (ext[mid] <= x) {
                    lo = mid;
                } else {
                    hi = mid - 1;
                }
            }
            s = lo;
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
        if (this == o) {
            return true;
        }
        if (!(o instanceof Basis)) {
            return false;
        }
        Basis other = (Basis) o;
        return kind == other.kind && order == other.order && Arrays.equals(knots, other.knots);
    }

    @Override
    public int hashCode() {
        return 31 * (31 * kind.hashCode() + order) + Arrays.hashCode(knots);
    }

    @Override
    public String toString() {
        switch (kind) {
            case SPLINE:
                return "splines(order " + order + ", " + (knots.length - 2) + " interior knots, K=" + size + ")";
            case POLYNOMIAL:
                return "polynomials(degree " + order + ", K=" + size + ")";
            default:
                return "steps(" + (knots.length - 1) + " bins, K=" + size + ")";
        }
    }
}
