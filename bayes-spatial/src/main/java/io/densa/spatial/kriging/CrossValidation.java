package io.densa.spatial.kriging;

import io.densa.core.internal.RecordArrays;

/**
 * Leave-one-out cross-validation of a kriging predictor: for each data location i the error
 * e_i = X(s_i) ⊖ X̂_{−i}(s_i) of predicting the datum from the others.
 *
 *
 * <p>Immutable: arrays are copied on construction and by every accessor; equality is by content.
 *
 * @param errors                       n × K coordinates of e_i 
 * @param errorNorms                   ‖e_i‖_B
 * @param krigingVariances             σ²_{−i}, the kriging variance of the error-free field at s_i
 * @param standardisedErrors           ‖e_i‖_B / √(σ²_{−i} + v_i) with v_i the location's error variance
 * @param meanError                    mean of ‖e_i‖_B ("mean B2 error")
 * @param meanSquaredError             mean of ‖e_i‖²_B
 * @param meanStandardisedSquaredError mean of ‖e_i‖²_B / (σ²_{−i} + v_i); near 1 for a well-calibrated model
 * @param biasNorm                     ‖(1/n) ⊕_i e_i‖_B, the norm of the mean error (near 0 if unbiased)
 */
public record CrossValidation(double[][] errors, double[] errorNorms, double[] krigingVariances,
        double[] standardisedErrors, double meanError, double meanSquaredError, double meanStandardisedSquaredError,
        double biasNorm) {

    /** Copies the array components (the caller keeps its arrays). */
    public CrossValidation {
        errors = RecordArrays.copy(errors);
        errorNorms = RecordArrays.copy(errorNorms);
        krigingVariances = RecordArrays.copy(krigingVariances);
        standardisedErrors = RecordArrays.copy(standardisedErrors);
    }

    /** A copy of the {@code errors} component. */
    @Override
    public double[][] errors() {
        return RecordArrays.copy(errors);
    }

    /** A copy of the {@code errorNorms} component. */
    @Override
    public double[] errorNorms() {
        return RecordArrays.copy(errorNorms);
    }

    /** A copy of the {@code krigingVariances} component. */
    @Override
    public double[] krigingVariances() {
        return RecordArrays.copy(krigingVariances);
    }

    /** A copy of the {@code standardisedErrors} component. */
    @Override
    public double[] standardisedErrors() {
        return RecordArrays.copy(standardisedErrors);
    }

    /** Equality by content of every component (arrays element by element). */
    @Override
    public boolean equals(Object o) {
        return RecordArrays.equal(this, o);
    }

    /** Hash of the content of every component. */
    @Override
    public int hashCode() {
        return RecordArrays.hash(this);
    }

    /** The components, arrays printed by content. */
    @Override
    public String toString() {
        return RecordArrays.describe(this);
    }

    /**
     * The summaries of leave-one-out errors (n × K coordinates) and kriging variances of data
     * without measurement error; what any leave-one-out predictor of densities reports (the
     * space–time kriging of {@code io.densa.spatial.spacetime} uses it too).
     *
     * @throws io.densa.core.DensaException naming the location when an error is not finite or a summary exceeds
     *                        the double range
     */
    public static CrossValidation of(double[][] errors, double[] variances) {
        return of(errors, variances, new double[errors.length]);
    }

    /**
     * The summaries of leave-one-out errors and variances (variances in the data's units).
     *
     * @throws DensaException naming the location when an error is not finite, or when a summary
     *                        exceeds the double range (errors beyond about 1e154, or kriging
     *                        variances so small beside the errors that the standardised squared
     *                        errors overflow: the model's sill does not fit the data)
     */
    static CrossValidation of(double[][] errors, double[] variances, double[] errorVariances) {
        int n = errors.length;
        int k = n == 0 ? 0 : errors[0].length;
        double[] norms = new double[n];
        double[] std = new double[n];
        double[] mean = new double[k];
        double sn = 0, ss = 0, sz = 0;
        for (int i = 0; i < n; i++) {
            double s = 0, max = 0;
            for (int c = 0; c < k; c++) {
                double e = errors[i][c];
                if (!Double.isFinite(e)) {
                    throw failure("the leave-one-out error at location " + i + " (coordinate " + c + ") is " + e
                            + ": predicting it from the others overflows (data coordinates too large, or the system"
                            + " too ill-conditioned); rescale the densities' coordinates or add a nugget", i);
                }
                s += e * e;
                max = Math.max(max, Math.abs(e));
                mean[c] += e;
            }
            norms[i] = s <= 0x1p960 && s >= 0x1p-960 ? Math.sqrt(s) : scaledNorm(errors[i], max);
            double tot = variances[i] + errorVariances[i];
            std[i] = norms[i] / Math.sqrt(tot);
            if (!Double.isFinite(std[i])) {
                throw failure("location " + i + ": the leave-one-out error norm " + norms[i] + " is not representable"
                        + " in units of its kriging standard deviation sqrt(" + tot + "): the model's variances"
                        + " are far too small for the errors; check the variogram's sill", i);
            }
            sn += norms[i];
            ss += s;
            sz += s / tot;
        }
        double b = 0;
        for (int c = 0; c < k; c++) {
            b += (mean[c] / n) * (mean[c] / n);
        }
        if (!Double.isFinite(sn) || !Double.isFinite(ss) || !Double.isFinite(sz) || !Double.isFinite(b)) {
            throw failure("the leave-one-out summaries overflow a double (mean error " + sn / n + ", sum of squared"
                    + " errors " + ss + ", sum of standardised squared errors " + sz + "): errors beyond about 1e154"
                    + " or kriging variances far too small for them; rescale the densities' coordinates or check the"
                    + " variogram's sill", -1);
        }
        return new CrossValidation(errors, norms, variances, std, sn / n, ss / n, sz / n, Math.sqrt(b));
    }

    private static double scaledNorm(double[] e, double max) {
        if (max == 0) {
            return 0;
        }
        double inv = Math.scalb(1.0, -Math.getExponent(max));
        double s = 0;
        for (double v : e) {
            s += (v * inv) * (v * inv);
        }
        return Math.sqrt(s) / inv;
    }

    private static io.densa.core.DensaException failure(String message, int location) {
        return new io.densa.core.DensaException(message, new KrigingDiagnostics(1, Double.NaN,
                location >= 0 ? new int[] {location} : new int[0], "cross-validation overflow"));
    }
}
