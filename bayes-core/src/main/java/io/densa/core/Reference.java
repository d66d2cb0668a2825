package io.densa.core;

import java.util.Objects;
import java.util.function.DoubleUnaryOperator;

/**
 * The reference measure P of a Bayes space on a bounded domain [a, b].
 *
 * <p>Convention (pinned for the whole library): the default reference is <b>Lebesgue
 * measure</b> on [a, b], so P(I) = b − a and the B2 inner product is
 * ⟨f, g⟩_B = ∫_a^b clr f(x) clr g(x) dx. {@link #uniform()} is the uniform
 * <em>probability</em> measure dx/(b − a): the clr is the same, inner products are divided by
 * b − a and distances by √(b − a). A weighted reference ({@link #normal}, {@link #beta},
 * {@link #weight}) is the given weight renormalised to a probability measure on [a, b]; a
 * density equal to that weight is then the neutral element (Talská et al. (2020), Weighting the
 * domain of probability densities in functional data analysis, Stat 9:e283).
 *
 * <p>Immutable and thread-safe. Equality is by kind and parameters; a custom weight compares
 * by its name and by the identity of its function object.
 */
public final class Reference {
    /** The kind of reference measure. */
    public enum Kind {
        /** Lebesgue measure dx on [a, b] (the default). */
        LEBESGUE,
        /** Uniform probability dx / (b − a). */
        UNIFORM,
        /** Normal density truncated to [a, b]. */
        NORMAL,
        /** Beta density mapped affinely onto [a, b]. */
        BETA,
        /** A user-given positive weight function. */
        CUSTOM
    }

    private static final Reference LEBESGUE = new Reference(Kind.LEBESGUE, 0, 0, null, "lebesgue");
    private static final Reference UNIFORM = new Reference(Kind.UNIFORM, 0, 0, null, "uniform");

    private final Kind kind;
    private final double p1;
    private final double p2;
    private final DoubleUnaryOperator weight;
    private final String name;

    private Reference(Kind kind, double p1, double p2, DoubleUnaryOperator weight, String name) {
        this.kind = kind;
        this.p1 = p1;
        this.p2 = p2;
        this.weight = weight;
        this.name = name;
    }

    /** Lebesgue measure on the domain: P(I) = b − a (the default). */
    public static Reference lebesgue() {
        return LEBESGUE;
    }

    /** Uniform probability measure dx / (b − a): P(I) = 1. */
    public static Reference uniform() {
        return UNIFORM;
    }

    /**
     * Normal density N(mean, sd²) truncated to the domain and renormalised.
     *
     * @throws IllegalArgumentException if mean is not finite or sd is not finite and positive
     */
    public static Reference normal(double mean, double sd) {
        if (!Double.isFinite(mean)) {
            throw new IllegalArgumentException("normal reference: mean must be finite, got " + mean);
        }
        if (!(sd > 0 && Double.isFinite(sd))) {
            throw new IllegalArgumentException("normal reference: sd must be finite and > 0, got " + sd);
        }
        return new Reference(Kind.NORMAL, mean, sd, null, "normal(" + mean + ", " + sd + ")");
    }

    /**
     * Beta(α, β) density mapped affinely onto the domain. Shapes must be ≥ 1 so that the weight is
     * bounded and the space's Gauss–Legendre quadrature integrates it accurately.
     *
     * @throws IllegalArgumentException if a shape is below 1 or not finite
     */
    public static Reference beta(double alpha, double beta) {
        if (!(alpha >= 1 && Double.isFinite(alpha)) || !(beta >= 1 && Double.isFinite(beta))) {
            throw new IllegalArgumentException("beta reference: shapes must be finite and >= 1, got alpha="
                    + alpha + ", beta=" + beta);
        }
        return new Reference(Kind.BETA, alpha, beta, null, "beta(" + alpha + ", " + beta + ")");
    }

    /**
     * A custom weight w(x) (Lebesgue density of P up to a constant), renormalised to a probability
     * measure on the domain. It must be finite and positive at every quadrature node of the space;
     * the space checks this when built.
     *
     * @param name   a label used in {@code toString} and equality
     * @param weight the weight function (not copied; must be thread-safe and deterministic)
     */
    public static Reference weight(String name, DoubleUnaryOperator weight) {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(weight, "weight");
        return new Reference(Kind.CUSTOM, 0, 0, weight, name);
    }

    /** The kind of this reference. */
    public Kind kind() {
        return kind;
    }

    /**
     * The parameters of a normal (mean, sd) or beta (α, β) reference; an empty array for the
     * Lebesgue, uniform and custom references (a fresh copy). With {@link #kind()} they rebuild an
     * equal reference through {@link #normal} or {@link #beta}.
     */
    public double[] parameters() {
        return kind == Kind.NORMAL || kind == Kind.BETA ? new double[] {p1, p2} : new double[0];
    }

    /** True for Lebesgue and uniform references (weight constant on the domain). */
    public boolean isFlat() {
        return kind == Kind.LEBESGUE || kind == Kind.UNIFORM;
    }

    /** Unnormalised weight at x on [a, b]. */
    double rawWeight(double x, double a, double b) {
        switch (kind) {
            case LEBESGUE:
                return 1.0;
            case UNIFORM:
                return 1.0 / (b - a);
            case NORMAL: {
                double z = (x - p1) / p2;
                return Math.exp(-0.5 * z * z);
            }
            case BETA: {
                double u = (x - a) / (b - a);
                u = Math.min(1, Math.max(0, u));
                return Math.pow(u, p1 - 1) * Math.pow(1 - u, p2 - 1);
            }
            default:
                return weight.applyAsDouble(x);
        }
    }

    @Override
    public boolean equals(Object o) {
        return this == o || o instanceof Reference r
                && kind == r.kind && Double.compare(p1, r.p1) == 0 && Double.compare(p2, r.p2) == 0
                && name.equals(r.name) && weight == r.weight;
    }

    @Override
    public int hashCode() {
        return Objects.hash(kind, p1, p2, name, weight == null ? 0 : System.identityHashCode(weight));
    }

    @Override
    public String toString() {
        return name;
    }
}
