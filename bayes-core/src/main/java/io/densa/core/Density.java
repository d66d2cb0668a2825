package io.densa.core;

import java.util.Arrays;
import java.util.Objects;

/**
 * A probability density as a point of a {@link BayesSpace}: the space plus its K coordinates
 * c_k = ⟨clr f, e_k⟩_P.
 *
 * <p>The vector-space operations are exact coordinate operations: f ⊕ g ↦ c_f + c_g (equal to the
 * normalised pointwise product f g / ∫ f g dP), α ⊙ f ↦ α c_f (the normalised f^α), ⟨f, g⟩_B =
 * c_f · c_g. Evaluations (pdf, cdf, quantile, moments) use the space's quadrature; see
 * {@link BayesSpace}.
 *
 * <p>Immutable and thread-safe (derived quantities are cached lazily, idempotently). Arrays
 * passed in are copied and arrays returned are fresh. {@link #equals} is exact (same space and
 * bit-identical coordinates); use {@link #equalsWithin} for a tolerance comparison. Mixing
 * densities of different spaces throws {@link IllegalArgumentException} naming both spaces.
 */
public final class Density {
    private final BayesSpace space;
    private final double[] c;
    private volatile Shape shape;
    private volatile double[] raw; // raw-function coefficients, then the offset (clr needs no normaliser)

    Density(BayesSpace space, double[] coordinates, boolean check) {
        this.space = space;
        this.c = coordinates;
        if (check) {
            for (int i = 0; i < c.length; i++) {
                if (!Double.isFinite(c[i])) {
                    throw new IllegalArgumentException("coordinate " + i + " is not finite: " + c[i]);
                }
            }
        }
    }

    /** The space this density belongs to. */
    public BayesSpace space() {
        return space;
    }

    /** Dimension K. */
    public int dimension() {
        return c.length;
    }

    /** The coordinates (a fresh copy). */
    public double[] coordinates() {
        return c.clone();
    }

    /** Coordinate k (0-based). */
    public double coordinate(int k) {
        return c[k];
    }

    double[] coordinatesInternal() {
        return c;
    }

    Shape shape() {
        Shape s = shape;
        if (s == null) {
            s = space.shape(c, 0, null);
            shape = s;
        }
        return s;
    }

    /** Raw-function coefficients b (K values) followed by the offset, so clr(x) = φ(x)·b − offset. */
    private double[] raw() {
        double[] r = raw;
        if (r == null) {
            r = new double[c.length + 1];
            r[c.length] = space.rawCoefficients(c, 0, r);
            raw = r;
        }
        return r;
    }

    private double clrAt(double[] r, double x, double[] scratch) {
        return space.basis().combine(x, r, scratch) - r[c.length];
    }

    // ------------------------------------------------------------- algebra

    private Density other(Density g) {
        Objects.requireNonNull(g, "density");
        space.requireSame(g.space);
        return g;
    }

    /** Perturbation f ⊕ g (normalised pointwise product). */
    public Density perturb(Density g) {
        double[] gc = other(g).c;
        double[] r = new double[c.length];
        for (int i = 0; i < r.length; i++) {
            r[i] = c[i] + gc[i];
        }
        return new Density(space, r, true);
    }

    /**
     * Powering α ⊙ f (normalised f^α).
     *
     * @throws IllegalArgumentException if α is NaN or infinite
     */
    public Density power(double alpha) {
        if (!Double.isFinite(alpha)) {
            throw new IllegalArgumentException("power must be finite, got " + alpha);
        }
        double[] r = new double[c.length];
        for (int i = 0; i < r.length; i++) {
            r[i] = alpha * c[i];
        }
        return new Density(space, r, true);
    }

    /** The inverse ⊖f = (−1) ⊙ f, so f ⊕ ⊖f is the neutral element. */
    public Density inverse() {
        return power(-1.0);
    }

    /** Difference f ⊖ g = f ⊕ (⊖g). */
    public Density minus(Density g) {
        double[] gc = other(g).c;
        double[] r = new double[c.length];
        for (int i = 0; i < r.length; i++) {
            r[i] = c[i] - gc[i];
        }
        return new Density(space, r, true);
    }

    /** B2 inner product ⟨f, g⟩_B = ∫ clr f clr g dP. */
    public double inner(Density g) {
        double[] gc = other(g).c;
        double s = 0;
        for (int i = 0; i < c.length; i++) {
            s += c[i] * gc[i];
        }
        return s;
    }

    /** Squared B2 norm. */
    public double normSq() {
        double s = 0;
        for (double v : c) {
            s += v * v;
        }
        return s;
    }

    /** B2 norm. */
    public double norm() {
        return Math.sqrt(normSq());
    }

    /** Squared B2 distance ‖f ⊖ g‖²_B. */
    public double distanceSq(Density g) {
        double[] gc = other(g).c;
        double s = 0;
        for (int i = 0; i < c.length; i++) {
            double d = c[i] - gc[i];
            s += d * d;
        }
        return s;
    }

    /** B2 distance ‖f ⊖ g‖_B. */
    public double distance(Density g) {
        return Math.sqrt(distanceSq(g));
    }

    // ------------------------------------------------------------- evaluation

    /**
     * The clr function at x.
     *
     * @throws IllegalArgumentException if x is outside the domain or NaN
     */
    public double clr(double x) {
        space.checkPoint(x);
        return clrAt(raw(), x, new double[space.scratchSize()]);
    }

    /** The clr function at many points (fresh array). */
    public double[] clr(double[] xs) {
        double[] r = raw();
        double[] scratch = new double[space.scratchSize()];
        double[] out = new double[xs.length];
        for (int i = 0; i < xs.length; i++) {
            space.checkPoint(xs[i]);
            out[i] = clrAt(r, xs[i], scratch);
        }
        return out;
    }

    /**
     * Natural log of the Lebesgue pdf at x.
     *
     * @throws IllegalArgumentException if x is outside the domain or NaN
     */
    public double logPdf(double x) {
        space.checkPoint(x);
        Shape s = shape();
        return Math.log(space.referenceDensity(x)) + space.clrRaw(s, x, new double[space.scratchSize()]) - s.logZ;
    }

    /** Lebesgue pdf at x (0 outside the domain). */
    public double pdf(double x) {
        return space.pdf(shape(), x, new double[space.scratchSize()]);
    }

    /** Lebesgue pdf at many points (fresh array). */
    public double[] pdf(double[] xs) {
        Shape s = shape();
        double[] scratch = new double[space.scratchSize()];
        double[] out = new double[xs.length];
        for (int i = 0; i < xs.length; i++) {
            out[i] = space.pdf(s, xs[i], scratch);
        }
        return out;
    }

    /**
     * Cumulative distribution function P(X ≤ x): 0 for x ≤ a, 1 for x ≥ b, non-decreasing.
     *
     * @throws IllegalArgumentException if x is NaN
     */
    public double cdf(double x) {
        return space.cdf(shape(), x, new double[space.scratchSize()]);
    }

    /**
     * Quantile: the x in [a, b] with cdf(x) = p, to within a couple of double spacings of x (so |cdf(x) − p| is about
     * pdf(x)·ulp(x) at worst); the upper half
     * p &gt; 1/2 is solved on the upper tail 1 − p so that both tails keep relative accuracy.
     *
     * @throws IllegalArgumentException if p is not in (0, 1)
     */
    public double quantile(double p) {
        return space.quantile(shape(), p, new double[space.scratchSize()]);
    }

    /** Mean E[X]. */
    public double mean() {
        Shape s = shape();
        double[] nodesClr = new double[space.nodeCount()];
        space.clrAtNodes(c, 0, nodesClr);
        return space.mean(s, nodesClr);
    }

    /** Variance Var[X]. */
    public double variance() {
        Shape s = shape();
        double[] nodesClr = new double[space.nodeCount()];
        space.clrAtNodes(c, 0, nodesClr);
        return space.variance(s, nodesClr);
    }

    /**
     * Upper tail probability P(X &gt; t) = 1 − cdf(t), computed from the right so that small tails
     * keep their relative accuracy.
     *
     * @throws IllegalArgumentException if t is NaN
     */
    public double tailProbability(double t) {
        return space.tail(shape(), t, new double[space.scratchSize()]);
    }

    // ------------------------------------------------------------- identity

    /**
     * Tolerance comparison: same space and B2 distance ≤ tolerance.
     *
     * @throws IllegalArgumentException if tolerance is negative or NaN
     */
    public boolean equalsWithin(Density other, double tolerance) {
        if (!(tolerance >= 0)) {
            throw new IllegalArgumentException("tolerance must be >= 0, got " + tolerance);
        }
        return other != null && space.equals(other.space) && distance(other) <= tolerance;
    }

    /** Exact equality: equal spaces and bit-identical coordinates. */
    @Override
    public boolean equals(Object o) {
        if (this == o) {
            return true;
        }
        if (!(o instanceof Density)) {
            return false;
        }
        Density d = (Density) o;
        return space.equals(d.space) && Arrays.equals(c, d.c);
    }

    @Override
    public int hashCode() {
        return 31 * space.hashCode() + Arrays.hashCode(c);
    }

    @Override
    public String toString() {
        StringBuilder sb = new StringBuilder("Density[");
        int n = Math.min(c.length, 6);
        for (int i = 0; i < n; i++) {
            if (i > 0) {
                sb.append(", ");
            }
            sb.append(String.format("%.6g", c[i]));
        }
        if (c.length > n) {
            sb.append(", … (K=").append(c.length).append(')');
        }
        return sb.append("]").toString();
    }
}
