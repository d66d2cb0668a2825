package io.densa.spatial.uncertainty;

import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.Locations;
import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;

/**
 * Seeded Gaussian fields of coordinates under the proportional covariance model, for tests:
 * Cov(X_a(s), X_b(s')) = S_ab C(s − s'), sampled as mean + L Z Aᵀ with C = L Lᵀ (EJML Cholesky) and
 * S = A Aᵀ.
 */
final class ProportionalFields {
    private ProportionalFields() {
    }

    /** n × K coordinates (rows) at the locations. */
    static double[][] sample(Locations loc, VariogramModel model, double[] mean, double[][] a, long seed) {
        int n = loc.size(), k = mean.length, r = a[0].length;
        DMatrixRMaj c = new DMatrixRMaj(n, n);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                c.set(i, j, i == j ? model.sill() : model.covariance(loc.distance(i, j)));
            }
            c.add(i, i, 1e-10 * model.sill());
        }
        CholeskyDecomposition_F64<DMatrixRMaj> chol = DecompositionFactory_DDRM.chol(n, true);
        if (!chol.decompose(c)) {
            throw new IllegalStateException("covariance not positive definite");
        }
        DMatrixRMaj l = chol.getT(null);
        Random rnd = new Random(seed);
        double[][] w = new double[n][k];
        for (int i = 0; i < n; i++) {
            double[] z = new double[r];
            for (int j = 0; j < r; j++) {
                z[j] = rnd.nextGaussian();
            }
            for (int q = 0; q < k; q++) {
                double s = 0;
                for (int j = 0; j < r; j++) {
                    s += a[q][j] * z[j];
                }
                w[i][q] = s;
            }
        }
        double[][] out = new double[n][k];
        for (int i = 0; i < n; i++) {
            for (int q = 0; q < k; q++) {
                double s = mean[q];
                for (int j = 0; j <= i; j++) {
                    s += l.get(i, j) * w[j][q];
                }
                out[i][q] = s;
            }
        }
        return out;
    }

    /** The first rows of a matrix. */
    static double[][] head(double[][] m, int rows) {
        return java.util.Arrays.copyOf(m, rows);
    }

    /** A K × K matrix with unit trace from a factor A: S = A Aᵀ / tr(A Aᵀ). */
    static double[][] shape(double[][] a) {
        int k = a.length;
        double[][] s = new double[k][k];
        double tr = 0;
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                for (int l = 0; l < a[0].length; l++) {
                    s[i][j] += a[i][l] * a[j][l];
                }
            }
            tr += s[i][i];
        }
        for (double[] row : s) {
            for (int j = 0; j < k; j++) {
                row[j] /= tr;
            }
        }
        return s;
    }
}
