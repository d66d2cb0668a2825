package io.densa.spark;

import io.densa.core.Basis;
import io.densa.core.BayesSpace;
import io.densa.core.Reference;
import java.io.Serializable;
import java.util.Arrays;
import java.util.Objects;

/**
 * The definition of a {@link BayesSpace} as primitives, to broadcast to Spark executors: the basis
 * kind, its order (spline order, polynomial degree or harmonics) and breakpoints (periodic spaces
 * included), and the reference measure
 * (Lebesgue, uniform, normal or beta with its two parameters). {@link #space()} rebuilds the space
 * once per JVM (a transient lazy field); the space is built by the same factory from the same
 * numbers, so executors hold a space equal to the driver's and compute exactly what it computes.
 *
 * <p>A space with a custom reference weight (a function) cannot be described this way.
 * Immutable; safe to share between threads.
 */
public final class SpaceSpec implements Serializable {
    private static final long serialVersionUID = 1L;

    private final Basis.Kind kind;
    private final int order;
    private final double[] breakpoints;
    private final Reference.Kind reference;
    private final double p1;
    private final double p2;
    private final PerJvm<BayesSpace> space = new PerJvm<>();

    private SpaceSpec(Basis.Kind kind, int order, double[] breakpoints, Reference.Kind reference, double p1, double p2) {
        this.kind = kind;
        this.order = order;
        this.breakpoints = breakpoints;
        this.reference = reference;
        this.p1 = p1;
        this.p2 = p2;
    }

    /**
     * The definition of a space: its basis and its reference measure (Lebesgue, uniform, normal or
     * beta, each described by its parameters).
     *
     * @throws IllegalArgumentException for a custom weight-function reference, which cannot be
     *                                  shipped as numbers
     */
    public static SpaceSpec of(BayesSpace space) {
        Objects.requireNonNull(space, "space");
        Reference.Kind r = space.reference().kind();
        if (r == Reference.Kind.CUSTOM) {
            throw new IllegalArgumentException("space " + space + " has the custom reference " + space.reference()
                    + "; a weight function cannot be shipped to executors as numbers: use a Lebesgue, uniform, normal"
                    + " (withNormalReference(mean, sd)) or beta (withBetaReference(alpha, beta)) reference");
        }
        double[] q = space.reference().parameters();
        Basis basis = space.basis();
        SpaceSpec spec = new SpaceSpec(basis.kind(), basis.order(), basis.breakpoints(), r, q.length > 0 ? q[0] : 0,
                q.length > 0 ? q[1] : 0);
        spec.check(space);
        return spec;
    }

    /** The same space with the normal reference N(mean, sd²) truncated to the domain. */
    public SpaceSpec withNormalReference(double mean, double sd) {
        Reference.normal(mean, sd);
        return new SpaceSpec(kind, order, breakpoints, Reference.Kind.NORMAL, mean, sd);
    }

    /** The same space with the beta reference Beta(alpha, beta) mapped onto the domain. */
    public SpaceSpec withBetaReference(double alpha, double beta) {
        Reference.beta(alpha, beta);
        return new SpaceSpec(kind, order, breakpoints, Reference.Kind.BETA, alpha, beta);
    }

    private void check(BayesSpace original) {
        BayesSpace rebuilt = space();
        if (!rebuilt.equals(original)) {
            throw new IllegalStateException("the space rebuilt from its definition (" + rebuilt + ") differs from "
                    + original);
        }
    }

    /** The space (built once per JVM from the definition). */
    public BayesSpace space() {
        return space.get(() -> build());
    }

    /** Dimension K of the space. */
    public int dimension() {
        return space().dimension();
    }

    /** The period P with a + P == b exactly, so that the rebuilt circle ends where the original did. */
    private static double period(double a, double b) {
        double p = b - a;
        for (int i = 0; i < 4 && a + p != b; i++) {
            p = a + p < b ? Math.nextUp(p) : Math.nextDown(p);
        }
        return p;
    }

    private BayesSpace build() {
        double a = breakpoints[0];
        double b = breakpoints[breakpoints.length - 1];
        BayesSpace s;
        switch (kind) {
            case SPLINE:
                s = BayesSpace.splines(a, b, order, Arrays.copyOfRange(breakpoints, 1, breakpoints.length - 1));
                break;
            case POLYNOMIAL:
                s = BayesSpace.polynomials(a, b, order);
                break;
            case PERIODIC_SPLINE:
                s = BayesSpace.periodicSplines(a, period(a, b), order, Arrays.copyOf(breakpoints, breakpoints.length - 1));
                break;
            case FOURIER:
                s = BayesSpace.fourier(a, period(a, b), order);
                break;
            default:
                s = BayesSpace.steps(breakpoints.clone());
                break;
        }
        switch (reference) {
            case UNIFORM:
                return s.withReference(Reference.uniform());
            case NORMAL:
                return s.withReference(Reference.normal(p1, p2));
            case BETA:
                return s.withReference(Reference.beta(p1, p2));
            default:
                return s;
        }
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof SpaceSpec && ((SpaceSpec) o).space().equals(space());
    }

    @Override
    public int hashCode() {
        return space().hashCode();
    }

    @Override
    public String toString() {
        return "SpaceSpec[" + space() + "]";
    }
}
