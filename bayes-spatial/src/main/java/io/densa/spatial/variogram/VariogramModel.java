package io.densa.spatial.variogram;

import io.densa.core.internal.KernelPath;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;
import java.util.Objects;
import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.special.Gamma;

/**
 * An isotropic (trace-)semivariogram model γ(h), a nested sum of basic structures, each with a
 * partial sill c and a range parameter a. With t = h/a (Cressie (1993), Statistics for Spatial
 * Data, §2.3.1 — from memory):
 * <ul>
 * <li>nugget: γ(h) = c for h &gt; 0, γ(0) = 0;</li>
 * <li>spherical: c (1.5 t − 0.5 t³) for t ≤ 1, c beyond; a is the range;</li>
 * <li>exponential: c (1 − e^{−3t}); <b>a is the practical range</b> (γ reaches 95% of c at
 *     h = a), so C(h) = 10 e^{−0.3h} is exponential(10, 10);</li>
 * <li>Gaussian: c (1 − e^{−3t²}); a is the practical range;</li>
 * <li>Matérn(ν): c (1 − 2^{1−ν}/Γ(ν) (h/φ)^ν K_ν(h/φ)) with the scale φ = a / r(ν), where r(ν)
 *     solves 2^{1−ν}/Γ(ν) r^ν K_ν(r) = e^{−3}: a is the practical range here too, so Matérn(c, a, ½)
 *     equals exponential(c, a) (r(½) = 3) and {@link Structure#scale()} gives φ;</li>
 * <li>power: c h^ω with 0 &lt; ω &lt; 2 (unbounded; the "range" slot holds ω).</li>
 * </ul>
 * For a bounded model the covariance is C(h) = sill − γ(h), with C(0) = sill (the nugget
 * included), so kriging with a nugget interpolates exactly at data locations.
 *
 * <p><b>One range convention.</b> For the exponential, Gaussian and Matérn families a is the
 * <em>practical range</em>: the lag at which the correlation C(h)/C(0) of the structure falls to
 * e^{−3} ≈ 0.0498 (γ reaches 95.02% of its partial sill). For the spherical it is the range, where
 * γ reaches the partial sill.
 *
 * <p><b>Parameter ranges.</b> Every partial sill, range and coefficient is finite and positive, and
 * the total sill of the bounded structures must be a finite double (checked when structures are
 * combined): a bounded model's γ and C are then finite at every lag, whatever h / a underflows or
 * overflows to (h / a = 0 gives γ = 0; h / a = ∞ gives the sill). Only the power model can
 * exceed the double range; {@link #gamma} then throws.
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
        /** Matérn with smoothness ν (practical range). */
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
        /**
         * The scale φ with which the structure's correlation is written as a function of h/φ: for the
         * Matérn a / r(ν) (see the class description), for the exponential a / 3, for the Gaussian
         * a / √3; the range a itself for the spherical, the exponent for the power model and NaN
         * for the nugget.
         */
        public double scale() {
            switch (family) {
                case MATERN: return range / practicalRangeFactor(smoothness);
                case EXPONENTIAL: return range / 3;
                case GAUSSIAN: return range / Math.sqrt(3);
                default: return range;
            }
        }
    }

    private final Structure[] parts;
    private final double[] maternConst; // 2^{1−ν}/Γ(ν) per part (NaN if not Matérn)
    private final double[] maternScale; // φ = a / r(ν) per part (NaN if not Matérn)
    /**
     * Per part, the rate of the exponential or Gaussian covariance loop (−3/a, −3/a²), or NaN when
     * that rate is not a finite non-zero number (a range below about 1.7e-308, or a Gaussian range
     * whose square under- or overflows): such parts take the guarded per-lag path, so that the
     * unguarded loop never forms 0 · ∞.
     */
    private final double[] rate;

    private VariogramModel(Structure[] parts) {
        this.parts = parts;
        this.maternConst = new double[parts.length];
        this.maternScale = new double[parts.length];
        this.rate = new double[parts.length];
        double sill = 0;
        for (int i = 0; i < parts.length; i++) {
            Structure s = parts[i];
            maternConst[i] = s.family == Family.MATERN ? maternConstant(s.smoothness) : Double.NaN;
            maternScale[i] = s.family == Family.MATERN ? s.range / practicalRangeFactor(s.smoothness) : Double.NaN;
            double r = s.family == Family.EXPONENTIAL ? -3 / s.range
                    : s.family == Family.GAUSSIAN ? -3 / (s.range * s.range) : Double.NaN;
            rate[i] = r < 0 && r > Double.NEGATIVE_INFINITY ? r : Double.NaN;
            if (s.family != Family.POWER) {
                sill += s.partialSill;
            }
        }
        if (!(sill <= Double.MAX_VALUE)) {
            throw new IllegalArgumentException("the total sill of " + describe(parts) + " overflows a double;"
                    + " accepted are partial sills (nugget included) whose sum is below about 1.8e308: rescale the"
                    + " data");
        }
    }

    /**
     * This model with every partial sill (and power coefficient) multiplied by the power of two
     * 2^e, which is exact unless a sill underflows; γ and C scale by the same factor (kriging solves
     * its system in units of the sill, so that neither the system nor the variance overflows or
     * underflows for sills near the ends of the double range).
     */
    public VariogramModel scaledBy(int e) {
        Structure[] p = new Structure[parts.length];
        for (int i = 0; i < parts.length; i++) {
            Structure s = parts[i];
            p[i] = new Structure(s.family, Math.scalb(s.partialSill, e), s.range, s.smoothness);
        }
        return new VariogramModel(p);
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

    /** 2^{1−ν}/Γ(ν). */
    private static double maternConstant(double nu) {
        return Math.exp((1 - nu) * Math.log(2) - Gamma.logGamma(nu));
    }

    /**
     * r(ν), the root of 2^{1−ν}/Γ(ν) r^ν K_ν(r) = e^{−3}: the practical range of the Matérn
     * correlation in units of its scale. r(½) = 3 exactly (the correlation is e^{−r}); otherwise
     * Brent's method (Commons Math {@code BrentSolver}, relative accuracy 1e-15) on a bracket
     * that starts at [1e-3, 50] (the correlation decreases strictly from 1 to 0).
     */
    static double practicalRangeFactor(double nu) {
        if (nu == 0.5) {
            return 3;
        }
        double c = maternConstant(nu);
        double target = Math.exp(-3);
        UnivariateFunction f = t -> maternCorrelation(nu, c, t) - target;
        double lo = 1e-3, hi = 50;
        while (f.value(lo) < 0 && lo > 1e-300) {
            lo *= 1e-3;
        }
        while (f.value(hi) > 0 && hi < 1e6) {
            hi *= 2;
        }
        return new BrentSolver(1e-15, 1e-15, 1e-300).solve(1000, f, lo, hi);
    }

    /**
     * Matérn with partial sill c, practical range a (the correlation is e^{−3} at h = a; scale
     * φ = a / r(ν), see the class description) and smoothness ν.
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

    /**
     * Total sill (sum of partial sills, finite by construction).
     *
     * @throws IllegalStateException for an unbounded (power) model, which has no sill
     */
    public double sill() {
        if (!bounded()) {
            throw new IllegalStateException("an unbounded (power) variogram has no sill: " + this);
        }
        double s = 0;
        for (Structure p : parts) {
            s += p.partialSill;
        }
        return s;
    }

    /**
     * γ(h); finite for every lag h ≥ 0 of a bounded model (at most the sill).
     *
     * @throws IllegalArgumentException if h is negative or NaN, or (power model) γ(h) = c h^ω
     *                                  overflows a double at this lag
     */
    public double gamma(double h) {
        if (!(h >= 0)) {
            throw new IllegalArgumentException("lag must be >= 0, got " + h);
        }
        double g = gammaUnchecked(h);
        if (!(g <= Double.MAX_VALUE)) {
            throw new IllegalArgumentException("the variogram " + this + " at lag " + h + " exceeds the double range"
                    + " (a power structure c h^w overflows); accepted are lags where c h^w stays below about 1.8e308:"
                    + " rescale the distances or the data");
        }
        return g;
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
                    g += c * (1 - maternCorrelation(i, h / maternScale[i]));
                    break;
                default:
                    g += c * Math.pow(h, s.range);
            }
        }
        return g;
    }

    /**
     * Pseudo-covariances at many lags: out[i] = c0 − γ(lags[i]) for lags[i] &gt; 0 and c0 for
     * lags[i] = 0, i &lt; count, as {@link #pseudoCovariance} computes them (bit-identical); one
     * simple loop per structure. Uses exp rather than expm1 (a covariance needs absolute, not
     * relative, accuracy near h = 0, and exp is an intrinsic). Lags are not checked (they must be
     * ≥ 0).
     *
     * @param lags  lags (not modified)
     * @param count number of lags used
     * @param c0    the value at lag 0
     * @param out   at least count values, overwritten; must not alias lags
     */
    public void pseudoCovariances(double[] lags, int count, double c0, double[] out) {
        java.util.Arrays.fill(out, 0, count, c0);
        for (int p = 0; p < parts.length; p++) {
            Structure s = parts[p];
            double c = s.partialSill;
            double a = s.range;
            switch (s.family) {
                case NUGGET:
                    for (int i = 0; i < count; i++) {
                        if (lags[i] > 0) {
                            out[i] -= c;
                        }
                    }
                    break;
                case EXPONENTIAL: {
                    double r = rate[p];
                    if (r != r) {
                        guarded(p, lags, count, out);
                        break;
                    }
                    double[] e = new double[count];
                    KernelPath.active().weightedExp(lags, r, 0.0, null, e, count);
                    for (int i = 0; i < count; i++) {
                        out[i] -= c * (1 - e[i]);
                    }
                    break;
                }
                case GAUSSIAN: {
                    double r = rate[p];
                    if (r != r) {
                        guarded(p, lags, count, out);
                        break;
                    }
                    for (int i = 0; i < count; i++) {
                        out[i] -= c * (1 - Math.exp(r * lags[i] * lags[i]));
                    }
                    break;
                }
                default:
                    for (int i = 0; i < count; i++) {
                        if (lags[i] > 0) {
                            out[i] -= single(p, lags[i]);
                        }
                    }
            }
        }
    }

    /** out[i] −= the structure p at h[i] for h[i] &gt; 0, by {@link #single} (no 0 · ∞). */
    private void guarded(int p, double[] h, int len, double[] out) {
        for (int i = 0; i < len; i++) {
            if (h[i] > 0) {
                out[i] -= single(p, h[i]);
            }
        }
    }

    /**
     * The pseudo-covariance c0 − γ(h) for h &gt; 0, c0 at h = 0: with c0 = {@link #sill()} the
     * covariance of a bounded model; ordinary and universal kriging accept any constant c0, so
     * unbounded models have one too. The lag is not checked (it must be ≥ 0).
     */
    public double pseudoCovariance(double h, double c0) {
        double v = c0;
        for (int p = 0; p < parts.length; p++) {
            Structure s = parts[p];
            double c = s.partialSill;
            double r = rate[p];
            switch (s.family) {
                case NUGGET:
                    if (h > 0) {
                        v -= c;
                    }
                    break;
                case EXPONENTIAL:
                    if (r != r) {
                        v -= h > 0 ? single(p, h) : 0;
                    } else {
                        v -= c * (1 - Math.exp(r * h));
                    }
                    break;
                case GAUSSIAN:
                    if (r != r) {
                        v -= h > 0 ? single(p, h) : 0;
                    } else {
                        v -= c * (1 - Math.exp(r * h * h));
                    }
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
                return c * (1 - maternCorrelation(p, h / maternScale[p]));
            case EXPONENTIAL:
                return c * -Math.expm1(-3 * (h / s.range));
            case GAUSSIAN: {
                double t = h / s.range;
                return c * -Math.expm1(-3 * t * t);
            }
            default:
                return c * Math.pow(h, s.range);
        }
    }

    /**
     * The Matérn correlation 2^{1−ν}/Γ(ν) t^ν K_ν(t), which tends to 1 as t → 0: at t = 0 (h / a
     * underflowed) it is 1, and where K_ν(t) overflows (t^ν below about 1e-308 / Γ(ν)2^{ν−1}) the
     * product is within rounding of 1 (its deviation from 1 is O(t^{2 min(ν, 1)}), A&amp;S 9.6.9 —
     * from memory), so it is 1 too.
     */
    private double maternCorrelation(int part, double t) {
        return maternCorrelation(parts[part].smoothness, maternConst[part], t);
    }

    private static double maternCorrelation(double nu, double constant, double t) {
        if (t > 745 + 50 * nu) {
            return 0;
        }
        if (t == 0) {
            return 1;
        }
        double r = constant * Math.pow(t, nu) * BesselK.k(nu, t);
        return r < 1 ? r : 1.0; // NaN (0 · ∞) and +∞ both mean the limit 1
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
        return describe(parts);
    }

    private static String describe(Structure[] parts) {
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
