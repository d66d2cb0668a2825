package io.densa.io.tables;

import io.densa.io.Bins;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;

/**
 * Binned counts of n units (or unit–period pairs) over one bin layout: the input of
 * {@link PenalizedLikelihoodEstimator#fitAll(double[], double[][], String[])}. Made by
 * {@link CountTableReader} from long-format count tables, by {@link ObservationReader} from raw
 * observations, and in batches by {@link BulkObservations}.
 *
 * <p>Immutable: arrays are copied in and out ({@link #fit} passes its own arrays to the estimator,
 * which does not modify them).
 *
 * @param bins    the bin layout (D bins)
 * @param ids     n unit ids
 * @param periods n periods, or null when the table has no period column
 * @param counts  n × D counts (finite, ≥ 0; whole numbers unless weights were summed)
 * @param outside what happened to values outside the bins (nothing, for tables read as counts)
 * @param source  where the table came from, for messages
 */
public record CountTable(Bins bins, String[] ids, String[] periods, double[][] counts, OutsideReport outside,
        String source) {

    /** Checks shapes and copies the arrays. */
    public CountTable {
        Objects.requireNonNull(bins, "bins");
        Objects.requireNonNull(ids, "ids");
        Objects.requireNonNull(counts, "counts");
        Objects.requireNonNull(outside, "outside");
        Objects.requireNonNull(source, "source");
        if (counts.length != ids.length || (periods != null && periods.length != ids.length)) {
            throw new IllegalArgumentException(source + ": " + ids.length + " ids, " + counts.length + " count rows"
                    + (periods != null ? " and " + periods.length + " periods" : "") + "; they must match");
        }
        ids = ids.clone();
        periods = periods == null ? null : periods.clone();
        double[][] c = new double[counts.length][];
        for (int i = 0; i < c.length; i++) {
            if (counts[i] == null || counts[i].length != bins.count()) {
                throw new IllegalArgumentException(source + ", unit " + ids[i] + ": "
                        + (counts[i] == null ? "no counts" : counts[i].length + " counts") + " for " + bins.count()
                        + " bins");
            }
            c[i] = counts[i].clone();
        }
        counts = c;
    }

    /** Number of rows n (units, or unit–period pairs). */
    public int size() {
        return ids.length;
    }

    /** The bin edges (a copy). */
    public double[] edges() {
        return bins.edges();
    }

    /** The ids (a copy). */
    @Override
    public String[] ids() {
        return ids.clone();
    }

    /** The periods (a copy), or null. */
    @Override
    public String[] periods() {
        return periods == null ? null : periods.clone();
    }

    /** Whether the table has a period per row. */
    public boolean hasPeriods() {
        return periods != null;
    }

    /** The counts (a deep copy). */
    @Override
    public double[][] counts() {
        double[][] c = new double[counts.length][];
        for (int i = 0; i < c.length; i++) {
            c[i] = counts[i].clone();
        }
        return c;
    }

    /** Counts of row i (a copy). */
    public double[] counts(int i) {
        return counts[i].clone();
    }

    /** Total count of row i. */
    public double total(int i) {
        double s = 0;
        for (double v : counts[i]) {
            s += v;
        }
        return s;
    }

    /**
     * The counts as whole numbers.
     *
     * @throws IllegalArgumentException naming the first unit and bin whose count is not a whole number
     *                                  in int range
     */
    public int[][] wholeCounts() {
        int[][] w = new int[counts.length][bins.count()];
        for (int i = 0; i < counts.length; i++) {
            for (int j = 0; j < w[i].length; j++) {
                double v = counts[i][j];
                if (!(v == Math.rint(v) && v <= Integer.MAX_VALUE)) {
                    throw new IllegalArgumentException(source + ", " + key(i) + ", bin " + j + ": count " + v
                            + " is not a whole number in int range");
                }
                w[i][j] = (int) v;
            }
        }
        return w;
    }

    /** Row labels: the id, or {@code id + "@" + period} when the table has periods. */
    public String[] keys() {
        String[] k = new String[ids.length];
        for (int i = 0; i < k.length; i++) {
            k[i] = key(i);
        }
        return k;
    }

    private String key(int i) {
        return periods == null ? ids[i] : ids[i] + "@" + periods[i];
    }

    /** The distinct periods in order of first appearance (empty without a period column). */
    public List<String> distinctPeriods() {
        if (periods == null) {
            return List.of();
        }
        return List.copyOf(new java.util.LinkedHashSet<>(Arrays.asList(periods)));
    }

    /**
     * The rows of one period, without the period column.
     *
     * @throws IllegalArgumentException if the table has no periods or none equal to {@code period}
     */
    public CountTable forPeriod(String period) {
        Objects.requireNonNull(period, "period");
        if (periods == null) {
            throw new IllegalArgumentException(source + " has no period column");
        }
        List<Integer> rows = new ArrayList<>();
        for (int i = 0; i < periods.length; i++) {
            if (periods[i].equals(period)) {
                rows.add(i);
            }
        }
        if (rows.isEmpty()) {
            throw new IllegalArgumentException(source + " has no rows for period '" + period + "'; the periods are "
                    + distinctPeriods());
        }
        String[] id = new String[rows.size()];
        double[][] c = new double[rows.size()][];
        for (int r = 0; r < id.length; r++) {
            id[r] = ids[rows.get(r)];
            c[r] = counts[rows.get(r)];
        }
        return new CountTable(bins, id, null, c, outside, source + " (period " + period + ")");
    }

    /**
     * Fits every row with the estimator: {@code estimator.fitAll(edges, counts, keys())}, after
     * checking the bin layout against the estimator's space.
     *
     * @return the densities (ids = {@link #keys()}) and diagnostics, in table order
     * @throws IllegalArgumentException if a bin edge lies outside the space's domain (naming the source),
     *                                  or as the estimator does for bad counts (naming unit and bin)
     */
    public BatchEstimate fit(PenalizedLikelihoodEstimator estimator) {
        Objects.requireNonNull(estimator, "estimator");
        try {
            bins.checkAgainst(estimator.space());
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException(source + ": " + e.getMessage(), e);
        }
        return estimator.fitAll(bins.edges(), counts, keys());
    }

    @Override
    public boolean equals(Object o) {
        if (!(o instanceof CountTable)) {
            return false;
        }
        CountTable t = (CountTable) o;
        return bins.equals(t.bins) && Arrays.equals(ids, t.ids) && Arrays.equals(periods, t.periods)
                && Arrays.deepEquals(counts, t.counts) && outside.equals(t.outside) && source.equals(t.source);
    }

    @Override
    public int hashCode() {
        return Objects.hash(bins, Arrays.hashCode(ids), Arrays.deepHashCode(counts), source);
    }

    @Override
    public String toString() {
        return "CountTable[" + ids.length + " rows x " + bins.count() + " bins from " + source + "]";
    }
}
