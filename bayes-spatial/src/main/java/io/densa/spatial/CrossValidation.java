package io.densa.spatial;

/**
 * Leave-one-out cross-validation of a kriging predictor: for each data location i the error
 * e_i = X(s_i) ⊖ X̂_{−i}(s_i) of predicting the datum from the others.
 *
 * @param errors                       n × K coordinates of e_i (owned by the record)
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

    static CrossValidation of(double[][] errors, double[] variances, double[] errorVariances) {
        int n = errors.length;
        int k = n == 0 ? 0 : errors[0].length;
        double[] norms = new double[n];
        double[] std = new double[n];
        double[] mean = new double[k];
        double sn = 0, ss = 0, sz = 0;
        for (int i = 0; i < n; i++) {
            double s = 0;
            for (int c = 0; c < k; c++) {
                s += errors[i][c] * errors[i][c];
                mean[c] += errors[i][c];
            }
            norms[i] = Math.sqrt(s);
            double tot = variances[i] + errorVariances[i];
            std[i] = norms[i] / Math.sqrt(tot);
            sn += norms[i];
            ss += s;
            sz += s / tot;
        }
        double b = 0;
        for (int c = 0; c < k; c++) {
            b += (mean[c] / n) * (mean[c] / n);
        }
        return new CrossValidation(errors, norms, variances, std, sn / n, ss / n, sz / n, Math.sqrt(b));
    }
}
