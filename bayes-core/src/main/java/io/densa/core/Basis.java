package io.densa.core;

import io.densa.core.internal.RawBasis;
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
 *   one dropped, K = D − 1;</li>
 *   <li>{@link Kind#PERIODIC_SPLINE}: on the circle [a, a + P), the N periodic B-splines of order k on
 *   N knots a = t_0 &lt; … &lt; t_{N−1} (equally spaced by default), continued around the circle; they sum to
 *   1 (partition of unity, de Boor (1978)), so the last one is dropped and K = N − 1;</li>
 *   <li>{@link Kind#FOURIER}: on the circle [a, a + P), cos(2πj(x − a)/P) and sin(2πj(x − a)/P),
 *   j = 1..H, K = 2H.</li>
 * </ul>
 * The two periodic kinds are evaluated at x modulo P.
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
        STEP,
        /** Periodic B-splines of a given order on equally spaced knots of a circle. */
        PERIODIC_SPLINE,
        /** Cosines and sines of the first H harmonics of a circle. */
        FOURIER
    }

    private final Kind kind;
    private final int order; // spline order, polynomial degree, harmonics, or 0 for steps
    private final double[] knots; // spline: a, interior..., b; step: edges; poly, fourier: a, b; periodic: all knots, b
    private final RawBasis raw;
    private final int size; // K

    private Basis(Kind kind, int order, double[] knots) {
        this.kind = kind;
        this.order = order;
        this.knots = knots;
        switch (kind) {
            case SPLINE:
                raw = RawBasis.spline(order, knots);
                break;
            case POLYNOMIAL:
                raw = RawBasis.polynomial(order, knots[0], knots[1]);
                break;
            case PERIODIC_SPLINE:
                raw = RawBasis.periodicSpline(order, knots);
                break;
            case FOURIER:
                raw = RawBasis.fourier(order, knots[0], knots[1]);
                break;
            default:
                raw = RawBasis.step(knots);
                break;
        }
        size = raw.size();
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

    static Basis periodicSpline(double a, double b, int order, int knotCount) {
        checkPeriodicSpline(order, knotCount);
        double[] k = new double[knotCount + 1];
        for (int i = 0; i < knotCount; i++) {
            k[i] = a + (b - a) * i / knotCount;
        }
        k[knotCount] = b;
        return new Basis(Kind.PERIODIC_SPLINE, order, k);
    }

    /** Periodic splines on the knots a = knots[0] &lt; knots[1] &lt; … &lt; b (not modified). */
    static Basis periodicSpline(double a, double b, int order, double[] knots) {
        Objects.requireNonNull(knots, "knots");
        checkPeriodicSpline(order, knots.length);
        double[] k = Arrays.copyOf(knots, knots.length + 1);
        k[knots.length] = b;
        for (int i = 0; i < knots.length; i++) {
            double t = knots[i];
            if (i == 0 && Double.compare(t, a) != 0) {
                throw new IllegalArgumentException("the first knot must be the cut point start = " + a + ", got " + t
                        + "; choose the start of the circle at a knot");
            }
            if (!(t >= a && t < b)) {
                throw new IllegalArgumentException("knot " + i + " = " + t + " lies outside the circle [" + a + ", " + b
                        + "); knots must be finite and in [start, start + period)");
            }
            if (i > 0 && !(t > knots[i - 1])) {
                throw new IllegalArgumentException("knots must be strictly increasing: knot " + i + " = " + t
                        + " follows " + knots[i - 1]);
            }
        }
        return new Basis(Kind.PERIODIC_SPLINE, order, k);
    }

    private static void checkPeriodicSpline(int order, int knotCount) {
        if (!(order >= 2 && order <= 12)) {
            throw new IllegalArgumentException("periodic spline order must be in [2, 12] (4 = cubic), got " + order);
        }
        if (!(knotCount >= Math.max(order, 3) && knotCount <= 100_000)) {
            throw new IllegalArgumentException("a periodic spline of order " + order + " needs between "
                    + Math.max(order, 3) + " and 100000 knots on the circle (at least the order, and 3), got "
                    + knotCount);
        }
    }

    static Basis fourier(double a, double b, int harmonics) {
        if (!(harmonics >= 1 && harmonics <= 200)) {
            throw new IllegalArgumentException("the number of harmonics must be in [1, 200], got " + harmonics);
        }
        return new Basis(Kind.FOURIER, harmonics, new double[] {a, b});
    }

    /** True for the bases on a circle ({@link Kind#PERIODIC_SPLINE}, {@link Kind#FOURIER}). */
    public boolean isPeriodic() {
        return kind == Kind.PERIODIC_SPLINE || kind == Kind.FOURIER;
    }

    /** The kind of basis. */
    public Kind kind() {
        return kind;
    }

    /** Spline order (4 = cubic, periodic splines too), polynomial degree, number of harmonics, or 0 for steps. */
    public int order() {
        return order;
    }

    /** Number of basis functions K (the space's dimension). */
    public int size() {
        return size;
    }

    /**
     * Breakpoints: the knots a, interior..., b of a spline basis, the bin edges of a step basis,
     * {a, b} for polynomials and Fourier functions, the N knots a = t_0 &lt; … &lt; t_{N−1} of periodic
     * splines followed by a + P = b (a fresh copy).
     */
    public double[] breakpoints() {
        return knots.clone();
    }

    /** The raw functions, for the kernels in {@code io.densa.core.internal}. */
    RawBasis raw() {
        return raw;
    }

    /** Number of nonzero raw functions at a point (local support width). */
    int supportWidth() {
        return raw.supportWidth();
    }

    /** Length of the scratch array {@link #evalLocal} and {@link #combine} need. */
    int scratchSize() {
        return raw.scratchSize();
    }

    /** See {@link RawBasis#evalLocal}. */
    int evalLocal(double x, double[] vals) {
        return raw.evalLocal(x, vals);
    }

    /** Dense raw values φ_1..φ_K at x. */
    void evalDense(double x, double[] out) {
        raw.evalDense(x, out);
    }

    /** Σ_j φ_j(x) coef[j], using local support. */
    double combine(double x, double[] coef, double[] scratch) {
        return raw.combine(x, coef, scratch);
    }

    @Override
    public boolean equals(Object o) {
        return this == o || o instanceof Basis other
                && kind == other.kind && order == other.order && Arrays.equals(knots, other.knots);
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
            case PERIODIC_SPLINE:
            case FOURIER:
                return raw.toString();
            default:
                return "steps(" + (knots.length - 1) + " bins, K=" + size + ")";
        }
    }
}
