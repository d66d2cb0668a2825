package io.densa.examples;

import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;

/**
 * Draws of a zero-mean stationary Gaussian random field with exponential covariance
 * σ² exp(−h / r) at given points, by the Cholesky factor of the covariance matrix (exact
 * simulation; fine for a few hundred points).
 */
final class GaussianField {
    private GaussianField() {
    }

    /**
     * One draw of the field at the points (x[i], y[i]).
     *
     * @param range  the range r of exp(−h / r), in the units of the coordinates
     * @param sill   the variance σ²
     * @param random the random source (advanced)
     */
    static double[] sample(double[] x, double[] y, double range, double sill, Random random) {
        int n = x.length;
        DMatrixRMaj c = new DMatrixRMaj(n, n);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j <= i; j++) {
                double h = Math.hypot(x[i] - x[j], y[i] - y[j]);
                double v = sill * Math.exp(-h / range) + (i == j ? 1e-9 * sill : 0);
                c.set(i, j, v);
                c.set(j, i, v);
            }
        }
        CholeskyDecomposition_F64<DMatrixRMaj> chol = DecompositionFactory_DDRM.chol(n, true);
        if (!chol.decompose(c)) {
            throw new IllegalStateException("covariance of the simulated field is not positive definite");
        }
        DMatrixRMaj l = chol.getT(null);
        double[] z = new double[n];
        for (int i = 0; i < n; i++) {
            z[i] = random.nextGaussian();
        }
        double[] out = new double[n];
        for (int i = 0; i < n; i++) {
            double s = 0;
            for (int j = 0; j <= i; j++) {
                s += l.get(i, j) * z[j];
            }
            out[i] = s;
        }
        return out;
    }
}
