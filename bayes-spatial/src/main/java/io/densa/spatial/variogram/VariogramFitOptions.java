package io.densa.spatial.variogram;

import java.util.Objects;

/**
 * Immutable options of variogram fitting: the family, whether a nugget is fitted, the criterion,
 * the Matérn smoothness (held fixed), bounds on the range and the evaluation budget.
 *
 * <p>Defaults: exponential with nugget, Cressie's weighted least squares, ν = 0.5, range from
 * 10⁻³ × the largest bin lag up to 3 × that lag, an upper bound that is widened while the fit ends
 * on it (up to 1000 ×; see {@link VariogramFitting}), power exponent in [0.01, 1.99], 4000
 * evaluations per optimiser run. Bounds set with {@link #withRangeBounds} are kept as given.
 *
 * <p>A record: the canonical constructor checks every component as the with-methods do.
 *
 * @param family         the family of the single structure to fit (not NUGGET)
 * @param nugget         whether a nugget is fitted
 * @param method         the criterion
 * @param smoothness     the fixed Matérn smoothness ν in (0, 50]
 * @param minRange       lower bound of the range parameter, or NaN (with maxRange) for the default
 * @param maxRange       upper bound of the range parameter, or NaN (with minRange) for the default
 * @param maxEvaluations the evaluation budget of each optimiser run (≥ 100)
 */
public record VariogramFitOptions(VariogramModel.Family family, boolean nugget, VariogramFitOptions.Method method,
        double smoothness, double minRange, double maxRange, int maxEvaluations) {
    /** The fit criterion. */
    public enum Method {
        /**
         * Cressie (1985), Fitting variogram models by weighted least squares, Math. Geol. 17(5):
         * minimise Σ_j |N(h_j)| [γ̂(h_j)/γ(h_j; θ) − 1]².
         */
        WEIGHTED_CRESSIE,
        /** Ordinary least squares Σ_j [γ̂(h_j) − γ(h_j; θ)]². */
        ORDINARY
    }

    /** Checks every component. */
    public VariogramFitOptions {
        Objects.requireNonNull(family, "family");
        if (family == VariogramModel.Family.NUGGET) {
            throw new IllegalArgumentException("fit a structured family; the nugget is controlled by withNugget");
        }
        Objects.requireNonNull(method, "method");
        if (!(smoothness > 0 && smoothness <= 50)) {
            throw new IllegalArgumentException("Matern smoothness must be in (0, 50], got " + smoothness);
        }
        boolean unset = Double.isNaN(minRange) && Double.isNaN(maxRange);
        if (!unset && (!(minRange > 0) || !(maxRange > minRange) || Double.isInfinite(maxRange))) {
            throw new IllegalArgumentException("range bounds must satisfy 0 < min < max < inf, got [" + minRange
                    + ", " + maxRange + "]");
        }
        if (maxEvaluations < 100) {
            throw new IllegalArgumentException("evaluation budget must be >= 100, got " + maxEvaluations);
        }
    }

    /** The defaults described above. */
    public static VariogramFitOptions withDefaults() {
        return new VariogramFitOptions(VariogramModel.Family.EXPONENTIAL, true, Method.WEIGHTED_CRESSIE, 0.5,
                Double.NaN, Double.NaN, 4000);
    }

    /** The family of the single structure to fit (not NUGGET). */
    public VariogramFitOptions withFamily(VariogramModel.Family f) {
        return new VariogramFitOptions(f, nugget, method, smoothness, minRange, maxRange, maxEvaluations);
    }

    /** Whether to fit a nugget (else it is 0). */
    public VariogramFitOptions withNugget(boolean fit) {
        return new VariogramFitOptions(family, fit, method, smoothness, minRange, maxRange, maxEvaluations);
    }

    /** The criterion. */
    public VariogramFitOptions withMethod(Method m) {
        return new VariogramFitOptions(family, nugget, m, smoothness, minRange, maxRange, maxEvaluations);
    }

    /** The fixed Matérn smoothness ν in (0, 50]. */
    public VariogramFitOptions withSmoothness(double nu) {
        return new VariogramFitOptions(family, nugget, method, nu, minRange, maxRange, maxEvaluations);
    }

    /**
     * Bounds 0 &lt; min &lt; max on the range parameter (the exponent for the power model), kept as
     * given: a fit ending on one carries a {@link VariogramFit.WarningKind#PARAMETER_AT_BOUND}
     * warning.
     */
    public VariogramFitOptions withRangeBounds(double min, double max) {
        if (Double.isNaN(min) || Double.isNaN(max)) {
            throw new IllegalArgumentException("range bounds must satisfy 0 < min < max < inf, got [" + min + ", "
                    + max + "]");
        }
        return new VariogramFitOptions(family, nugget, method, smoothness, min, max, maxEvaluations);
    }

    /** The evaluation budget of each optimiser run (≥ 100). */
    public VariogramFitOptions withMaxEvaluations(int count) {
        return new VariogramFitOptions(family, nugget, method, smoothness, minRange, maxRange, count);
    }

    @Override
    public String toString() {
        return "VariogramFitOptions[family=" + family + ", nugget=" + nugget + ", method=" + method
                + ", smoothness=" + smoothness + ", range=[" + minRange + ", " + maxRange + "], maxEvaluations="
                + maxEvaluations + "]";
    }
}
