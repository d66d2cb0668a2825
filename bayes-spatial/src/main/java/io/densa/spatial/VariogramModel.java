package io.densa.spatial;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;
import java.util.Objects;
import org.apache.commons.math3.special.Gamma;

/**
 * An isotropic (trace-)semivariogram model γ(h), a nested sum of basic structures, each with a
 * partial sill c and a range parameter a. With t = h/a (Cressie (1993), Statistics for Spatial
 * Data, §2.3.1 — from memory; REFERENCES.md §8):
 * <ul>
 * <li>nugget: γ(h) = c for h &gt; 0, γ(0) = 0;</li>
 * <li>spherical: c (1.5 t − 0.5 t³) for t ≤ 1, c beyond; a is the range;</li>
 * <li>exponential: c (1 − e^{−3t}); <b>a is the practical range</b> (γ reaches 95% of c at
 *     h = a), so C(h) = 10 e^{−0.3h} is exponential(10, 10);</li>
 * <li>Gaussian: c (1 − e^{−3t²}); a is the practical range;</li>
 * <li>Matérn(ν): c (1 − 2^{1−ν}/Γ(ν) t^ν K_ν(t)); a is the scale φ (not a practical range), so
 *     Matérn(c, a, ½) equals exponential(c, 3a);</li>
 * <li>power: c h^ω with 0 &lt; ω &lt; 2 (unbounded; the "range" slot holds ω).</li>
 * </ul>
 * For a bounded model the covariance is C(h) = sill − γ(h), with C(0) = sill (the nugget
 * included), so kriging with a nugget interpolates exactly at data locations.
 *
 * <p>Immutable and thread-safe; {@code equals} is exact on the structure list.
 */
public final class VariogramModel {
    /** The basic structures. */
    public enum Family {
        /** Pure nugget. */
        NUGGET,
        /** Spherical. */
        SPHERICAL,
        /** Exponential (practical range). */
        EXPONENTIAL,
        /** Gaussian (practical range). */
        GAUSSIAN,
        /** Matérn with smoothness ν (scale parameter). */
        MATERN,
        /** Power c h^ω (unbounded). */
        POWER
    }

    /**
     * One structure of a nested model.
     *
     * @param family      the basic shape
     * @param partialSill c &gt; 0 (the coefficient for the power model)
     * @param range       a &gt; 0 (the exponent ω for the power model, NaN for the nugget)
     * @param smoothness  ν for Matérn, NaN otherwise
     */
    public record Structure(Family family, double partialSill, double range, double smoothness) {
    }

    private final Structure[] parts;
    private final double[] maternConst; // 2^{1−ν}/Γ(ν) per part (NaN if not Matérn)

    private VariogramModel(Structure[] parts) {
        this.parts = parts;
        this.maternConst = new double[parts.length];
        for (int i = 0; i < parts.length; i++) {
            Structure s = parts[i];
            maternConst[i] = s.family == Family.MATERN
                    ? Math.exp((1 - s.smoothness) * Math.log(2) - Gamma.logGamma(s.smoothness)) : Double.NaN;
        }
    }

    private static void positive(String what, double v) {
        if (!(v > 0) || Double.isInfinite(v)) {
            throw new IllegalArgumentException(what + " must be finite and > 0, got " + v);
        }
    }

    private static VariogramModel single(Family f, double c, double a, double nu) {
        return new VariogramModel(new Structure[] {new Structure(f, c, a, nu)});
    }

    /** A pure nugget c0 &gt; 0. */
    public static VariogramModel nugget(double c0) {
        positive("nugget", c0);
        return single(Family.NUGGET, c0, Double.NaN, Double.NaN);
    }

    /** Spherical with partial sill c and range a. */
    public static VariogramModel spherical(double c, double a) {
        positive("partial sill", c);
        positive("range", a);
        return single(Family.SPHERICAL, c, a, Double.NaN);
    }

    /** Exponential c (1 − e^{−3h/a}) with practical range a. */
    public static VariogramModel exponential(double c, double a) {
        positive("partial sill", c);
        positive("range", a);
        return single(Family.EXPONENTIAL, c, a, Double.NaN);
    }

    /** Gaussian c (1 − e^{−3h²/a²}) with practical range a. */
    public static VariogramModel gaussian(double c, double a) {
        positive("partial sill", c);
        positive("range", a);
        return single(Family.GAUSSIAN, c, a, Double.NaN);
    }

    /**
     * Matérn with partial sill c, scale a and smoothness ν.
     *
     * @throws IllegalArgumentException unless c, a &gt; 0 and 0 &lt; ν ≤ 50
     */
    public static VariogramModel matern(double c, double a, double nu) {
        positive("partial sill", c);
        positive("range", a);
        if (!(nu > 0 && nu <= 50)) {
            throw new IllegalArgumentException("Matern smoothness must be in (0, 50], got " + nu);
        }
        return single(Family.MATERN, c, a, nu);
    }

    /**
     * Power model c h^ω.
     *
     * @throws IllegalArgumentException unless c &gt; 0 and 0 &lt; ω &lt; 2
     */
    public static VariogramModel power(double c, double exponent) {
        positive("power coefficient", c);
        if (!(exponent > 0 && exponent < 2)) {
            throw new IllegalArgumentException("power exponent must be in (0, 2), got " + exponent);
        }
        return single(Family.POWER, c, exponent, Double.NaN);
    }

    /** The single structure of the given family with parameters (c, a, ν); used by fitting. */
    static VariogramModel of(Family f, double c, double a, double nu) {
        switch (f) {
            case NUGGET: return nugget(c);
            case SPHERICAL: return spherical(c, a);
            case EXPONENTIAL: return exponential(c, a);
            case GAUSSIAN: return gaussian(c, a);
            case MATERN: return matern(c, a, nu);
            default: return power(c, a);
        }
    }

    /** The nested sum of this model and another. */
    public VariogramModel plus(VariogramModel other) {
        Objects.requireNonNull(other, "other");
        Structure[] p = Arrays.copyOf(parts, parts.length + other.parts.length);
        System.arraycopy(other.parts, 0, p, parts.length, other.parts.length);
        return new VariogramModel(p);
    }

    /** This model plus a nugget c0 (returns this model unchanged when c0 = 0). */
    public VariogramModel withNugget(double c0) {
        if (c0 == 0) {
            return this;
        }
        return plus(nugget(c0));
    }

    /** The structures (unmodifiable). */
    public List<Structure> structures() {
        return Collections.unmodifiableList(new ArrayList<>(Arrays.asList(parts)));
    }

    /** True unless a power structure is present. */
    public boolean bounded() {
        for (Structure s : parts) {
            if (s.family == Family.POWER) {
                return false;
            }
        }
        return true;
    }

    /** Total nugget (sum of nugget structures). */
    public double nugget() {
        double s = 0;
        for (Structure p : parts) {
            if (p.family == Family.NUGGET) {
                s += p.partialSill;
            }
        }
        return s;
    }

    /** Total sill (sum of partial sills), +∞ for an unbounded model. */
    public double sill() {
        if (!bounded()) {
            return Double.POSITIVE_INFINITY;
        }
        double s = 0;
        for (Structure p : parts) {
            s += p.partialSill;
        }
        return s;
    }

    /**
     * γ(h).
     *
     * @throws IllegalArgumentException if h is negative or NaN
     */
    public double gamma(double h) {
        if (!(h >= 0)) {
            throw new IllegalArgumentException("lag must be >= 0, got " + h);
        }
        return gammaUnchecked(h);
    }

    double gammaUnchecked(double h) {
        if (h == 0) {
            return 0;
        }
        double g = 0;
        for (int i = 0; i < parts.length; i++) {
            Structure s = parts[i];
            double c = s.partialSill;
            switch (s.family) {
                case NUGGET:
                    g += c;
                    break;
                case SPHERICAL: {
                    double t = h / s.range;
                    g += t >= 1 ? c : c * (1.5 * t - 0.5 * t * t * t);
                    break;
                }
                case EXPONENTIAL:
                    g += c * -Math.expm1(-3 * h / s.range);
                    break;
                case GAUSSIAN: {
                    double t = h / s.range;
                    g += c * -Math.expm1(-3 * t * t);
                    break;
                }
                case MATERN:
                    g += c * (1 - maternCorrelation(i, h / s.range));
                    break;
                default:
                    g += c * Math.pow(h, s.range);
            }
        }
        return g;
    }

    /**
     * out[i] = base − γ(h[i]) for h[i] &gt; 0 and base for h[i] = 0, i &lt; len (the pseudo-covariance
     * with C(0) = base); one simple loop per structure. Uses exp rather than expm1 (a covariance
     * needs absolute, not relative, accuracy near h = 0, and exp is an intrinsic).
     */
    void covariances(double[] h, int len, double base, double[] out) {
        java.util.Arrays.fill(out, 0, len, base);
        for (int p = 0; p < parts.length; p++) {
            Structure s = parts[p];
            double c = s.partialSill;
            double a = s.range;
            switch (s.family) {
                case NUGGET:
                    for (int i = 0; i < len; i++) {
                        if (h[i] > 0) {
                            out[i] -= c;
                        }
                    }
                    break;
                case EXPONENTIAL: {
                    double r = -3 / a;
                    for (int i = 0; i < len; i++) {
                        out[i] -= c * (1 - Math.exp(r * h[i]));
                    }
                    break;
                }
                case GAUSSIAN: {
                    double r = -3 / (a * a);
                    for (int i = 0; i < len; i++) {
                        out[i] -= c * (1 - Math.exp(r * h[i] * h[i]));
                    }
                    break;
                }
                default:
                    for (int i = 0; i < len; i++) {
                        if (h[i] > 0) {
                            out[i] -= single(p, h[i]);
                        }
                    }
            }
        }
    }

    /** Scalar form of {@link #covariances}, with the same arithmetic (bit-identical). */
    double covariance(double h, double base) {
        double v = base;
        for (int p = 0; p < parts.length; p++) {
            Structure s = parts[p];
            double c = s.partialSill;
            switch (s.family) {
                case NUGGET:
                    if (h > 0) {
                        v -= c;
                    }
                    break;
                case EXPONENTIAL:
                    v -= c * (1 - Math.exp((-3 / s.range) * h));
                    break;
                case GAUSSIAN:
                    v -= c * (1 - Math.exp((-3 / (s.range * s.range)) * h * h));
                    break;
                default:
                    if (h > 0) {
                        v -= single(p, h);
                    }
            }
        }
        return v;
    }

    private double single(int p, double h) {
        Structure s = parts[p];
        double c = s.partialSill;
        switch (s.family) {
            case SPHERICAL: {
                double t = h / s.range;
                return t >= 1 ? c : c * (1.5 * t - 0.5 * t * t * t);
            }
            case MATERN:
                return c * (1 - maternCorrelation(p, h / s.range));
            default:
                return c * Math.pow(h, s.range);
        }
    }

    private double maternCorrelation(int part, double t) {
        double nu = parts[part].smoothness;
        if (t > 745 + 50 * nu) {
            return 0;
        }
        double r = maternConst[part] * Math.pow(t, nu) * BesselK.k(nu, t);
        return Math.min(1.0, r);
    }

    /**
     * Covariance C(h) = sill − γ(h) of a bounded model; C(0) = sill.
     *
     * @throws IllegalStateException for an unbounded (power) model
     */
    public double covariance(double h) {
        if (!bounded()) {
            throw new IllegalStateException("an unbounded (power) variogram has no covariance function");
        }
        return sill() - gamma(h);
    }

    /** Number of free parameters (partial sills, ranges; ν counted as fixed). */
    int parameterCount() {
        int p = 0;
        for (Structure s : parts) {
            p += s.family == Family.NUGGET ? 1 : 2;
        }
        return p;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof VariogramModel && Arrays.equals(parts, ((VariogramModel) o).parts);
    }

    @Override
    public int hashCode() {
        return Arrays.hashCode(parts);
    }

    @Override
    public String toString() {
        StringBuilder b = new StringBuilder("VariogramModel[");
        for (int i = 0; i < parts.length; i++) {
            Structure s = parts[i];
            if (i > 0) {
                b.append(" + ");
            }
            b.append(s.family.name().toLowerCase(java.util.Locale.ROOT)).append('(').append(s.partialSill);
            if (s.family != Family.NUGGET) {
                b.append(", ").append(s.range);
            }
            if (s.family == Family.MATERN) {
                b.append(", nu=").append(s.smoothness);
            }
            b.append(')');
        }
        return b.append(']').toString();
    }
}
