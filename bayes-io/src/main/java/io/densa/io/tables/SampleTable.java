package io.densa.io.tables;

import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.util.Arrays;
import java.util.Objects;

/**
 * Raw observations of n units (or unit–period pairs), kept as samples: the input of
 * {@link PenalizedLikelihoodEstimator#fitAllSamples(double[][], double[][], String[])}. Made by
 * {@link ObservationReader#samples} and, in batches, by {@link BulkObservations#samples}.
 *
 * <p>Immutable: arrays are copied in and out.
 *
 * @param ids     n unit ids
 * @param periods n periods, or null without a period column
 * @param values  n samples (values inside the accepted range, after the policy)
 * @param weights n weight arrays matching the samples, or null without a weight column
 * @param outside what happened to values outside the domain
 * @param source  where the observations came from, for messages
 */
public record SampleTable(String[] ids, String[] periods, double[][] values, double[][] weights,
        OutsideReport outside, String source) {

    /** Checks shapes and copies the arrays. */
    public SampleTable {
        Objects.requireNonNull(ids, "ids");
        Objects.requireNonNull(values, "values");
        Objects.requireNonNull(outside, "outside");
        Objects.requireNonNull(source, "source");
        if (values.length != ids.length || (periods != null && periods.length != ids.length)
                || (weights != null && weights.length != ids.length)) {
            throw new IllegalArgumentException(source + ": ids, values, periods and weights must have one entry per"
                    + " unit");
        }
        ids = ids.clone();
        periods = periods == null ? null : periods.clone();
        values = deep(values);
        if (weights != null) {
            for (int i = 0; i < ids.length; i++) {
                if (weights[i] == null || weights[i].length != values[i].length) {
                    throw new IllegalArgumentException(source + ", unit " + ids[i] + ": weights do not match values");
                }
            }
            weights = deep(weights);
        }
    }

    private static double[][] deep(double[][] a) {
        double[][] c = new double[a.length][];
        for (int i = 0; i < a.length; i++) {
            c[i] = Objects.requireNonNull(a[i], "sample").clone();
        }
        return c;
    }

    /** Number of rows n. */
    public int size() {
        return ids.length;
    }

    @Override
    public String[] ids() {
        return ids.clone();
    }

    @Override
    public String[] periods() {
        return periods == null ? null : periods.clone();
    }

    @Override
    public double[][] values() {
        return deep(values);
    }

    @Override
    public double[][] weights() {
        return weights == null ? null : deep(weights);
    }

    /** Sample of row i (a copy). */
    public double[] values(int i) {
        return values[i].clone();
    }

    /** Row labels: the id, or {@code id + "@" + period} when the table has periods. */
    public String[] keys() {
        String[] k = new String[ids.length];
        for (int i = 0; i < k.length; i++) {
            k[i] = periods == null ? ids[i] : ids[i] + "@" + periods[i];
        }
        return k;
    }

    /**
     * Fits every sample: {@code estimator.fitAllSamples(values, weights, keys())}.
     *
     * @throws IllegalArgumentException as the estimator does (a value outside its domain, naming unit
     *                                  and index; an empty sample under its zero-total policy)
     */
    public BatchEstimate fit(PenalizedLikelihoodEstimator estimator) {
        Objects.requireNonNull(estimator, "estimator");
        return estimator.fitAllSamples(values, weights, keys());
    }

    @Override
    public boolean equals(Object o) {
        if (!(o instanceof SampleTable)) {
            return false;
        }
        SampleTable t = (SampleTable) o;
        return Arrays.equals(ids, t.ids) && Arrays.equals(periods, t.periods) && Arrays.deepEquals(values, t.values)
                && Arrays.deepEquals(weights, t.weights) && outside.equals(t.outside) && source.equals(t.source);
    }

    @Override
    public int hashCode() {
        return Objects.hash(Arrays.hashCode(ids), Arrays.deepHashCode(values), source);
    }

    @Override
    public String toString() {
        return "SampleTable[" + ids.length + " rows from " + source + ", " + outside + "]";
    }
}
