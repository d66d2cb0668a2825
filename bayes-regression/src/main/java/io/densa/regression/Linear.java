package io.densa.regression;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.DensitySet;
import java.util.Arrays;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;

/** Small dense linear-algebra helpers on row-major arrays (package-private). */
final class Linear {
    private Linear() {
    }

    /** Diagnostics of a failed factorisation. */
    record SolveDiagnostics(String system, int size, double smallestPivotRatio) {
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
     * Solves A X = B for symmetric positive definite A (p × p) and B (p × r) by Cholesky.
     *
     * @throws DensaException if A is not numerically positive definite
     */
    static double[] solveSpd(double[] a, int p, double[] b, int r, String what) {
        DMatrixRMaj am = DMatrixRMaj.wrap(p, p, a.clone());
        CholeskyDecomposition_F64<DMatrixRMaj> chol = DecompositionFactory_DDRM.chol(p, true);
        double maxDiag = 0;
        for (int i = 0; i < p; i++) {
            maxDiag = Math.max(maxDiag, Math.abs(a[i * p + i]));
        }
        if (!chol.decompose(am)) {
            throw new DensaException(what + ": the " + p + " x " + p + " normal equations are not positive definite",
                    new SolveDiagnostics(what, p, 0.0));
        }
        DMatrixRMaj l = chol.getT(null);
        double minPivot = Double.POSITIVE_INFINITY;
        for (int i = 0; i < p; i++) {
            minPivot = Math.min(minPivot, l.data[i * p + i] * l.data[i * p + i]);
        }
        double ratio = maxDiag > 0 ? minPivot / maxDiag : 0.0;
        if (!(ratio > 1e-14)) {
            throw new DensaException(what + ": the " + p + " x " + p + " normal equations are numerically singular"
                    + " (smallest pivot ratio " + ratio + ")", new SolveDiagnostics(what, p, ratio));
        }
        DMatrixRMaj x = DMatrixRMaj.wrap(p, r, b.clone());
        // forward and back substitution with L Lᵀ
        double[] ld = l.data;
        double[] xd = x.data;
        for (int c = 0; c < r; c++) {
            for (int i = 0; i < p; i++) {
                double s = xd[i * r + c];
                for (int j = 0; j < i; j++) {
                    s -= ld[i * p + j] * xd[j * r + c];
                }
                xd[i * r + c] = s / ld[i * p + i];
            }
            for (int i = p - 1; i >= 0; i--) {
                double s = xd[i * r + c];
                for (int j = i + 1; j < p; j++) {
                    s -= ld[j * p + i] * xd[j * r + c];
                }
                xd[i * r + c] = s / ld[i * p + i];
            }
        }
        return xd;
    }

    /** Inverse of a symmetric positive definite matrix. */
    static double[] inverseSpd(double[] a, int p, String what) {
        double[] id = new double[p * p];
        for (int i = 0; i < p; i++) {
            id[i * p + i] = 1.0;
        }
        return solveSpd(a, p, id, p, what);
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

    /** Copies of grid points, each checked to be finite. */
    static double[] grid(double[] xs, String name) {
        if (xs == null || xs.length == 0) {
            throw new IllegalArgumentException(name + " must contain at least one point");
        }
        for (int i = 0; i < xs.length; i++) {
            if (!Double.isFinite(xs[i])) {
                throw new IllegalArgumentException(name + "[" + i + "] is not finite: " + xs[i]);
            }
        }
        return xs.clone();
    }

    /** Requires two spaces to be equal, naming both. */
    static void sameSpace(BayesSpace expected, BayesSpace got, String what) {
        if (!expected.equals(got)) {
            throw new IllegalArgumentException(what + " lives in " + got + " but the model expects " + expected);
        }
    }

    /** Requires a set to have n rows. */
    static void rows(DensitySet set, int n, String what) {
        if (set.size() != n) {
            throw new IllegalArgumentException(what + " has " + set.size() + " rows, expected " + n
                    + " (one per observation)");
        }
    }

    /** Seeded permutation of 0..n−1 (Fisher–Yates on a SplittableRandom). */
    static int[] permutation(int n, java.util.SplittableRandom rnd) {
        int[] p = new int[n];
        for (int i = 0; i < n; i++) {
            p[i] = i;
        }
        for (int i = n - 1; i > 0; i--) {
            int j = rnd.nextInt(i + 1);
            int t = p[i];
            p[i] = p[j];
            p[j] = t;
        }
        return p;
    }

    /** Fold index of every row for k-fold cross-validation (balanced sizes, seeded). */
    static int[] folds(int n, int k, long seed) {
        if (k < 2 || k > n) {
            throw new IllegalArgumentException("fold count must be in [2, n = " + n + "], got " + k);
        }
        int[] perm = permutation(n, new java.util.SplittableRandom(seed));
        int[] fold = new int[n];
        for (int r = 0; r < n; r++) {
            fold[perm[r]] = (int) ((long) r * k / n);
        }
        return fold;
    }

    /** Empirical quantile, type 7 (linear interpolation between order statistics), of a sorted array. */
    static double quantileSorted(double[] sorted, double p) {
        int n = sorted.length;
        if (n == 1) {
            return sorted[0];
        }
        double h = (n - 1) * p;
        int lo = (int) Math.floor(h);
        int hi = Math.min(n - 1, lo + 1);
        return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
    }
}
