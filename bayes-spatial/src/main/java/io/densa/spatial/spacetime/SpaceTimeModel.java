package io.densa.spatial.spacetime;

import io.densa.spatial.variogram.VariogramModel;
import java.util.Locale;
import java.util.Objects;

/**
 * A stationary space–time (trace-)covariance C(h, u) of densities, with h ≥ 0 the spatial lag and
 * u ≥ 0 the temporal lag, and its semivariogram γ(h, u) = C(0, 0) − C(h, u). Every model is a
 * structured part plus a space–time nugget c0 ≥ 0 (uncorrelated noise: C gains c0 at (0, 0) only,
 * so γ(h, u) = c0 + γ_struct(h, u) away from the origin). Three families:
 * <ul>
 * <li><b>separable</b>: C(h, u) = C_s(h) · C_t(u) / C_t(0), the product of a spatial covariance
 *     C_s and a temporal correlation (the temporal model's sill cancels, so the joint sill is the
 *     spatial sill and γ(h, 0) = c0 + γ_s(h), γ(0, u) = c0 + (C_s(0) / C_t(0)) γ_t(u)); Cressie &amp;
 *     Huang (1999), Classes of nonseparable, spatio-temporal stationary covariance functions, JASA
 *     94(448), §1 (from memory);</li>
 * <li><b>product-sum</b> (De Cesare, Myers &amp; Posa (2001), Product-sum covariance for space-time
 *     modeling: an environmental application, Environmetrics 12(1), 11–23 — volume and pages from
 *     memory, title and year confirmed in citing literature): written with its marginal variograms,
 *     γ(h, u) = γ_s(h) + γ_t(u) − k γ_s(h) γ_t(u), which is the covariance
 *     k₁ C_s C_t + k₂ C_s + k₃ C_t with k₁ &gt; 0, k₂, k₃ ≥ 0 exactly when
 *     0 &lt; k ≤ 1 / max(sill_s, sill_t) (De Iaco, Myers &amp; Posa (2001), Space–time analysis using a
 *     general product–sum model, Stat. Probab. Lett. 52(1) — from memory); here γ(h, 0) = c0 + γ_s(h)
 *     and γ(0, u) = c0 + γ_t(u);</li>
 * <li><b>Gneiting class</b> (Gneiting (2002), Nonseparable, stationary covariance functions for
 *     space–time data, JASA 97(458), 590–600, eq. (14), doi:10.1198/016214502760047113):
 *     C(h, u) = σ² ψ(u)^{−τ} exp(−c h^{2γ} / ψ(u)^{βγ}) with ψ(u) = a u^{2α} + 1, spatial shape
 *     γ ∈ (0, 1], temporal shape α ∈ (0, 1], interaction β ∈ [0, 1] (β = 0 is separable) and
 *     τ = d/2 = 1 for planar locations (d = 2), the smallest exponent for which eq. (14) is valid.
 *     The scales are written as practical ranges, as {@link VariogramModel} does:
 *     c = 3 / r_s^{2γ} and a = (e^{3/τ} − 1) / r_t^{2α}, so that C(r_s, 0) = C(0, r_t) = σ² e^{−3}.
 *     With γ = ½ the spatial margin C(h, 0) is {@code VariogramModel.exponential(σ², r_s)}, with
 *     γ = 1 {@code VariogramModel.gaussian(σ², r_s)}.</li>
 * </ul>
 * Marginal models must be bounded (no power structure); nested structures and marginal nuggets
 * are allowed. With geographic locations the spatial lag is the great-circle distance in km, on
 * which positive definiteness is not guaranteed for every family (see
 * {@link io.densa.spatial.kriging.Kriging}); a failure shows as a Cholesky breakdown.
 *
 * <p>Immutable and thread-safe.
 */
public final class SpaceTimeModel {
    /** The model family. */
    public enum Kind {
        /** Product of a spatial covariance and a temporal correlation. */
        SEPARABLE,
        /** De Cesare, Myers &amp; Posa's product-sum model. */
        PRODUCT_SUM,
        /** Gneiting's non-separable class, eq. (14) of Gneiting (2002). */
        GNEITING
    }

    /** Gneiting's τ for two spatial dimensions. */
    static final double TAU = 1;

    private final Kind kind;
    private final VariogramModel spatial;
    private final VariogramModel temporal;
    private final double nugget;
    // product-sum
    private final double k;
    // Gneiting
    private final double sigma2;
    private final double spatialRange;
    private final double temporalRange;
    private final double beta;
    private final double spatialShape;
    private final double temporalShape;
    private final double cScale;
    private final double aScale;
    private final double sill;

    private SpaceTimeModel(Kind kind, VariogramModel spatial, VariogramModel temporal, double nugget, double k,
            double[] g) {
        this.kind = kind;
        this.spatial = spatial;
        this.temporal = temporal;
        this.nugget = nugget;
        this.k = k;
        this.sigma2 = g[0];
        this.spatialRange = g[1];
        this.temporalRange = g[2];
        this.beta = g[3];
        this.spatialShape = g[4];
        this.temporalShape = g[5];
        this.cScale = kind == Kind.GNEITING ? 3 / Math.pow(spatialRange, 2 * spatialShape) : Double.NaN;
        this.aScale = kind == Kind.GNEITING ? Math.expm1(3 / TAU) / Math.pow(temporalRange, 2 * temporalShape)
                : Double.NaN;
        double s;
        switch (kind) {
            case SEPARABLE:
                s = spatial.sill();
                break;
            case PRODUCT_SUM:
                s = spatial.sill() + temporal.sill() - k * spatial.sill() * temporal.sill();
                break;
            default:
                s = sigma2;
        }
        this.sill = s + nugget;
        if (!(sill <= Double.MAX_VALUE)) {
            throw new IllegalArgumentException("the total sill of " + this + " overflows a double; rescale the data");
        }
        if (kind == Kind.GNEITING && !(cScale > 0 && cScale < Double.POSITIVE_INFINITY && aScale > 0
                && aScale < Double.POSITIVE_INFINITY)) {
            throw new IllegalArgumentException("the ranges " + spatialRange + " (space) and " + temporalRange
                    + " (time) give scales c = " + cScale + ", a = " + aScale + " outside the double range;"
                    + " accepted are ranges whose powers 2γ, 2α are finite and non-zero");
        }
    }

    private static final double[] NO_GNEITING = {Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN,
        Double.NaN};

    private static void bounded(VariogramModel m, String what) {
        Objects.requireNonNull(m, what);
        if (!m.bounded()) {
            throw new IllegalArgumentException("the " + what + " model must be bounded (no power structure), got " + m);
        }
    }

    private static void nonNegative(String what, double v) {
        if (!(v >= 0) || Double.isInfinite(v)) {
            throw new IllegalArgumentException(what + " must be finite and >= 0, got " + v);
        }
    }

    private static void positive(String what, double v) {
        if (!(v > 0) || Double.isInfinite(v)) {
            throw new IllegalArgumentException(what + " must be finite and > 0, got " + v);
        }
    }

    /**
     * The separable model C(h, u) = C_s(h) C_t(u) / C_t(0), plus a space–time nugget.
     *
     * @param spatial  the spatial variogram (its sill is the structured sill)
     * @param temporal the temporal variogram (only its correlation C_t(u)/C_t(0) is used)
     * @param nugget   the space–time nugget c0 ≥ 0
     * @throws IllegalArgumentException for an unbounded marginal or a negative or non-finite nugget
     */
    public static SpaceTimeModel separable(VariogramModel spatial, VariogramModel temporal, double nugget) {
        bounded(spatial, "spatial");
        bounded(temporal, "temporal");
        nonNegative("space-time nugget", nugget);
        return new SpaceTimeModel(Kind.SEPARABLE, spatial, temporal, nugget, Double.NaN, NO_GNEITING);
    }

    /**
     * The product-sum model γ = γ_s + γ_t − k γ_s γ_t, plus a space–time nugget.
     *
     * @param k the interaction coefficient, 0 &lt; k ≤ 1 / max(sill_s, sill_t)
     * @throws IllegalArgumentException for an unbounded marginal, k outside its range (naming the
     *                                  bound) or a negative or non-finite nugget
     */
    public static SpaceTimeModel productSum(VariogramModel spatial, VariogramModel temporal, double k,
            double nugget) {
        bounded(spatial, "spatial");
        bounded(temporal, "temporal");
        nonNegative("space-time nugget", nugget);
        double kMax = maxProductSumK(spatial.sill(), temporal.sill());
        if (!(k > 0 && k <= kMax)) {
            throw new IllegalArgumentException("product-sum coefficient k = " + k + " is outside (0, " + kMax
                    + "]; accepted is 0 < k <= 1 / max(spatial sill " + spatial.sill() + ", temporal sill "
                    + temporal.sill() + "), where the model is a valid covariance");
        }
        return new SpaceTimeModel(Kind.PRODUCT_SUM, spatial, temporal, nugget, k, NO_GNEITING);
    }

    /** 1 / max(sill_s, sill_t), the largest valid product-sum coefficient. */
    public static double maxProductSumK(double spatialSill, double temporalSill) {
        return 1 / Math.max(spatialSill, temporalSill);
    }

    /**
     * A model of Gneiting's class, eq. (14) of Gneiting (2002), with τ = 1 (see the class
     * description).
     *
     * @param sill          σ² &gt; 0, the structured sill
     * @param spatialRange  r_s &gt; 0: C(r_s, 0) = σ² e^{−3}
     * @param temporalRange r_t &gt; 0: C(0, r_t) = σ² e^{−3}
     * @param beta          the space–time interaction β ∈ [0, 1]
     * @param spatialShape  γ ∈ (0, 1] (½: exponential spatial margin, 1: Gaussian)
     * @param temporalShape α ∈ (0, 1]
     * @param nugget        the space–time nugget c0 ≥ 0
     * @throws IllegalArgumentException naming the parameter outside its range
     */
    public static SpaceTimeModel gneiting(double sill, double spatialRange, double temporalRange, double beta,
            double spatialShape, double temporalShape, double nugget) {
        positive("sill", sill);
        positive("spatial range", spatialRange);
        positive("temporal range", temporalRange);
        if (!(beta >= 0 && beta <= 1)) {
            throw new IllegalArgumentException("space-time interaction beta must be in [0, 1], got " + beta);
        }
        if (!(spatialShape > 0 && spatialShape <= 1)) {
            throw new IllegalArgumentException("spatial shape gamma must be in (0, 1], got " + spatialShape);
        }
        if (!(temporalShape > 0 && temporalShape <= 1)) {
            throw new IllegalArgumentException("temporal shape alpha must be in (0, 1], got " + temporalShape);
        }
        nonNegative("space-time nugget", nugget);
        return new SpaceTimeModel(Kind.GNEITING, null, null, nugget, Double.NaN,
                new double[] {sill, spatialRange, temporalRange, beta, spatialShape, temporalShape});
    }

    /** The family. */
    public Kind kind() {
        return kind;
    }

    /** C(0, 0), the structured sill plus the nugget. */
    public double sill() {
        return sill;
    }

    /** The space–time nugget c0. */
    public double nugget() {
        return nugget;
    }

    /** The spatial marginal model (separable and product-sum; null for Gneiting). */
    public VariogramModel spatial() {
        return spatial;
    }

    /** The temporal marginal model (separable and product-sum; null for Gneiting). */
    public VariogramModel temporal() {
        return temporal;
    }

    /** The product-sum coefficient k (NaN for the other families). */
    public double productSumK() {
        return k;
    }

    /**
     * Gneiting's parameters {σ², r_s, r_t, β, γ, α} (NaN for the other families); a copy.
     */
    public double[] gneitingParameters() {
        return new double[] {sigma2, spatialRange, temporalRange, beta, spatialShape, temporalShape};
    }

    /**
     * The covariance C(h, u); C(0, 0) = {@link #sill()}.
     *
     * @throws IllegalArgumentException if a lag is negative or NaN
     */
    public double covariance(double h, double u) {
        if (!(h >= 0) || !(u >= 0)) {
            throw new IllegalArgumentException("lags must be >= 0, got (" + h + ", " + u + ")");
        }
        return covarianceUnchecked(h, u);
    }

    /**
     * The semivariogram γ(h, u) = C(0, 0) − C(h, u); γ(0, 0) = 0.
     *
     * @throws IllegalArgumentException if a lag is negative or NaN
     */
    public double gamma(double h, double u) {
        if (!(h >= 0) || !(u >= 0)) {
            throw new IllegalArgumentException("lags must be >= 0, got (" + h + ", " + u + ")");
        }
        return h == 0 && u == 0 ? 0 : nugget + structuredGamma(h, u);
    }

    /** C(h, u) without checks (lags ≥ 0). */
    double covarianceUnchecked(double h, double u) {
        if (h == 0 && u == 0) {
            return sill;
        }
        return sill - nugget - structuredGamma(h, u);
    }

    /** The structured part's γ (0 at the origin). */
    private double structuredGamma(double h, double u) {
        switch (kind) {
            case SEPARABLE:
                return spatial.sill() - spatial.covariance(h) * (temporal.covariance(u) / temporal.sill());
            case PRODUCT_SUM: {
                double gs = spatial.gamma(h);
                double gt = temporal.gamma(u);
                return gs + gt - k * gs * gt;
            }
            default: {
                double psi = aScale * Math.pow(u, 2 * temporalShape) + 1;
                if (psi == Double.POSITIVE_INFINITY) {
                    return sigma2; // ψ^{−τ} = 0 and the exponential is at most 1 (avoids ∞/∞)
                }
                double arg = cScale * Math.pow(h, 2 * spatialShape) / Math.pow(psi, beta * spatialShape);
                return sigma2 - sigma2 * Math.pow(psi, -TAU) * Math.exp(-arg);
            }
        }
    }

    @Override
    public boolean equals(Object o) {
        if (!(o instanceof SpaceTimeModel)) {
            return false;
        }
        SpaceTimeModel m = (SpaceTimeModel) o;
        return kind == m.kind && Objects.equals(spatial, m.spatial) && Objects.equals(temporal, m.temporal)
                && Double.compare(nugget, m.nugget) == 0 && Double.compare(k, m.k) == 0
                && java.util.Arrays.equals(gneitingParameters(), m.gneitingParameters());
    }

    @Override
    public int hashCode() {
        return Objects.hash(kind, spatial, temporal, nugget, k, java.util.Arrays.hashCode(gneitingParameters()));
    }

    @Override
    public String toString() {
        switch (kind) {
            case SEPARABLE:
                return "SpaceTimeModel[separable, spatial " + spatial + ", temporal " + temporal + ", nugget " + nugget
                        + "]";
            case PRODUCT_SUM:
                return "SpaceTimeModel[product-sum, spatial " + spatial + ", temporal " + temporal + ", k " + k
                        + ", nugget " + nugget + "]";
            default:
                return String.format(Locale.ROOT, "SpaceTimeModel[Gneiting, sill %s, spatial range %s, temporal range"
                        + " %s, beta %s, gamma %s, alpha %s, nugget %s]", sigma2, spatialRange, temporalRange, beta,
                        spatialShape, temporalShape, nugget);
        }
    }
}
