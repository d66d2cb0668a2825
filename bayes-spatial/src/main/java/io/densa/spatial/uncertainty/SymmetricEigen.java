package io.densa.spatial.uncertainty;

import io.densa.core.DensaException;
import io.densa.core.SolveDiagnostics;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;

/**
 * Eigen-decomposition of a symmetric K × K matrix by EJML, eigenvalues in decreasing order
 * (package-private).
 *
 * @param values  eigenvalues, decreasing
 * @param vectors K × K row-major, column j the unit eigenvector of values[j]
 */
record SymmetricEigen(double[] values, double[] vectors) {

    static SymmetricEigen of(double[] s, int k) {
        DMatrixRMaj m = new DMatrixRMaj(k, k);
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                m.set(i, j, 0.5 * (s[i * k + j] + s[j * k + i]));
            }
        }
        EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(k, true, true);
        if (!eig.decompose(m)) {
            throw new DensaException("the eigen-decomposition of the " + k + " x " + k + " coordinate covariance did"
                    + " not converge", new SolveDiagnostics("eigen-decomposition of the coordinate covariance", k,
                    Double.NaN));
        }
        Integer[] order = new Integer[k];
        double[] val = new double[k];
        for (int i = 0; i < k; i++) {
            order[i] = i;
            val[i] = eig.getEigenvalue(i).getReal();
        }
        java.util.Arrays.sort(order, (a, b) -> Double.compare(val[b], val[a]));
        double[] values = new double[k];
        double[] vectors = new double[k * k];
        for (int j = 0; j < k; j++) {
            values[j] = val[order[j]];
            DMatrixRMaj v = eig.getEigenVector(order[j]);
            double norm = 0;
            for (int i = 0; i < k; i++) {
                norm += v.get(i) * v.get(i);
            }
            norm = Math.sqrt(norm);
            for (int i = 0; i < k; i++) {
                vectors[i * k + j] = v.get(i) / norm;
            }
        }
        return new SymmetricEigen(values, vectors);
    }

    /**
     * The K × r factor F = V_r diag(√λ_r) of the leading r eigenvalues: the trailing ones are left
     * out while together they hold at most 10⁻⁶ of the trace (so F Fᵀ differs from the matrix by
     * at most 10⁻⁶ of its trace); r is factor.length / K.
     */
    double[] factor() {
        int k = values.length;
        double trace = 0;
        for (double v : values) {
            trace += Math.max(0, v);
        }
        int r = k;
        double dropped = 0;
        while (r > 0 && dropped + Math.max(0, values[r - 1]) <= 1e-6 * trace) {
            dropped += Math.max(0, values[r - 1]);
            r--;
        }
        double[] f = new double[k * Math.max(r, 1)];
        for (int j = 0; j < r; j++) {
            double s = Math.sqrt(values[j]);
            for (int i = 0; i < k; i++) {
                f[i * r + j] = vectors[i * k + j] * s;
            }
        }
        return r == 0 ? new double[0] : f;
    }

    /** RᵀR / tr(RᵀR) of an n × K array (K × K), or null if R is zero. */
    static double[] shape(double[] r, int n, int k) {
        double[] s = new double[k * k];
        for (int i = 0; i < n; i++) {
            for (int a = 0; a < k; a++) {
                double ra = r[i * k + a];
                for (int b = 0; b < k; b++) {
                    s[a * k + b] += ra * r[i * k + b];
                }
            }
        }
        double tr = 0;
        for (int a = 0; a < k; a++) {
            tr += s[a * k + a];
        }
        if (!(tr > 0) || Double.isInfinite(tr)) {
            return null;
        }
        for (int i = 0; i < s.length; i++) {
            s[i] /= tr;
        }
        return s;
    }
}
