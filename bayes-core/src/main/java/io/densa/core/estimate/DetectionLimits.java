package io.densa.core.estimate;

import java.util.Arrays;
import java.util.Objects;

/**
 * Per-unit detection limits of binned data: a unit with a lower limit L recorded every value below
 * L at L (so its counts at and below the bin that holds L are "some value in [a, L]"), a unit with
 * an upper limit U recorded every value above U at U. Such data are left- or right-censored; a
 * limit is a property of how the data were measured, not a tuning choice, and the estimators treat
 * the censored counts accordingly (see
 * {@link PenalizedLikelihoodEstimator#fitAll(double[], int[][], String[], DetectionLimits)}).
 * Without it, the values piled up at the limit read as a spike and the empty bins below it as a
 * region without mass: the estimated density then dives there and such units can rule every B2
 * distance.
 *
 * <p>Where the limits were not recorded with the data, {@link #suggested} names the units whose
 * counts show the signature of clipping (a run of empty bins at an end, then a spike).
 *
 * <p>{@code NaN} means "no limit" for that unit. Immutable; arrays are copied in and out.
 *
 * @param lower n lower limits (NaN: none)
 * @param upper n upper limits (NaN: none)
 */
public record DetectionLimits(double[] lower, double[] upper) {

    /**
     * Validates and copies.
     *
     * @throws IllegalArgumentException for arrays of different lengths, infinite limits, or a unit
     *                                  whose lower limit is not below its upper limit
     */
    public DetectionLimits {
        Objects.requireNonNull(lower, "lower");
        Objects.requireNonNull(upper, "upper");
        if (lower.length != upper.length) {
            throw new IllegalArgumentException("lower limits for " + lower.length + " units but upper limits for "
                    + upper.length);
        }
        lower = lower.clone();
        upper = upper.clone();
        for (int i = 0; i < lower.length; i++) {
            if (Double.isInfinite(lower[i]) || Double.isInfinite(upper[i])) {
                throw new IllegalArgumentException("unit row " + i + ": detection limits must be finite or NaN (no "
                        + "limit), got lower " + lower[i] + ", upper " + upper[i]);
            }
            if (!Double.isNaN(lower[i]) && !Double.isNaN(upper[i]) && !(lower[i] < upper[i])) {
                throw new IllegalArgumentException("unit row " + i + ": lower detection limit " + lower[i]
                        + " is not below the upper limit " + upper[i]);
            }
        }
    }

    /** Lower limits only (NaN: none for that unit). */
    public static DetectionLimits lower(double... limits) {
        Objects.requireNonNull(limits, "limits");
        double[] none = new double[limits.length];
        Arrays.fill(none, Double.NaN);
        return new DetectionLimits(limits, none);
    }

    /** Upper limits only (NaN: none for that unit). */
    public static DetectionLimits upper(double... limits) {
        Objects.requireNonNull(limits, "limits");
        double[] none = new double[limits.length];
        Arrays.fill(none, Double.NaN);
        return new DetectionLimits(none, limits);
    }

    /**
     * Significance level of the spike test of {@link #suggested}: 0.001 (a one-sided test applied to
     * each end of each unit, so that a network of hundreds of units sees few chance suggestions).
     */
    public static final double SPIKE_LEVEL = 0.001;

    /**
     * Limits that the counts themselves suggest, for units whose data look clipped: at an end of the
     * bin layout, a run of at least two empty bins followed by a first occupied bin that holds
     * significantly more events than its inner neighbour — the signature of values below a limit
     * recorded at the limit (a spike at the edge of an empty region, where a density rising out of
     * that region would put fewer events than one bin further in). The test conditions on the two
     * bins' total m: with c events in the edge bin, P(X ≥ c) for X ~ Binomial(m, ½) (the comparison
     * of two Poisson counts given their sum; common practice) must be at most {@link #SPIKE_LEVEL}.
     * The suggested limit is the lower edge of the spike's bin, so that declaring it censors that
     * bin and the empty ones beyond it. NaN where a unit's end shows no such signature.
     *
     * <p>A suggestion, not a fact: a quantity with a hard bound of its own inside the layout and
     * most of its values at that bound shows the same signature. Declare a limit where the data
     * were recorded that way ({@code fitAll(edges, counts, ids, limits)}).
     *
     * @param edges  D + 1 strictly increasing bin edges (not modified)
     * @param counts n rows of D non-negative counts (not modified)
     * @throws IllegalArgumentException for edges that are not finite and strictly increasing, a row
     *                                  of another length or a negative or non-finite count (naming the row)
     */
    public static DetectionLimits suggested(double[] edges, double[][] counts) {
        Objects.requireNonNull(edges, "edges");
        Objects.requireNonNull(counts, "counts");
        int d = edges.length - 1;
        if (d < 1) {
            throw new IllegalArgumentException("edges needs at least 2 values, got " + edges.length);
        }
        for (int j = 0; j <= d; j++) {
            if (!Double.isFinite(edges[j]) || (j > 0 && !(edges[j] > edges[j - 1]))) {
                throw new IllegalArgumentException("edges must be finite and strictly increasing; edges[" + j + "] = "
                        + edges[j]);
            }
        }
        int n = counts.length;
        double[] lo = new double[n];
        double[] hi = new double[n];
        for (int i = 0; i < n; i++) {
            double[] c = counts[i];
            if (c == null || c.length != d) {
                throw new IllegalArgumentException("counts row " + i + " has " + (c == null ? "no" : c.length)
                        + " bins, expected " + d);
            }
            for (int j = 0; j < d; j++) {
                if (!(c[j] >= 0) || Double.isInfinite(c[j])) {
                    throw new IllegalArgumentException("counts row " + i + ", bin " + j + " is " + c[j]
                            + "; counts must be finite and >= 0");
                }
            }
            int first = 0;
            while (first < d && !(c[first] > 0)) {
                first++;
            }
            int last = d - 1;
            while (last >= 0 && !(c[last] > 0)) {
                last--;
            }
            lo[i] = first >= 2 && first + 1 < d && spike(c[first], c[first + 1]) ? edges[first] : Double.NaN;
            hi[i] = last >= 1 && last <= d - 3 && spike(c[last], c[last - 1]) ? edges[last] : Double.NaN;
            if (!Double.isNaN(lo[i]) && !Double.isNaN(hi[i]) && !(lo[i] < hi[i])) {
                hi[i] = Double.NaN; // both ends in one bin: keep the lower suggestion only
            }
        }
        return new DetectionLimits(lo, hi);
    }

    /** {@link #suggested(double[], double[][])} for integer counts. */
    public static DetectionLimits suggested(double[] edges, int[][] counts) {
        Objects.requireNonNull(counts, "counts");
        double[][] c = new double[counts.length][];
        for (int i = 0; i < counts.length; i++) {
            if (counts[i] != null) {
                c[i] = new double[counts[i].length];
                for (int j = 0; j < c[i].length; j++) {
                    c[i][j] = counts[i][j];
                }
            }
        }
        return suggested(edges, c);
    }

    /** Above this many events in the two bins the spike test uses the normal approximation. */
    static final double EXACT_LIMIT = 1e5;

    /**
     * Whether an edge bin with {@code edge} events holds significantly more than its inner neighbour
     * with {@code inner}: P(X ≥ edge) ≤ {@link #SPIKE_LEVEL} for X ~ Binomial(edge + inner, ½), by
     * the regularised incomplete beta function, P(X ≥ k) = I_½(k, m − k + 1) (counts rounded to
     * whole events); above {@link #EXACT_LIMIT} events by the normal approximation with continuity
     * correction, P ≈ ½ erfc(z / √2), z = (k − inner − 1) / √(k + inner) (where the continued
     * fraction of the beta function fails to converge, e.g. at 10³⁰⁰ events, and the approximation's
     * error is far below the level).
     */
    static boolean spike(double edge, double inner) {
        double k = Math.rint(edge);
        double in = Math.rint(inner);
        if (!(k >= 1)) {
            return false;
        }
        if (k + in <= EXACT_LIMIT) {
            return org.apache.commons.math3.special.Beta.regularizedBeta(0.5, k, in + 1) <= SPIKE_LEVEL;
        }
        double z = (k - in - 1) / (Math.sqrt(k) * Math.sqrt(1 + in / k)); // √(k + in) without overflow
        return 0.5 * org.apache.commons.math3.special.Erf.erfc(z / Math.sqrt(2)) <= SPIKE_LEVEL;
    }

    /** Number of units. */
    public int size() {
        return lower.length;
    }

    /** Whether unit i has a lower or an upper limit. */
    public boolean censored(int i) {
        return !Double.isNaN(lower[i]) || !Double.isNaN(upper[i]);
    }

    @Override
    public double[] lower() {
        return lower.clone();
    }

    @Override
    public double[] upper() {
        return upper.clone();
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof DetectionLimits d && Arrays.equals(lower, d.lower) && Arrays.equals(upper, d.upper);
    }

    @Override
    public int hashCode() {
        return 31 * Arrays.hashCode(lower) + Arrays.hashCode(upper);
    }

    @Override
    public String toString() {
        int c = 0;
        for (int i = 0; i < lower.length; i++) {
            c += censored(i) ? 1 : 0;
        }
        return "DetectionLimits[" + lower.length + " units, " + c + " with a limit]";
    }
}
