package io.densa.core;

import java.util.Arrays;
import java.util.Objects;
import io.densa.core.DistributionFunctions.Shape;

/**
 * A probability density as a point of a {@link BayesSpace}: the space plus its K coordinates
 * c_k = ⟨clr f, e_k⟩_P.
 *
 * <p>The vector-space operations are exact coordinate operations: f ⊕ g ↦ c_f + c_g (equal to the
 * normalised pointwise product f g / ∫ f g dP), α ⊙ f ↦ α c_f (the normalised f^α), ⟨f, g⟩_B =
 * c_f · c_g. Evaluations (pdf, cdf, quantile, moments) use the space's quadrature; see
 * {@link BayesSpace}.
 *
 * <h2>Evaluation rule (the same for {@link DensitySet})</h2>
 * <ul>
 * <li><b>Evaluation points may lie anywhere.</b> {@link #pdf}, {@link #cdf} and
 * {@link #tailProbability} accept every x that is not NaN, also outside the domain [a, b] and
 * ±∞: the pdf is 0 there, the cdf 0 at or below a and 1 at or above b, the tail probability 1
 * below a and 0 at or above b. {@link #clr} and {@link #logPdf} exist on [a, b] only (the clr
 * is not defined outside, and the log pdf would be −∞) and throw
 * {@link IllegalArgumentException} for x outside [a, b].</li>
 * <li><b>Probabilities must be probabilities.</b> {@link #quantile} accepts p in [0, 1]
 * (quantile(0) = a, quantile(1) = b) and throws {@link IllegalArgumentException} for any other p,
 * NaN included.</li>
 * <li><b>No result is ±∞ or NaN.</b> A value beyond the double range (the squared norm or an
 * inner product of coordinates near 1e154 and above, a norm or distance above 1.8e308, a pdf
 * value above the largest double) throws {@link IllegalArgumentException} or
 * {@link DensaException} saying so; {@link #norm()} and {@link #distance} scale their sums, so
 * they work up to that limit.</li>
 * <li><b>Coordinates evaluation can resolve.</b> pdf, cdf, quantile and moments need the clr
 * to be computable to within 0.01 in double precision; coordinates so large that its rounding
 * error exceeds that (on a unit domain, about 1e12 and above) throw {@link DensaException},
 * which says how much smaller they would have to be. Below that limit sharply peaked densities are
 * integrated adaptively (see {@link BayesSpace}).</li>
 * </ul>
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
                    throw new IllegalArgumentException("coordinate " + i + " of the result is " + c[i]
                            + ": the operation leaves the double range (coordinates up to " + Double.MAX_VALUE
                            + " in magnitude are representable)");
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
        space.requireSame(g.space, "density");
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

    /**
     * B2 inner product ⟨f, g⟩_B = ∫ clr f clr g dP.
     *
     * @throws IllegalArgumentException if the value is beyond the double range (coordinates near
     *                                  1e154 and above)
     */
    public double inner(Density g) {
        double[] gc = other(g).c;
        double s = 0;
        for (int i = 0; i < c.length; i++) {
            s += c[i] * gc[i];
        }
        if (!Double.isFinite(s)) {
            throw outOfRange("inner product", s);
        }
        return s;
    }

    /**
     * Squared B2 norm.
     *
     * @throws IllegalArgumentException if it is beyond the double range ({@link #norm()} is not)
     */
    public double normSq() {
        double s = sumSq(c, null);
        if (s == Double.POSITIVE_INFINITY) {
            throw outOfRange("squared norm", s);
        }
        return s;
    }

    /**
     * B2 norm: a plain sum of squares, redone with scaling when it overflows or underflows (as LAPACK's dnrm2 scales; Blue (1978), A portable Fortran
     * program to find the Euclidean norm of a vector, ACM TOMS 4(1) — from memory).
     *
     * @throws IllegalArgumentException only if the norm exceeds the largest double (coordinates
     *                                  near 1.8e308)
     */
    public double norm() {
        double r = scaledNorm(c, null);
        if (r == Double.POSITIVE_INFINITY) {
            throw outOfRange("norm", r);
        }
        return r;
    }

    /**
     * Squared B2 distance ‖f ⊖ g‖²_B.
     *
     * @throws IllegalArgumentException if it is beyond the double range ({@link #distance} is not,
     *                                  unless the distance itself is)
     */
    public double distanceSq(Density g) {
        double s = sumSq(c, other(g).c);
        if (s == Double.POSITIVE_INFINITY) {
            throw outOfRange("squared distance", s);
        }
        return s;
    }

    /**
     * B2 distance ‖f ⊖ g‖_B, scaled like {@link #norm()}.
     *
     * @throws IllegalArgumentException only if the distance exceeds the largest double (coordinates
     *                                  of opposite sign near 1e308)
     */
    public double distance(Density g) {
        double d = scaledNorm(c, other(g).c);
        if (d == Double.POSITIVE_INFINITY) {
            throw outOfRange("distance", d);
        }
        return d;
    }

    /** Σ (x_i − y_i)² (y null: Σ x_i²), unscaled. */
    private static double sumSq(double[] x, double[] y) {
        double s = 0;
        for (int i = 0; i < x.length; i++) {
            double d = y == null ? x[i] : x[i] - y[i];
            s += d * d;
        }
        return s;
    }

    /** Sums of squares below this may have lost terms to underflow. */
    private static final double SMALL_SUM = 0x1p-900;

    /**
     * ‖x − y‖ (y null: ‖x‖): the plain sum of squares when it lies in [2^−900, ∞), else m times
     * the root of the sum of squares of d_i/m, m the largest |d_i|, d_i = x_i − y_i (formed from
     * halves after an overflow, so that the difference itself cannot overflow). +∞ only if the
     * result exceeds the largest double.
     */
    static double scaledNorm(double[] x, double[] y) {
        double s = sumSq(x, y);
        if (s >= SMALL_SUM && s < Double.POSITIVE_INFINITY) {
            return Math.sqrt(s);
        }
        boolean halve = y != null && s == Double.POSITIVE_INFINITY;
        double m = 0;
        for (int i = 0; i < x.length; i++) {
            m = Math.max(m, Math.abs(difference(x, y, i, halve)));
        }
        if (m == 0) {
            return 0.0;
        }
        double t = 0;
        for (int i = 0; i < x.length; i++) {
            double d = difference(x, y, i, halve) / m;
            t += d * d;
        }
        double r = m * Math.sqrt(t);
        return halve ? 2 * r : r;
    }

    private static double difference(double[] x, double[] y, int i, boolean halve) {
        return y == null ? x[i] : halve ? 0.5 * x[i] - 0.5 * y[i] : x[i] - y[i];
    }

    private static IllegalArgumentException outOfRange(String what, double value) {
        return new IllegalArgumentException("the " + what + " is " + value + ": beyond the double range"
                + " (largest " + Double.MAX_VALUE + ") for these coordinates; values up to about 1e154 in"
                + " magnitude are accepted here (norm() and distance() scale: they accept coordinates up to"
                + " about 1e307)");
    }

    // ------------------------------------------------------------- evaluation

    /**
     * The clr function at x (on a periodic space, any finite x, taken modulo the period).
     *
     * @throws IllegalArgumentException if x is outside the domain [a, b] or NaN (the clr is
     *                                  defined on the domain only), or if the value is beyond the
     *                                  double range (coordinates near 1e308)
     */
    public double clr(double x) {
        space.checkPoint(x);
        return finiteClr(clrAt(raw(), x, new double[space.scratchSize()]), x);
    }

    private double finiteClr(double v, double x) {
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException("the clr at x = " + x + " is " + v + ": beyond the double range for"
                    + " these coordinates (norm " + String.format("%.3g", Density.scaledNorm(c, null)) + ")");
        }
        return v;
    }

    /**
     * The clr function at many points (fresh array).
     *
     * @param xs points in [a, b] (not modified)
     * @throws IllegalArgumentException naming the first point outside the domain
     */
    public double[] clr(double[] xs) {
        double[] r = raw();
        double[] scratch = new double[space.scratchSize()];
        double[] out = new double[xs.length];
        for (int i = 0; i < xs.length; i++) {
            space.checkPoint(xs[i]);
            out[i] = finiteClr(clrAt(r, xs[i], scratch), xs[i]);
        }
        return out;
    }

    /**
     * Natural log of the Lebesgue pdf at x (on a periodic space, any finite x, taken modulo the period).
     *
     * @throws IllegalArgumentException if x is outside the domain [a, b] or NaN (the log pdf is −∞
     *                                  outside the domain)
     * @throws DensaException           if the coordinates are too large to evaluate (see the class
     *                                  description)
     */
    public double logPdf(double x) {
        return space.logPdf(shape(), x, new double[space.scratchSize()]);
    }

    /**
     * Lebesgue pdf at x: 0 outside the domain (on a periodic space, x is taken modulo the period).
     *
     * @throws IllegalArgumentException if x is NaN
     * @throws DensaException           if the value exceeds the largest double ({@link #logPdf} gives
     *                                  its logarithm) or the coordinates are too large to evaluate
     */
    public double pdf(double x) {
        return space.pdf(shape(), x, new double[space.scratchSize()]);
    }

    /**
     * Lebesgue pdf at many points (fresh array), each as {@link #pdf(double)}.
     *
     * @param xs points, anywhere but NaN (not modified)
     */
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
     * Cumulative distribution function P(X ≤ x): 0 for x ≤ a, 1 for x ≥ b (x may be ±∞),
     * non-decreasing. On a periodic space it is measured from the cut point a, and x outside
     * [a, b] is taken modulo the period (see {@link #cdfFrom} for another cut point).
     *
     * @throws IllegalArgumentException if x is NaN
     * @throws DensaException           if the coordinates are too large to evaluate
     */
    public double cdf(double x) {
        return space.cdf(shape(), x, new double[space.scratchSize()]);
    }

    /**
     * Quantile: the x in [a, b] with cdf(x) = p, to within a couple of double spacings of x (so |cdf(x) − p| is about
     * pdf(x)·ulp(x) at worst); the upper half
     * p &gt; 1/2 is solved on the upper tail 1 − p so that both tails keep relative accuracy.
     * quantile(0) = a and quantile(1) = b.
     *
     * @throws IllegalArgumentException if p is not in [0, 1] (NaN included)
     * @throws DensaException           if the coordinates are too large to evaluate
     */
    public double quantile(double p) {
        return space.quantile(shape(), p, new double[space.scratchSize()]);
    }

    /**
     * Mean E[X], in [a, b] (on a periodic space, of the position measured from the cut point a; the
     * summary that does not depend on the cut is {@link #circularMean()}).
     *
     * @throws DensaException if the coordinates are too large to evaluate
     */
    public double mean() {
        Shape s = shape();
        double[] nodesClr = new double[space.nodeCount()];
        space.clrAtNodes(c, 0, nodesClr);
        return space.mean(s, nodesClr);
    }

    /**
     * Variance Var[X] (≥ 0).
     *
     * @throws DensaException if the coordinates are too large to evaluate
     */
    public double variance() {
        Shape s = shape();
        double[] nodesClr = new double[space.nodeCount()];
        space.clrAtNodes(c, 0, nodesClr);
        return space.variance(s, nodesClr);
    }

    /**
     * Upper tail probability P(X &gt; t) = 1 − cdf(t), computed from the right so that small tails
     * keep their relative accuracy: 1 for t below the domain, 0 for t ≥ b (t may be ±∞).
     *
     * @throws IllegalArgumentException if t is NaN
     * @throws DensaException           if the coordinates are too large to evaluate
     */
    public double tailProbability(double t) {
        return space.tail(shape(), t, new double[space.scratchSize()]);
    }

    // ------------------------------------------------------------- circular summaries

    /**
     * Mean direction of a density on a circle (a {@link BayesSpace#isPeriodic() periodic} space): with
     * θ = 2π(x − a)/P, the angle μ of the first trigonometric moment E[cos θ] + i E[sin θ] = R e^{iμ}
     * (Mardia &amp; Jupp (2000), Directional Statistics, Wiley, chapter 2, from memory), returned as the position
     * a + μP/(2π) in [a, a + P).
     *
     * @throws IllegalStateException if the space is not periodic, or if R &lt; 1e-12 (a density as
     *                               flat as the uniform one has no mean direction)
     * @throws DensaException        if the coordinates are too large to evaluate
     */
    public double circularMean() {
        double[] m = trigMoments("circularMean");
        double r = Math.hypot(m[0], m[1]);
        if (!(r >= 1e-12)) {
            throw new IllegalStateException("the mean resultant length of " + this + " is " + r + " (below 1e-12):"
                    + " the density is uniform on the circle to rounding and has no mean direction; check"
                    + " meanResultantLength() first");
        }
        double theta = Math.atan2(m[1], m[0]);
        return space.wrap(space.lower() + (theta < 0 ? theta + 2 * Math.PI : theta) / (2 * Math.PI) * space.period());
    }

    /**
     * Mean resultant length R = |E[e^{iθ}]| in [0, 1], θ = 2π(x − a)/P, of a density on a circle: 0
     * for the uniform density, near 1 for a concentrated one (Mardia &amp; Jupp (2000), Directional
     * Statistics, Wiley, chapter 2, from memory); for the von Mises density R = I₁(κ)/I₀(κ).
     *
     * @throws IllegalStateException if the space is not periodic
     * @throws DensaException        if the coordinates are too large to evaluate
     */
    public double meanResultantLength() {
        double[] m = trigMoments("meanResultantLength");
        return Math.min(1.0, Math.hypot(m[0], m[1]));
    }

    private double[] trigMoments(String what) {
        requirePeriodic(what);
        Shape s = shape();
        double[] nodesClr = new double[space.nodeCount()];
        space.clrAtNodes(c, 0, nodesClr);
        return space.trigMoments(s, nodesClr);
    }

    private void requirePeriodic(String what) {
        if (!space.isPeriodic()) {
            throw new IllegalStateException(what + " needs a density on a circle, but " + space + " is not periodic;"
                    + " periodic spaces come from BayesSpace.periodicSplines or BayesSpace.fourier");
        }
    }

    /**
     * Probability of the arc from the cut point going forward around the circle to x: with c and y
     * the positions of cut and x in [a, a + P), F(y) − F(c) if y ≥ c, else P(X &gt; c) + F(y) (F =
     * {@link #cdf}, measured from a). x = cut gives 0, x a whole number of turns after cut gives 1.
     *
     * @throws IllegalStateException    if the space is not periodic
     * @throws IllegalArgumentException if cut or x is NaN or infinite
     */
    public double cdfFrom(double cut, double x) {
        requirePeriodic("cdfFrom");
        checkFinite(cut, "cut point");
        checkFinite(x, "x");
        double c0 = space.wrap(cut), y = space.wrap(x);
        Shape s = shape();
        double[] scratch = new double[space.scratchSize()];
        if (y == c0) {
            return x > cut ? 1.0 : 0.0;
        }
        double v = y > c0 ? space.cdf(s, y, scratch) - space.cdf(s, c0, scratch)
                : space.tail(s, c0, scratch) + space.cdf(s, y, scratch);
        return Math.min(1.0, Math.max(0.0, v));
    }

    /**
     * The position x in [a, a + P) with {@link #cdfFrom cdfFrom(cut, x)} = p: the quantile measured
     * from the cut point. quantileFrom(cut, 0) and quantileFrom(cut, 1) are the cut point itself (its
     * position in [a, a + P)).
     *
     * @throws IllegalStateException    if the space is not periodic
     * @throws IllegalArgumentException if cut is NaN or infinite, or p is not in [0, 1]
     */
    public double quantileFrom(double cut, double p) {
        requirePeriodic("quantileFrom");
        checkFinite(cut, "cut point");
        space.checkProbability(p);
        double c0 = space.wrap(cut);
        if (p == 0 || p == 1) {
            return c0;
        }
        Shape s = shape();
        double[] scratch = new double[space.scratchSize()];
        double above = space.tail(s, c0, scratch); // mass of [c0, b)
        double x = p <= above ? space.quantile(s, Math.min(1.0, space.cdf(s, c0, scratch) + p), scratch)
                : space.quantile(s, p - above, scratch);
        return space.wrap(x);
    }

    private static void checkFinite(double v, String what) {
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException("the " + what + " is " + v + "; finite values are accepted (taken"
                    + " modulo the period)");
        }
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
        return other != null && space.equals(other.space) && scaledNorm(c, other.c) <= tolerance;
    }

    /** Exact equality: equal spaces and bit-identical coordinates. */
    @Override
    public boolean equals(Object o) {
        return this == o || o instanceof Density d
                && space.equals(d.space) && Arrays.equals(c, d.c);
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
