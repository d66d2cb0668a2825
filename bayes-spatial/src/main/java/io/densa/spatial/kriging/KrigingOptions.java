package io.densa.spatial.kriging;

import io.densa.core.internal.RecordArrays;
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
 *
 * <p>A record: the canonical constructor checks every component (as the with-methods do) and copies
 * the error variances; equality is by content.
 *
 * @param neighbourhood    the neighbourhood
 * @param errorVariances   known measurement-error variances v_i &gt;= 0, one per data location, or
 *                         null for none
 * @param coincidentNugget variance added to every diagonal entry to accept coincident locations
 *                         (0 rejects them)
 * @param conditionLimit   largest accepted condition estimate of a kriging system (&gt; 1)
 * @param parallel         whether batch work uses the common ForkJoin pool
 */
public record KrigingOptions(Neighbourhood neighbourhood, double[] errorVariances, double coincidentNugget,
        double conditionLimit, boolean parallel) {

    /** Checks every component and copies the error variances (the caller keeps its array). */
    public KrigingOptions {
        Objects.requireNonNull(neighbourhood, "neighbourhood");
        if (errorVariances != null) {
            for (int i = 0; i < errorVariances.length; i++) {
                if (!(errorVariances[i] >= 0) || Double.isInfinite(errorVariances[i])) {
                    throw new IllegalArgumentException("error variance at location " + i
                            + " must be finite and >= 0, got " + errorVariances[i]);
                }
            }
            errorVariances = errorVariances.clone();
        }
        if (!(coincidentNugget >= 0) || Double.isInfinite(coincidentNugget)) {
            throw new IllegalArgumentException("coincident nugget must be finite and >= 0, got " + coincidentNugget);
        }
        if (!(conditionLimit > 1)) {
            throw new IllegalArgumentException("condition limit must be > 1, got " + conditionLimit);
        }
    }

    /** The defaults described above. */
    public static KrigingOptions withDefaults() {
        return new KrigingOptions(Neighbourhood.global(), null, 0, 1e12, true);
    }

    /** The neighbourhood. */
    public KrigingOptions withNeighbourhood(Neighbourhood n) {
        return new KrigingOptions(n, errorVariances, coincidentNugget, conditionLimit, parallel);
    }

    /**
     * Known measurement-error variances v_i ≥ 0, one per data location (copied; see the class
     * comment for the convention).
     */
    public KrigingOptions withErrorVariances(double... variances) {
        Objects.requireNonNull(variances, "variances");
        return new KrigingOptions(neighbourhood, variances, coincidentNugget, conditionLimit, parallel);
    }

    /**
     * Accept coincident locations by adding this variance to every diagonal entry of the system (as
     * a measurement-error variance common to all data); 0 (the default) rejects them.
     */
    public KrigingOptions withCoincidentNugget(double variance) {
        return new KrigingOptions(neighbourhood, errorVariances, variance, conditionLimit, parallel);
    }

    /** Largest accepted condition estimate of a kriging system (&gt; 1). */
    public KrigingOptions withConditionLimit(double limit) {
        return new KrigingOptions(neighbourhood, errorVariances, coincidentNugget, limit, parallel);
    }

    /** Whether batch work uses the common ForkJoin pool (results are identical either way). */
    public KrigingOptions withParallel(boolean p) {
        return new KrigingOptions(neighbourhood, errorVariances, coincidentNugget, conditionLimit, p);
    }

    /** Error variances (copy) or null. */
    @Override
    public double[] errorVariances() {
        return errorVariances == null ? null : errorVariances.clone();
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

    /** Equality by content of every component (the error variances element by element). */
    @Override
    public boolean equals(Object o) {
        return RecordArrays.equal(this, o);
    }

    /** Hash of the content of every component. */
    @Override
    public int hashCode() {
        return RecordArrays.hash(this);
    }

    @Override
    public String toString() {
        return "KrigingOptions[" + neighbourhood + ", errorVariances=" + (errorVariances == null ? "none"
                : errorVariances.length + " values") + ", coincidentNugget=" + coincidentNugget + ", conditionLimit="
                + conditionLimit + ", parallel=" + parallel + "]";
    }
}
