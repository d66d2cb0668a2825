package io.densa.spatial.spacetime;

import io.densa.core.internal.RecordArrays;
import java.util.Arrays;
import java.util.Objects;

/**
 * Leave-one-out cross-validation of space–time kriging: for each observation i the error
 * e_i = X(s_i, t_i) ⊖ X̂_{−i}(s_i, t_i) of predicting it from the others.
 *
 * <p>Immutable: arrays are copied in and out.
 *
 * @param errors                       n × K coordinates of e_i
 * @param errorNorms                   ‖e_i‖_B
 * @param krigingVariances             σ²_{−i}, the kriging variance of predicting observation i
 *                                     from the others
 * @param meanSquaredError             mean of ‖e_i‖²_B
 * @param meanStandardisedSquaredError mean of ‖e_i‖²_B / σ²_{−i}; near 1 when the model describes
 *                                     the data
 * @param biasNorm                     ‖(1/n) ⊕_i e_i‖_B, the norm of the mean error
 */
public record SpaceTimeCrossValidation(double[][] errors, double[] errorNorms, double[] krigingVariances,
        double meanSquaredError, double meanStandardisedSquaredError, double biasNorm) {
    /** Copies the arrays. */
    public SpaceTimeCrossValidation {
        errors = RecordArrays.copy(errors);
        errorNorms = RecordArrays.copy(errorNorms);
        krigingVariances = RecordArrays.copy(krigingVariances);
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

    /** Builds the summaries from the errors and variances. */
    static SpaceTimeCrossValidation of(double[][] errors, double[] variances) {
        int n = errors.length;
        int k = n == 0 ? 0 : errors[0].length;
        double[] norms = new double[n];
        double[] mean = new double[k];
        double mse = 0, msse = 0;
        for (int i = 0; i < n; i++) {
            double s = 0;
            for (int q = 0; q < k; q++) {
                s += errors[i][q] * errors[i][q];
                mean[q] += errors[i][q] / n;
            }
            norms[i] = Math.sqrt(s);
            mse += s / n;
            msse += s / variances[i] / n;
        }
        double b = 0;
        for (double m : mean) {
            b += m * m;
        }
        return new SpaceTimeCrossValidation(errors, norms, variances, mse, msse, Math.sqrt(b));
    }

    @Override
    public boolean equals(Object o) {
        if (!(o instanceof SpaceTimeCrossValidation)) {
            return false;
        }
        SpaceTimeCrossValidation c = (SpaceTimeCrossValidation) o;
        return Arrays.deepEquals(errors, c.errors) && Arrays.equals(errorNorms, c.errorNorms)
                && Arrays.equals(krigingVariances, c.krigingVariances)
                && Double.compare(meanSquaredError, c.meanSquaredError) == 0
                && Double.compare(meanStandardisedSquaredError, c.meanStandardisedSquaredError) == 0
                && Double.compare(biasNorm, c.biasNorm) == 0;
    }

    @Override
    public int hashCode() {
        return Objects.hash(Arrays.deepHashCode(errors), Arrays.hashCode(errorNorms), Arrays.hashCode(krigingVariances),
                meanSquaredError, meanStandardisedSquaredError, biasNorm);
    }

    @Override
    public String toString() {
        return "SpaceTimeCrossValidation[n=" + errors.length + ", mse " + meanSquaredError + ", msse "
                + meanStandardisedSquaredError + ", bias " + biasNorm + "]";
    }
}
