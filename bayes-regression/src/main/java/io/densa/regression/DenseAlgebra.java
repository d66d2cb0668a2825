package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.SolveDiagnostics;
import io.densa.core.internal.Cholesky;
import java.util.Arrays;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;
import org.ejml.interfaces.decomposition.QRDecomposition;

/**
 * Dense linear algebra on row-major arrays for the regression models (package-private): the
 * symmetric eigenproblem, Cholesky solves of the normal equations, least squares by QR, products.
 */
final class DenseAlgebra {
    private DenseAlgebra() {
    }

    /** Eigen-decomposition of a symmetric matrix: values descending, vectors as columns. */
    record Eigen(double[] values, double[] vectors, int k) {
        /** Column j of the eigenvector matrix (fresh). */
        double[] vector(int j) {
            double[] v = new double[k];
            for (int i = 0; i < k; i++) {
                v[i] = vectors[i * k + j];
            }
            return v;
        }
    }

    /**
     * Symmetric eigenproblem (EJML symmetric QR algorithm). Eigenvalues sorted descending, tiny
     * negative rounding clipped to 0; each eigenvector's sign is fixed so that its entry of
     * largest magnitude is positive (deterministic output).
     */
    static Eigen symmetricEigen(double[] a, int k) {
        DMatrixRMaj m = DMatrixRMaj.wrap(k, k, a.clone());
        // symmetrise against rounding
        for (int i = 0; i < k; i++) {
            for (int j = i + 1; j < k; j++) {
                double s = 0.5 * (m.data[i * k + j] + m.data[j * k + i]);
                m.data[i * k + j] = s;
                m.data[j * k + i] = s;
            }
        }
        EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(k, true, true);
        if (!eig.decompose(m)) {
            throw new DensaException("symmetric eigen-decomposition of a " + k + " x " + k + " matrix failed",
                    new SolveDiagnostics("eigen", k, Double.NaN));
        }
        Integer[] order = new Integer[k];
        double[] vals = new double[k];
        for (int i = 0; i < k; i++) {
            order[i] = i;
            vals[i] = eig.getEigenvalue(i).getReal();
        }
        Arrays.sort(order, (x, y) -> Double.compare(vals[y], vals[x]));
        double[] values = new double[k];
        double[] vectors = new double[k * k];
        double max = Math.max(0.0, vals[order[0]]);
        for (int j = 0; j < k; j++) {
            int src = order[j];
            double v = vals[src];
            values[j] = v < 0 && v > -1e-12 * Math.max(max, Double.MIN_NORMAL) ? 0.0 : Math.max(v, 0.0);
            DMatrixRMaj vec = eig.getEigenVector(src);
            int arg = 0;
            for (int i = 1; i < k; i++) {
                if (Math.abs(vec.data[i]) > Math.abs(vec.data[arg])) {
                    arg = i;
                }
            }
            double sign = vec.data[arg] < 0 ? -1.0 : 1.0;
            double norm = 0;
            for (int i = 0; i < k; i++) {
                norm += vec.data[i] * vec.data[i];
            }
            norm = Math.sqrt(norm);
            for (int i = 0; i < k; i++) {
                vectors[i * k + j] = sign * vec.data[i] / norm;
            }
        }
        return new Eigen(values, vectors, k);
    }

    /**
     * Smallest and largest eigenvalue of a symmetric matrix, without clipping (EJML symmetric QR
     * algorithm).
     *
     * @return {smallest, largest}
     */
    static double[] eigenvalueRange(double[] a, int k) {
        DMatrixRMaj m = DMatrixRMaj.wrap(k, k, a.clone());
        EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(k, false, true);
        if (!eig.decompose(m)) {
            throw new DensaException("symmetric eigen-decomposition of a " + k + " x " + k + " matrix failed",
                    new SolveDiagnostics("eigen", k, Double.NaN));
        }
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < k; i++) {
            double v = eig.getEigenvalue(i).getReal();
            lo = Math.min(lo, v);
            hi = Math.max(hi, v);
        }
        return new double[] {lo, hi};
    }

    /**
     * Solves A X = B for symmetric positive definite A (p × p) and B (p × r) by Cholesky.
     *
     * @throws DensaException if A is not numerically positive definite
     */
    static double[] solveSpd(double[] a, int p, double[] b, int r, String what) {
        // the factor reads the lower triangle; A's upper one is what the solve has always used
        double[] l = a.clone();
        for (int i = 0; i < p; i++) {
            for (int j = i + 1; j < p; j++) {
                l[j * p + i] = l[i * p + j];
            }
        }
        double maxDiag = 0;
        for (int i = 0; i < p; i++) {
            maxDiag = Math.max(maxDiag, Math.abs(a[i * p + i]));
        }
        int bad = Cholesky.factor(l, p, p, 0);
        if (bad >= 0) {
            double d = l[bad * p + bad];
            if (!(d <= 0)) { // NaN or +Inf: reported as a numerically singular system
                double ratio = maxDiag > 0 ? Double.NaN : 0.0;
                throw new DensaException(what + ": the " + p + " x " + p + " normal equations are numerically"
                        + " singular (smallest pivot ratio " + ratio + ")", new SolveDiagnostics(what, p, ratio));
            }
            throw new DensaException(what + ": the " + p + " x " + p + " normal equations are not positive definite",
                    new SolveDiagnostics(what, p, 0.0));
        }
        double minPivot = Double.POSITIVE_INFINITY;
        for (int i = 0; i < p; i++) {
            minPivot = Math.min(minPivot, l[i * p + i] * l[i * p + i]);
        }
        double ratio = maxDiag > 0 ? minPivot / maxDiag : 0.0;
        if (!(ratio > 1e-14)) {
            throw new DensaException(what + ": the " + p + " x " + p + " normal equations are numerically singular"
                    + " (smallest pivot ratio " + ratio + ")", new SolveDiagnostics(what, p, ratio));
        }
        double[] xd = b.clone();
        Cholesky.solveColumns(l, p, xd, r);
        return xd;
    }

    /**
     * Least-squares solution and inverse Gram matrix of a full-column-rank system.
     *
     * @param solution     X (p × r) minimising ‖A X − B‖_F
     * @param inverseGram  (AᵀA)⁻¹ = R⁻¹R⁻ᵀ (p × p)
     */
    record LeastSquares(double[] solution, double[] inverseGram) {
    }

    /**
     * Least squares by Householder QR (EJML): A = QR, X = R⁻¹ QᵀB, (AᵀA)⁻¹ = R⁻¹R⁻ᵀ. Unlike the
     * normal equations, the error grows with cond(A), not cond(A)² (Golub and Van Loan (2013),
     * Matrix Computations, 4th ed., §5.3).
     *
     * @param a rows × p, not modified
     * @param b rows × r, not modified
     * @throws DensaException if R is numerically singular (smallest |R_jj| at most 1e-7 times the
     *                        largest, the QR analogue of the pivot test of {@link #solveSpd})
     */
    static LeastSquares leastSquares(double[] a, int rows, int p, double[] b, int r, String what) {
        Reduced red = reduce(a, rows, p, b, r, what);
        return triangularSolve(red.r(), p, red.qtb(), r, rows, what);
    }

    /**
     * A least-squares problem reduced by QR: ‖A X − B‖² = ‖R X − QᵀB‖² + const.
     *
     * @param r   p × p upper triangular factor
     * @param qtb QᵀB, p × r
     */
    record Reduced(double[] r, double[] qtb) {
    }

    /** Householder QR of A (rows × p, not modified) and QᵀB (B rows × r, not modified). */
    static Reduced reduce(double[] a, int rows, int p, double[] b, int r, String what) {
        QRDecomposition<DMatrixRMaj> qr = DecompositionFactory_DDRM.qr(rows, p);
        if (!qr.decompose(DMatrixRMaj.wrap(rows, p, a.clone()))) {
            throw new DensaException(what + ": QR decomposition of the " + rows + " x " + p + " system failed",
                    new SolveDiagnostics(what, p, Double.NaN));
        }
        double[] q = qr.getQ(null, true).data; // rows × p
        return new Reduced(qr.getR(null, true).data, multTransA(q, rows, p, b, r));
    }

    /** X = R⁻¹ QᵀB and R⁻¹R⁻ᵀ from an upper triangular R, with the rank test of {@link #leastSquares}. */
    private static LeastSquares triangularSolve(double[] rr, int p, double[] qtb, int r, int rows, String what) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        for (int j = 0; j < p; j++) {
            double d = Math.abs(rr[j * p + j]);
            lo = Math.min(lo, d);
            hi = Math.max(hi, d);
        }
        double ratio = hi > 0 ? lo / hi : 0.0;
        if (!(ratio > 1e-7)) {
            throw new DensaException(what + ": the " + rows + " x " + p + " system is numerically rank deficient"
                    + " (smallest |R_jj| / largest " + ratio + ")", new SolveDiagnostics(what, p, ratio * ratio));
        }
        double[] x = qtb.clone();
        for (int c = 0; c < r; c++) {
            for (int i = p - 1; i >= 0; i--) {
                double s = x[i * r + c];
                for (int j = i + 1; j < p; j++) {
                    s -= rr[i * p + j] * x[j * r + c];
                }
                x[i * r + c] = s / rr[i * p + i];
            }
        }
        // R⁻¹ by back substitution, then R⁻¹R⁻ᵀ
        double[] ri = new double[p * p];
        Cholesky.invertUpper(rr, p, p, 1, ri);
        double[] g = new double[p * p];
        for (int i = 0; i < p; i++) {
            for (int j = i; j < p; j++) {
                double s = 0;
                for (int m = Math.max(i, j); m < p; m++) {
                    s += ri[i * p + m] * ri[j * p + m];
                }
                g[i * p + j] = s;
                g[j * p + i] = s;
            }
        }
        return new LeastSquares(x, g);
    }

    /** C (n × m) = A (n × k) B (k × m), all row-major. */
    static double[] mult(double[] a, int n, int k, double[] b, int m) {
        DMatrixRMaj c = new DMatrixRMaj(n, m);
        CommonOps_DDRM.mult(DMatrixRMaj.wrap(n, k, a), DMatrixRMaj.wrap(k, m, b), c);
        return c.data;
    }

    /** C (k × m) = Aᵀ B for A (n × k), B (n × m). */
    static double[] multTransA(double[] a, int n, int k, double[] b, int m) {
        DMatrixRMaj c = new DMatrixRMaj(k, m);
        CommonOps_DDRM.multTransA(DMatrixRMaj.wrap(n, k, a), DMatrixRMaj.wrap(n, m, b), c);
        return c.data;
    }

    /** C (n × m) = A Bᵀ for A (n × k), B (m × k). */
    static double[] multTransB(double[] a, int n, int k, double[] b, int m) {
        DMatrixRMaj c = new DMatrixRMaj(n, m);
        CommonOps_DDRM.multTransB(DMatrixRMaj.wrap(n, k, a), DMatrixRMaj.wrap(m, k, b), c);
        return c.data;
    }

    /** Row-major copy of columns [c0, c1) of an n × k matrix. */
    static double[] columns(double[] a, int n, int k, int c0, int c1) {
        int w = c1 - c0;
        double[] out = new double[n * w];
        for (int i = 0; i < n; i++) {
            System.arraycopy(a, i * k + c0, out, i * w, w);
        }
        return out;
    }

    /** Values of Σ_k c_k e_k(x) at each point x (a clr function given by coordinates c). */
    static double[] clrAt(BayesSpace space, double[] coords, double[] xs) {
        DMatrixRMaj e = space.basisMatrix(xs);
        int k = space.dimension();
        double[] out = new double[xs.length];
        for (int i = 0; i < xs.length; i++) {
            double s = 0;
            for (int j = 0; j < k; j++) {
                s += e.data[i * k + j] * coords[j];
            }
            out[i] = s;
        }
        return out;
    }

}
