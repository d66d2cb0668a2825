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
