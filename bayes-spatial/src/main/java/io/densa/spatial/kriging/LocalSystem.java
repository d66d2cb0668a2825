package io.densa.spatial.kriging;

import io.densa.core.DensaException;
import io.densa.core.internal.Cholesky;
import io.densa.core.internal.Kernels;
import java.util.function.IntFunction;
import org.ejml.data.DMatrixRMaj;

/**
 * A factorised kriging system for one neighbour set (package-private). With C the m × m data
 * covariance (plus error variances on the diagonal), C = L Lᵀ, drift matrix F (m × p), it keeps
 * G = L⁻¹F, S⁻¹ = (GᵀG)⁻¹ = (FᵀC⁻¹F)⁻¹ and L⁻¹Y (Y the data coordinates, centred by the known mean
 * for simple kriging; small systems keep Y instead, see {@link #KEEP_DATA_LIMIT}). A target with
 * covariance vector c0 and drift vector f0 then needs one forward solve v = L⁻¹c0 and gives, with
 * r = Gᵀv − f0 and μ = S⁻¹r,
 * prediction (v − Gμ)ᵀ L⁻¹Y, variance C(0) − vᵀv + rᵀμ and weights λ = L⁻ᵀ(v − Gμ).
 * These are the universal kriging equations Cλ + Fμ = c0, Fᵀλ = f0,
 * σ² = C(0) − λᵀc0 − μᵀf0 ("A Universal Kriging predictor for spatially dependent functional data
 * of a Hilbert Space", Electron. J. Statist. 7 (2013), doi:10.1214/13-EJS843 — from memory),
 * reduced through the Schur complement; p = 0 is simple kriging, p = 1 with f ≡ 1 ordinary kriging.
 */
final class LocalSystem {
    /**
     * Largest accepted relative residual of the unbiasedness constraints Fᵀλ = f0, per drift
     * function |(Fᵀλ − f0)_j| / max(1, |f0_j|): weights that sum to 1 ± 10⁻⁶ (our choice; well
     * conditioned systems give about 10⁻¹⁵, and far outside the data the residual grows with the
     * drift's extrapolation until it reaches order 1).
     */
    static final double CONSTRAINT_TOLERANCE = 1e-6;

    private final int[] idx;
    private final int m;
    private final int p;
    private final int k;
    private final double[] l;   // m × m lower
    /** 1/L_ii: each target's substitutions multiply by it instead of dividing (no chain of divisions). */
    private final double[] inverseDiagonal;
    private final double[] g;   // m × p
    private final double[] sInv; // p × p
    /** L⁻¹Y (m × k) for large systems; null for small ones, which keep Y itself. */
    private final double[] ly;
    /** Y, the centred data rows (m × k), kept for small systems (null when ly is kept). */
    private final double[] y;
    private final double condition;

    /**
     * Systems of at most this many stations keep Y and predict through the weights λ = L⁻ᵀz
     * (λᵀY: one extra triangular solve of m² / 2 per target) instead of transforming Y once
     * (m² k / 2 at factorisation): a neighbourhood system serves few targets (about ten grid cells
     * on average in a dense grid, one in leave-one-out), so not transforming Y saves work whenever
     * a system serves fewer than K targets; the global system serves every target and transforms.
     */
    static final int KEEP_DATA_LIMIT = 96;

    private LocalSystem(int[] idx, int p, int k, double[] l, double[] g, double[] sInv, double[] ly, double[] y,
            double condition) {
        this.idx = idx;
        this.m = idx.length;
        this.p = p;
        this.k = k;
        this.l = l;
        this.inverseDiagonal = Cholesky.inverseDiagonal(l, m, m);
        this.g = g;
        this.sInv = sInv;
        this.ly = ly;
        this.y = y;
        this.condition = condition;
    }

    /**
     * Factorises a kriging system given as arrays: C = L Lᵀ, G = L⁻¹F, L⁻¹Y and S⁻¹ = (GᵀG)⁻¹.
     *
     * @param idx               the stations of the system (kept, not copied; reported in diagnostics)
     * @param cov               C, m × m symmetric with the diagonal extras included (overwritten by L)
     * @param driftRows         F, m × p row-major (overwritten by G)
     * @param dataRows          Y, m × k row-major, already centred (overwritten by L⁻¹Y)
     * @param conditionLimit    the largest accepted condition estimate of C
     * @param dependentMessage  the message for drift column j that the others determine over these
     *                          m stations
     * @throws DensaException with {@link KrigingDiagnostics} on a Cholesky breakdown, an
     *                        ill-conditioned C or a singular drift
     */
    static LocalSystem factor(int[] idx, double[] cov, double[] driftRows, double[] dataRows, int p, int k,
            double conditionLimit, IntFunction<String> dependentMessage) {
        int m = idx.length;
        double[] l = cholesky(cov, m, idx, "covariance matrix");
        double dmax = 0, dmin = Double.POSITIVE_INFINITY;
        for (int r = 0; r < m; r++) {
            dmax = Math.max(dmax, l[r * m + r]);
            dmin = Math.min(dmin, l[r * m + r]);
        }
        double cond = (dmax / dmin) * (dmax / dmin);
        if (!(cond <= conditionLimit)) {
            throw new DensaException("kriging system of " + m + " locations is ill-conditioned (condition estimate "
                    + cond + " > limit " + conditionLimit + "); locations may nearly coincide: add error"
                    + " variances, a nugget or withCoincidentNugget", new KrigingDiagnostics(m, cond, idx.clone(),
                    "ill-conditioned covariance matrix"));
        }
        int dep = p > 1 ? DriftDesign.dependentColumn(driftRows, m, p, null) : -1;
        if (dep >= 0) {
            throw new DensaException(dependentMessage.apply(dep), new KrigingDiagnostics(m, cond, idx.clone(),
                    "dependent drift function " + dep));
        }
        double[] g = driftRows;
        Cholesky.forwardRows(l, m, g, p);
        double[] sInv = new double[p * p];
        if (p > 0) {
            double[] s = new double[p * p];
            for (int r = 0; r < m; r++) {
                for (int i = 0; i < p; i++) {
                    double gi = g[r * p + i];
                    for (int j = 0; j < p; j++) {
                        s[i * p + j] += gi * g[r * p + j];
                    }
                }
            }
            sInv = inverseSpd(s, p, idx);
        }
        if (m <= KEEP_DATA_LIMIT) {
            return new LocalSystem(idx, p, k, l, g, sInv, null, dataRows, cond);
        }
        double[] ly = dataRows;
        Cholesky.forwardRows(l, m, ly, k);
        return new LocalSystem(idx, p, k, l, g, sInv, ly, null, cond);
    }

    /** L⁻¹Y of a small system, computed on first use (drift coefficients, dual weights). */
    private volatile double[] lyLater;

    /** L⁻¹Y: the kept one, or computed once from Y (small systems). */
    private double[] transformedData() {
        if (ly != null) {
            return ly;
        }
        double[] t = lyLater;
        if (t == null) {
            t = y.clone();
            Cholesky.forwardRows(l, m, t, k);
            lyLater = t;
        }
        return t;
    }

    /** The system's station indices, increasing, in the first {@link #size} entries (not a copy). */
    int[] stationsView() {
        return idx;
    }

    /** Number of stations m. */
    int size() {
        return m;
    }

    /** Diagnostics of this system with the given reason (the station indices copied). */
    KrigingDiagnostics diagnostics(String reason) {
        return new KrigingDiagnostics(m, condition, idx.clone(), reason);
    }

    /** L, the m × m lower Cholesky factor of C (the internal array: callers must not modify it). */
    double[] lowerFactor() {
        return l;
    }

    /** β̂ = S⁻¹ Gᵀ L⁻¹Y = (FᵀC⁻¹F)⁻¹FᵀC⁻¹Y, row-major p × k. */
    double[] driftCoefficients() {
        double[] ly = transformedData();
        double[] gty = new double[p * k];
        for (int r = 0; r < m; r++) {
            for (int j = 0; j < p; j++) {
                double gj = g[r * p + j];
                for (int c = 0; c < k; c++) {
                    gty[j * k + c] += gj * ly[r * k + c];
                }
            }
        }
        double[] beta = new double[p * k];
        for (int i = 0; i < p; i++) {
            for (int j = 0; j < p; j++) {
                double si = sInv[i * p + j];
                for (int c = 0; c < k; c++) {
                    beta[i * k + c] += si * gty[j * k + c];
                }
            }
        }
        return beta;
    }

    /**
     * Dual weights α = C⁻¹(Y − Fβ) = L⁻ᵀ(L⁻¹Y − Gβ) (row-major m × k), so that the prediction at s_0
     * is centre + c0ᵀα + f0ᵀβ.
     */
    double[] dualWeights(double[] beta) {
        double[] ly = transformedData();
        double[] a = new double[m * k];
        double[] col = new double[m];
        for (int c = 0; c < k; c++) {
            for (int r = 0; r < m; r++) {
                double s = ly[r * k + c];
                for (int j = 0; j < p; j++) {
                    s -= g[r * p + j] * beta[j * k + c];
                }
                col[r] = s;
            }
            Cholesky.backward(l, m, m, col, 0);
            for (int r = 0; r < m; r++) {
                a[r * k + c] = col[r];
            }
        }
        return a;
    }

    /**
     * The diagonal of the inverse of the bordered kriging matrix [[C, F], [Fᵀ, 0]] in its C block:
     * B_ii = (C⁻¹)_ii − u_iᵀ S⁻¹ u_i with U = C⁻¹F = L⁻ᵀG (m entries).
     */
    double[] borderedInverseDiagonal() {
        // diag(C^{-1})_i = Σ_r (L^{-1})_{ri}^2 from the triangular inverse
        double[] diag = new double[m];
        double[] linv = new double[m];
        for (int col = 0; col < m; col++) {
            Cholesky.invertLowerColumn(l, m, col, linv);
            double s = 0;
            for (int r = col; r < m; r++) {
                s += linv[r] * linv[r];
            }
            diag[col] = s;
        }
        double[] u = new double[m * p];
        double[] col = new double[m];
        for (int j = 0; j < p; j++) {
            for (int r = 0; r < m; r++) {
                col[r] = g[r * p + j];
            }
            Cholesky.backward(l, m, m, col, 0);
            for (int r = 0; r < m; r++) {
                u[r * p + j] = col[r];
            }
        }
        for (int i = 0; i < m; i++) {
            double b = diag[i];
            for (int a = 0; a < p; a++) {
                double s = 0;
                for (int j = 0; j < p; j++) {
                    s += sInv[a * p + j] * u[i * p + j];
                }
                b -= u[i * p + a] * s;
            }
            diag[i] = b;
        }
        return diag;
    }

    /** Lower Cholesky factor of the symmetric matrix a (m × m, overwritten for small m). */
    static double[] cholesky(double[] a, int m, int[] idx, String what) {
        if (m >= Cholesky.LARGE) {
            double[] l = Cholesky.factorLarge(DMatrixRMaj.wrap(m, m, a));
            if (l == null) {
                throw breakdown(m, idx, what);
            }
            for (int r = 0; r < m; r++) {
                if (!(l[r * m + r] > 0) || Double.isInfinite(l[r * m + r])) {
                    throw breakdown(m, idx, what);
                }
                for (int c = r + 1; c < m; c++) {
                    l[r * m + c] = 0;
                }
            }
            return l;
        }
        if (Cholesky.factor(a, m, m, 0) >= 0) {
            throw breakdown(m, idx, what);
        }
        for (int r = 0; r < m; r++) {
            for (int c = r + 1; c < m; c++) {
                a[r * m + c] = 0;
            }
        }
        return a;
    }

    private static DensaException breakdown(int m, int[] idx, String what) {
        return new DensaException("kriging " + what + " of " + m + " locations is not positive definite (Cholesky"
                + " breakdown): the model may be invalid for these locations or locations nearly coincide",
                new KrigingDiagnostics(m, Double.POSITIVE_INFINITY, idx.clone(), "Cholesky breakdown of " + what));
    }

    private static double[] inverseSpd(double[] s, int p, int[] idx) {
        double[] l;
        try {
            l = cholesky(s.clone(), p, idx, "drift matrix F'C^-1F");
        } catch (DensaException e) {
            throw new DensaException("the drift is not identifiable from these " + idx.length + " locations (the "
                    + p + " x " + p + " matrix F'C^-1F of the drift functions is not positive definite): use fewer"
                    + " drift functions or more neighbours", new KrigingDiagnostics(idx.length,
                    Double.POSITIVE_INFINITY, idx.clone(), "singular drift matrix"));
        }
        double dmax = 0, dmin = Double.POSITIVE_INFINITY;
        for (int r = 0; r < p; r++) {
            dmax = Math.max(dmax, l[r * p + r]);
            dmin = Math.min(dmin, l[r * p + r]);
        }
        double cond = (dmax / dmin) * (dmax / dmin);
        if (!(cond < 1e14)) {
            throw new DensaException("the drift is not identifiable from these " + idx.length + " locations"
                    + " (F'C^-1F condition estimate " + cond + "): use fewer drift functions or more neighbours",
                    new KrigingDiagnostics(idx.length, cond, idx.clone(), "singular drift matrix"));
        }
        double[] inv = new double[p * p];
        for (int i = 0; i < p; i++) {
            inv[i * p + i] = 1;
        }
        // inv = L^{-T} L^{-1}: solve columns
        double[] e = new double[p];
        double[] out = new double[p * p];
        for (int col = 0; col < p; col++) {
            java.util.Arrays.fill(e, 0);
            e[col] = 1;
            Cholesky.solve(l, p, p, e, 0);
            for (int r = 0; r < p; r++) {
                out[r * p + col] = e[r];
            }
        }
        return out;
    }

    /** Scratch space for {@link #predict}. */
    static final class Scratch {
        final double[] r;
        final double[] mu;
        /** Relative residual of the unbiasedness constraints of the last {@link #predict} (0 if p = 0). */
        double residual;

        private double[] row = new double[0];

        Scratch(int p) {
            r = new double[Math.max(1, p)];
            mu = new double[Math.max(1, p)];
        }

        /** A work row of at least k entries. */
        double[] row(int k) {
            if (row.length < k) {
                row = new double[k];
            }
            return row;
        }
    }

    /** gᵀz − f for one drift column g (ordinary kriging), summed in row order. */
    private double oneColumnResidual(double[] z, double f) {
        double r0 = 0;
        for (int r = 0; r < m; r++) {
            r0 += g[r] * z[r];
        }
        return r0 - f;
    }

    /**
     * The unbiasedness constraints in the factorised form: the weights λ = L⁻ᵀz satisfy
     * Fᵀλ = (LG)ᵀL⁻ᵀz = Gᵀz, and the prediction zᵀL⁻¹Y has exactly these effective weights. Writes
     * Gᵀz − f0 into rr and returns max_j |rr_j| / max(1, |f0_j|).
     */
    private double constraintResidual(double[] z, double[] f0, double[] rr) {
        if (p == 1) {
            double r0 = oneColumnResidual(z, f0[0]);
            rr[0] = r0;
            double worst = Math.max(0, Math.abs(r0) / Math.max(1, Math.abs(f0[0])));
            return Double.isNaN(worst) ? Double.POSITIVE_INFINITY : worst;
        }
        java.util.Arrays.fill(rr, 0, p, 0.0);
        for (int r = 0; r < m; r++) {
            double zr = z[r];
            for (int j = 0; j < p; j++) {
                rr[j] += g[r * p + j] * zr;
            }
        }
        double worst = 0;
        for (int j = 0; j < p; j++) {
            rr[j] -= f0[j];
            worst = Math.max(worst, Math.abs(rr[j]) / Math.max(1, Math.abs(f0[j])));
        }
        return Double.isNaN(worst) ? Double.POSITIVE_INFINITY : worst;
    }

    /**
     * Predicts at a target. c0 (length m) is a working array (overwritten); f0 the drift at the target;
     * c00 the covariance at lag 0. Writes centre + zᵀL⁻¹Y into out[off..off+k) and returns the
     * variance (rounding below zero reported as 0). If weights is non-null, writes λ into it. The
     * relative residual of the unbiasedness constraints goes to scratch.residual (after one step of
     * iterative refinement when it exceeds {@link #CONSTRAINT_TOLERANCE}); the caller checks it.
     */
    double predict(double[] c0, double[] f0, double c00, double[] centre, double[] out, int off, double[] weights,
            Scratch scratch) {
        Cholesky.forward(l, inverseDiagonal, m, m, c0, 0);
        double vv = 0;
        for (int r = 0; r < m; r++) {
            vv += c0[r] * c0[r];
        }
        double rmu = 0;
        if (p > 0) {
            double[] rr = scratch.r;
            double[] mu = scratch.mu;
            if (p == 1) {
                // ordinary kriging: the loops below with their one-column inner loops written out
                // (the same products and sums, up to the sign of a zero)
                double r0 = oneColumnResidual(c0, f0[0]);
                rr[0] = r0;
                double s = sInv[0] * r0;
                mu[0] = s;
                rmu += r0 * s;
                for (int r = 0; r < m; r++) {
                    c0[r] -= g[r] * s;
                }
            } else {
                java.util.Arrays.fill(rr, 0, p, 0.0);
                for (int r = 0; r < m; r++) {
                    double vr = c0[r];
                    for (int j = 0; j < p; j++) {
                        rr[j] += g[r * p + j] * vr;
                    }
                }
                for (int j = 0; j < p; j++) {
                    rr[j] -= f0[j];
                }
                for (int i = 0; i < p; i++) {
                    double s = 0;
                    for (int j = 0; j < p; j++) {
                        s += sInv[i * p + j] * rr[j];
                    }
                    mu[i] = s;
                    rmu += rr[i] * s;
                }
                for (int r = 0; r < m; r++) {
                    double s = 0;
                    for (int j = 0; j < p; j++) {
                        s += g[r * p + j] * mu[j];
                    }
                    c0[r] -= s;
                }
            }
            double res = constraintResidual(c0, f0, rr);
            if (res > CONSTRAINT_TOLERANCE) {
                // one step of iterative refinement: z −= G S⁻¹ (Gᵀz − f0)
                for (int i = 0; i < p; i++) {
                    double s = 0;
                    for (int j = 0; j < p; j++) {
                        s += sInv[i * p + j] * rr[j];
                    }
                    mu[i] = s;
                }
                for (int r = 0; r < m; r++) {
                    double s = 0;
                    for (int j = 0; j < p; j++) {
                        s += g[r * p + j] * mu[j];
                    }
                    c0[r] -= s;
                }
                res = constraintResidual(c0, f0, rr);
            }
            scratch.residual = res;
        } else {
            scratch.residual = 0;
        }
        for (int c = 0; c < k; c++) {
            out[off + c] = centre[c];
        }
        if (ly != null) {
            for (int r = 0; r < m; r++) {
                double z = c0[r];
                int o = r * k;
                for (int c = 0; c < k; c++) {
                    out[off + c] += z * ly[o + c];
                }
            }
            if (weights != null) {
                System.arraycopy(c0, 0, weights, 0, m);
                Cholesky.backward(l, m, m, weights, 0);
            }
        } else {
            // λ = L⁻ᵀz, then the prediction λᵀY (a 1 × m by m × K product)
            Cholesky.backwardByRows(l, inverseDiagonal, m, m, c0, 0);
            double[] t = scratch.row(k);
            Kernels.multiplyRows(c0, 0, 1, m, y, k, t, 0);
            for (int c = 0; c < k; c++) {
                out[off + c] += t[c];
            }
            if (weights != null) {
                System.arraycopy(c0, 0, weights, 0, m);
            }
        }
        double var = c00 - vv + rmu;
        return var > 0 ? var : 0;
    }
}
