package io.densa.spatial.kriging;

import java.util.SplittableRandom;

/**
 * Gaussian fields of coordinates at the data locations under the proportional-covariance model,
 * and the drift residuals used by the model checks of {@code io.densa.spatial.uncertainty}.
 *
 * <p>Simulation: with C the n × n trace-covariance of the data (the kriging system's matrix: the
 * model's covariance plus the error variances on the diagonal), C = L Lᵀ, and F the K × r factor of
 * the shape Σ/tr Σ, the n × K field E = L Z Fᵀ (Z standard normal, n × r) has Cov(e_i, e_j) =
 * C_ij Σ/tr Σ: every coordinate shares the spatial correlation and E‖e_i‖² = C_ii.
 *
 * <p>Residuals: the data (or a simulated field) minus its ordinary-least-squares projection on the
 * drift functions (minus the known mean for simple kriging). Any fixed quadratic form RᵀAR of
 * the residuals of a field whose coordinates have covariance C ⊗ Σ has expectation proportional
 * to Σ, so RᵀR / tr(RᵀR) estimates the shape Σ/tr Σ whatever the spatial correlation.
 */
public final class FieldSimulator {
    private final Kriging kr;
    private final int n;
    private final int k;
    private final int p;
    /** n × p orthonormal basis of the drift columns (modified Gram–Schmidt, twice). */
    private final double[] q;
    private double[] chol;

    /**
     * The simulator of a kriging's data locations and model; the Cholesky factor of the data
     * covariance is the kriging's global one, computed when first needed.
     */
    public static FieldSimulator of(Kriging kriging) {
        return new FieldSimulator(java.util.Objects.requireNonNull(kriging, "kriging"));
    }

    private FieldSimulator(Kriging kr) {
        this.kr = kr;
        this.n = kr.size();
        this.k = kr.dimension();
        this.p = kr.type() == Kriging.Type.SIMPLE ? 0 : kr.driftSize();
        q = new double[n * p];
        double[] f = new double[n * p];
        for (int i = 0; i < n; i++) {
            kr.design().driftRow(i, f, i * p);
        }
        // the orthonormal columns of F by the drift design's modified Gram–Schmidt (twice); the
        // drift was checked at construction, so no column is dependent
        DriftDesign.dependentColumn(f, n, p, q);
    }

    /** Residuals of the data coordinates (a new n × K array, row-major). */
    public double[] dataResiduals() {
        double[] y = kr.dataCoordinates();
        if (kr.type() == Kriging.Type.SIMPLE) {
            double[] m = kr.centre();
            for (int i = 0; i < n; i++) {
                for (int c = 0; c < k; c++) {
                    y[i * k + c] -= m[c];
                }
            }
            return y;
        }
        project(y);
        return y;
    }

    /** Residuals of a simulated zero-mean field (n × K, row-major), in place. */
    public void simulatedResiduals(double[] e) {
        if (kr.type() != Kriging.Type.SIMPLE) {
            project(e);
        }
    }

    /** y −= Q Qᵀ y (n × K, in place). */
    private void project(double[] y) {
        double[] qty = new double[p * k];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < p; j++) {
                double qi = q[i * p + j];
                for (int c = 0; c < k; c++) {
                    qty[j * k + c] += qi * y[i * k + c];
                }
            }
        }
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < p; j++) {
                double qi = q[i * p + j];
                for (int c = 0; c < k; c++) {
                    y[i * k + c] -= qi * qty[j * k + c];
                }
            }
        }
    }

    /**
     * A field E = L Z Fᵀ (n × K, row-major) with F the K × r factor (row-major); Z from rng in row
     * order (r standard normal draws per location).
     */
    public double[] simulate(double[] factor, int r, SplittableRandom rng) {
        double[] l = cholesky();
        double[] w = new double[n * k];
        double[] z = new double[r];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < r; j++) {
                z[j] = rng.nextGaussian();
            }
            for (int c = 0; c < k; c++) {
                double s = 0;
                for (int j = 0; j < r; j++) {
                    s += factor[c * r + j] * z[j];
                }
                w[i * k + c] = s;
            }
        }
        double[] e = new double[n * k];
        for (int i = 0; i < n; i++) {
            int lo = i * n;
            for (int j = 0; j <= i; j++) {
                double lij = l[lo + j];
                if (lij == 0) {
                    continue;
                }
                for (int c = 0; c < k; c++) {
                    e[i * k + c] += lij * w[j * k + c];
                }
            }
        }
        return e;
    }

    private synchronized double[] cholesky() {
        if (chol == null) {
            chol = kr.globalSystem().lowerFactor();
        }
        return chol;
    }
}
