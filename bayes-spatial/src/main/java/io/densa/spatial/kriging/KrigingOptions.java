package io.densa.spatial.kriging;

import java.util.Objects;

/**
 * Immutable kriging options: the neighbourhood, location-specific measurement-error variances,
 * the treatment of coincident locations, the condition-number limit and parallelism.
 *
 * <p><b>Measurement-error convention.</b> Each datum is X(s_i) ⊕ ε_i with E‖ε_i‖²_B = v_i known
 * (for example the estimation variance a density estimate reports), independent of the field and
 * of each other. v_i is added to the i-th diagonal entry of the data covariance matrix only; the
 * covariances between data and target, and C(0) at the target, are those of the error-free field,
 * so the predictor targets X(s_0) without error and smooths, rather than interpolates, locations
 * with v_i &gt; 0. With all v_i = c this is the system matrix of a model with an extra nugget c,
 * but without that nugget at prediction targets.
 *
 * <p>Defaults: global neighbourhood, no error variances, coincident locations rejected,
 * condition limit 10¹², parallel.
 */
public final class KrigingOptions {
    private final Neighbourhood neighbourhood;
    private final double[] errorVariances;
    private final double coincidentNugget;
    private final double conditionLimit;
    private final boolean parallel;

    private KrigingOptions(Neighbourhood neighbourhood, double[] errorVariances, double coincidentNugget,
            double conditionLimit, boolean parallel) {
        this.neighbourhood = neighbourhood;
        this.errorVariances = errorVariances;
        this.coincidentNugget = coincidentNugget;
        this.conditionLimit = conditionLimit;
        this.parallel = parallel;
    }

    /** The defaults described above. */
    public static KrigingOptions withDefaults() {
        return new KrigingOptions(Neighbourhood.global(), null, 0, 1e12, true);
    }

    /** The neighbourhood. */
    public KrigingOptions withNeighbourhood(Neighbourhood n) {
        Objects.requireNonNull(n, "neighbourhood");
        return new KrigingOptions(n, errorVariances, coincidentNugget, conditionLimit, parallel);
    }

    /**
     * Known measurement-error variances v_i ≥ 0, one per data location (copied; see the class
     * comment for the convention).
     */
    public KrigingOptions withErrorVariances(double... variances) {
        Objects.requireNonNull(variances, "variances");
        for (int i = 0; i < variances.length; i++) {
            if (!(variances[i] >= 0) || Double.isInfinite(variances[i])) {
                throw new IllegalArgumentException("error variance at location " + i + " must be finite and >= 0, got "
                        + variances[i]);
            }
        }
        return new KrigingOptions(neighbourhood, variances.clone(), coincidentNugget, conditionLimit, parallel);
    }

    /**
     * Accept coincident locations by adding this variance to every diagonal entry of the system (as
     * a measurement-error variance common to all data); 0 (the default) rejects them.
     */
    public KrigingOptions withCoincidentNugget(double variance) {
        if (!(variance >= 0) || Double.isInfinite(variance)) {
            throw new IllegalArgumentException("coincident nugget must be finite and >= 0, got " + variance);
        }
        return new KrigingOptions(neighbourhood, errorVariances, variance, conditionLimit, parallel);
    }

    /** Largest accepted condition estimate of a kriging system (&gt; 1). */
    public KrigingOptions withConditionLimit(double limit) {
        if (!(limit > 1)) {
            throw new IllegalArgumentException("condition limit must be > 1, got " + limit);
        }
        return new KrigingOptions(neighbourhood, errorVariances, coincidentNugget, limit, parallel);
    }

    /** Whether batch work uses the common ForkJoin pool (results are identical either way). */
    public KrigingOptions withParallel(boolean p) {
        return new KrigingOptions(neighbourhood, errorVariances, coincidentNugget, conditionLimit, p);
    }

    /** The neighbourhood. */
    public Neighbourhood neighbourhood() {
        return neighbourhood;
    }

    /** Error variances (copy) or null. */
    public double[] errorVariances() {
        return errorVariances == null ? null : errorVariances.clone();
    }

    /** The coincident-location nugget. */
    public double coincidentNugget() {
        return coincidentNugget;
    }

    /** The condition limit. */
    public double conditionLimit() {
        return conditionLimit;
    }

    /** Whether parallel. */
    public boolean parallel() {
        return parallel;
    }

    /**
     * Error variance plus coincident nugget of each of n locations, in the data's units (a new array;
     * package-private, for {@link Kriging}).
     *
     * @throws IllegalArgumentException if the error variances do not have n entries or a sum overflows
     */
    double[] diagonalExtras(int n) {
        double[] ev = errorVariances();
        if (ev != null && ev.length != n) {
            throw new IllegalArgumentException("error variances have " + ev.length + " entries but there are " + n
                    + " locations");
        }
        double[] errorVariances = ev == null ? new double[n] : ev;
        double[] diagExtraRaw = new double[n];
        for (int i = 0; i < n; i++) {
            diagExtraRaw[i] = errorVariances[i] + coincidentNugget();
            if (!(diagExtraRaw[i] <= Double.MAX_VALUE)) {
                throw new IllegalArgumentException("the error variance of location " + i + " plus the coincident"
                        + " nugget (" + errorVariances[i] + " + " + coincidentNugget() + ") overflows a"
                        + " double; accepted are sums below about 1.8e308");
            }
        }
        return diagExtraRaw;
    }

    @Override
    public String toString() {
        return "KrigingOptions[" + neighbourhood + ", errorVariances=" + (errorVariances == null ? "none"
                : errorVariances.length + " values") + ", coincidentNugget=" + coincidentNugget + ", conditionLimit="
                + conditionLimit + ", parallel=" + parallel + "]";
    }
}
