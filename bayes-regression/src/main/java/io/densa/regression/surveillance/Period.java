package io.densa.regression.surveillance;

import io.densa.core.DensitySet;
import java.util.Objects;

/**
 * One period's observations for the units under surveillance, always the same units in the same
 * order.
 *
 * @param index               the period's number (increasing from period to period; a week or
 *                            month number, used to name periods in the alert history)
 * @param densities           one estimated density per unit
 * @param covariates          n × q scalar covariates per unit for this period, or null for none
 *                            (the same q in every period)
 * @param estimationVariances one B2 estimation variance per unit (what an estimator reports), or
 *                            null; when every period has them, residuals are standardised for
 *                            unit size (see {@link RollingBaseline})
 * @param counts              n rows of event counts per bin for excess counts, or null
 * @param binEdges            the D + 1 edges of the count bins (with counts), or null
 */
public record Period(int index, DensitySet densities, double[][] covariates, double[] estimationVariances,
        long[][] counts, double[] binEdges) {
    /**
     * Validates shapes and copies the arrays.
     *
     * @throws IllegalArgumentException on a shape mismatch or a non-finite value, naming the row
     */
    public Period {
        Objects.requireNonNull(densities, "densities");
        int n = densities.size();
        if (n < 1) {
            throw new IllegalArgumentException("period " + index + " has no units");
        }
        if (covariates != null) {
            if (covariates.length != n) {
                throw new IllegalArgumentException("period " + index + ": covariates have " + covariates.length
                        + " rows, expected " + n + " (one per unit)");
            }
            double[][] c = new double[n][];
            int q = -1;
            for (int i = 0; i < n; i++) {
                if (covariates[i] == null || q >= 0 && covariates[i].length != q) {
                    throw new IllegalArgumentException("period " + index + ": covariate row " + i + " has "
                            + (covariates[i] == null ? "no" : covariates[i].length) + " values, expected " + q);
                }
                q = covariates[i].length;
                for (double v : covariates[i]) {
                    if (!Double.isFinite(v)) {
                        throw new IllegalArgumentException("period " + index + ": covariate of row " + i + " is " + v
                                + "; finite values are required");
                    }
                }
                c[i] = covariates[i].clone();
            }
            covariates = c;
        }
        if (estimationVariances != null) {
            if (estimationVariances.length != n) {
                throw new IllegalArgumentException("period " + index + ": " + estimationVariances.length
                        + " estimation variances, expected " + n);
            }
            for (int i = 0; i < n; i++) {
                if (!(estimationVariances[i] >= 0) || Double.isInfinite(estimationVariances[i])) {
                    throw new IllegalArgumentException("period " + index + ": estimation variance of row " + i + " is "
                            + estimationVariances[i] + "; finite values >= 0 are required");
                }
            }
            estimationVariances = estimationVariances.clone();
        }
        if ((counts == null) != (binEdges == null)) {
            throw new IllegalArgumentException("period " + index + ": give counts and binEdges together, or neither");
        }
        if (counts != null) {
            if (counts.length != n) {
                throw new IllegalArgumentException("period " + index + ": counts have " + counts.length
                        + " rows, expected " + n);
            }
            long[][] c = new long[n][];
            for (int i = 0; i < n; i++) {
                if (counts[i] == null || counts[i].length != binEdges.length - 1) {
                    throw new IllegalArgumentException("period " + index + ": count row " + i + " has "
                            + (counts[i] == null ? "no" : counts[i].length) + " bins, expected " + (binEdges.length - 1));
                }
                c[i] = counts[i].clone();
            }
            counts = c;
            binEdges = binEdges.clone();
        }
    }

    /** A period with densities only. */
    public static Period of(int index, DensitySet densities) {
        return new Period(index, densities, null, null, null, null);
    }

    /** Number of units. */
    public int size() {
        return densities.size();
    }

    /** Number of covariates (0 without). */
    public int covariateCount() {
        return covariates == null ? 0 : covariates[0].length;
    }

    @Override
    public double[][] covariates() {
        if (covariates == null) {
            return null;
        }
        double[][] c = new double[covariates.length][];
        for (int i = 0; i < c.length; i++) {
            c[i] = covariates[i].clone();
        }
        return c;
    }

    @Override
    public double[] estimationVariances() {
        return estimationVariances == null ? null : estimationVariances.clone();
    }

    @Override
    public long[][] counts() {
        if (counts == null) {
            return null;
        }
        long[][] c = new long[counts.length][];
        for (int i = 0; i < c.length; i++) {
            c[i] = counts[i].clone();
        }
        return c;
    }

    @Override
    public double[] binEdges() {
        return binEdges == null ? null : binEdges.clone();
    }

    /** Covariate j of unit i (no copy). */
    double covariate(int i, int j) {
        return covariates[i][j];
    }

    /** Estimation variance of unit i (no copy); NaN without. */
    double estimationVariance(int i) {
        return estimationVariances == null ? Double.NaN : estimationVariances[i];
    }

    @Override
    public String toString() {
        return "Period[" + index + ", " + size() + " units, " + covariateCount() + " covariates"
                + (estimationVariances != null ? ", estimation variances" : "") + (counts != null ? ", counts" : "")
                + "]";
    }
}
