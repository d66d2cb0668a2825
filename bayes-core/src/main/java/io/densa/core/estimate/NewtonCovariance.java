package io.densa.core.estimate;

import io.densa.core.DensaException;
import io.densa.core.SolveDiagnostics;
import io.densa.core.internal.Cholesky;
import java.util.Arrays;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;

/**
 * The covariance step of {@link PenalizedNewton}: the Cholesky factor of the penalised
 * information J = F + 2λP + 2Q, edf = tr(J⁻¹F) and the sandwich covariance
 * U J⁻¹ M J⁻¹ U' of the coordinates, with its working arrays (one instance per engine). Internal.
 */
final class NewtonCovariance {
    private final PenalizedObjective obj;
    private final int k;
    private final double[] pen;
    private final double[] prior;
    private final double[] fisher;
    private final double[] solveA;
    private final double[] solveB;
    private final double[] scratch1;
    private final double[] scratch2;
    private final double[] meat;

    NewtonCovariance(PenalizedObjective obj, int k, double[] rawPenalty, double[] prior) {
        this.obj = obj;
        this.k = k;
        this.pen = rawPenalty;
        this.prior = prior;
        this.fisher = obj.fisher();
        solveA = new double[k * k];
        solveB = new double[k * k];
        scratch1 = new double[k * k];
        scratch2 = new double[k * k];
        meat = new double[k * k];
    }

    /**
     * After {@link PenalizedObjective#fisherInformation()}: factors J = F + 2λP = LL' and returns
     * edf = tr(J⁻¹F) = tr(W), W = L⁻¹ F L⁻ᵀ, or NaN if J is singular.
     * If cov != null, writes the sandwich covariance of the coordinates c = U β there:
     * U J⁻¹ M J⁻¹ U' = G W_M G' with the upper triangular G = U L⁻ᵀ (K × K) and W_M = L⁻¹ M L⁻ᵀ,
     * where the meat M is F, or, when {@code robust} is set, the empirical information
     * ({@link PenalizedObjective#empiricalInformation} for counts,
     * {@link PenalizedObjective#empiricalInformationSample} for a
     * sample whose arrays are set) times n/(n − edf), n = N for counts and the effective sample
     * size W²/Σw² for samples (falling back to F when n ≤ edf + 1).
     */
    double sandwich(double lambda, double[] u, double[] cov) {
        return sandwich(lambda, u, cov, false);
    }

    /** See {@link #sandwich(double, double[], double[])}. */
    double sandwich(double lambda, double[] u, double[] cov, boolean robust) {
        return sandwich(lambda, u, cov, robust, null);
    }

    /**
     * See {@link #sandwich(double, double[], double[])}; extra (raw K × K, or null) is a quadratic
     * term β'Eβ added to the prior in J = F + 2λP + 2Q + 2E (used to report a covariance where J is
     * singular without it).
     */
    double sandwich(double lambda, double[] u, double[] cov, boolean robust, double[] extra) {
        final int n = k;
        final double[] counts = obj.counts();
        final double total = obj.total(), total2 = obj.total2();
        if (!factorInformation(lambda, extra)) {
            return Double.NaN;
        }
        double[] linv = solveB;
        Cholesky.invertLower(solveA, n, linv);
        double[] wm = scratch2;
        // edf = tr(L⁻¹FL⁻ᵀ) needs only the diagonal; the rest of L⁻¹FL⁻ᵀ only when F is the meat
        whitenLeft(fisher, linv);
        double edf = whitenedTrace(linv);
        if (cov == null) {
            return edf;
        }
        double nEff = counts != null ? total : total * total / total2;
        if (robust && (counts != null || obj.hasSample()) && nEff > edf + 1) {
            if (counts != null) {
                obj.empiricalInformation(meat);
            } else {
                obj.empiricalInformationSample(meat);
            }
            double f = nEff / (nEff - edf);
            for (int i = 0; i < n * n; i++) {
                meat[i] *= f;
            }
            whiten(meat, linv, wm);
        } else {
            whitenRight(linv, wm);
        }
        double[] t1 = scratch1;
        // m = U L⁻ᵀ (upper): m_ij = Σ_{i ≤ p ≤ j} u_ip linv_jp ; stored in t1
        double[] m = t1;
        Arrays.fill(m, 0.0);
        for (int i = 0; i < n; i++) {
            int ri = i * n;
            for (int j = i; j < n; j++) {
                double s = 0;
                int rj = j * n;
                for (int p = i; p <= j; p++) {
                    s += u[ri + p] * linv[rj + p];
                }
                m[ri + j] = s;
            }
        }
        // t2 = m w (into linv, no longer needed), cov = t2 m'
        double[] t2 = linv;
        for (int i = 0; i < n; i++) {
            combineRows(m, i * n, i, n, wm, n, t2, i * n);
        }
        for (int i = 0; i < n; i++) {
            int ri = i * n;
            for (int j = 0; j <= i; j++) {
                double s = 0;
                int rj = j * n;
                for (int p = j; p < n; p++) {
                    s += t2[ri + p] * m[rj + p];
                }
                cov[ri + j] = s;
                cov[rj + i] = s;
            }
        }
        return edf;
    }

    /**
     * After {@link PenalizedObjective#fisherInformation()}: factors J = F + 2λP + 2Q (+ 2E) = LL'
     * into solveA; false when J is not positive definite.
     */
    private boolean factorInformation(double lambda, double[] extra) {
        // J = F + 2λP + 2Q + 2E (prior Q and extra E may be null; UnitLanes.fisherInformation the same)
        for (int i = 0; i < k * k; i++) {
            solveA[i] = fisher[i] + 2 * lambda * pen[i] + (prior == null ? 0.0 : 2 * prior[i])
                    + (extra == null ? 0.0 : 2 * extra[i]);
        }
        return Cholesky.factor(solveA, k, k, 0) < 0;
    }

    /**
     * out[o + j] = Σ_{p = from}^{to − 1} c[co + p] · a[p n + j] for j &lt; n, each sum taken over p in
     * ascending order from 0 (the sums of a row-by-row accumulation, bit for bit), eight columns
     * at a time in registers: a row of K ≈ 24 is too short for the JIT's vector loops, and
     * accumulating it in memory costs a load and a store per multiply-add.
     */
    private static void combineRows(double[] c, int co, int from, int to, double[] a, int n, double[] out, int o) {
        int j = 0;
        for (; j + 8 <= n; j += 8) {
            double s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, s5 = 0, s6 = 0, s7 = 0;
            for (int p = from; p < to; p++) {
                double cp = c[co + p];
                int r = p * n + j;
                s0 += cp * a[r];
                s1 += cp * a[r + 1];
                s2 += cp * a[r + 2];
                s3 += cp * a[r + 3];
                s4 += cp * a[r + 4];
                s5 += cp * a[r + 5];
                s6 += cp * a[r + 6];
                s7 += cp * a[r + 7];
            }
            out[o + j] = s0;
            out[o + j + 1] = s1;
            out[o + j + 2] = s2;
            out[o + j + 3] = s3;
            out[o + j + 4] = s4;
            out[o + j + 5] = s5;
            out[o + j + 6] = s6;
            out[o + j + 7] = s7;
        }
        for (; j < n; j++) {
            double s = 0;
            for (int p = from; p < to; p++) {
                s += c[co + p] * a[p * n + j];
            }
            out[o + j] = s;
        }
    }

    /** wm = L⁻¹ a L⁻ᵀ (symmetric, linv = L⁻¹ lower triangular). Uses scratch1. */
    private void whiten(double[] a, double[] linv, double[] wm) {
        whitenLeft(a, linv);
        whitenRight(linv, wm);
    }

    /** The first half of {@link #whiten}: scratch1 = L⁻¹a. */
    private void whitenLeft(double[] a, double[] linv) {
        final int n = k;
        for (int i = 0; i < n; i++) {
            combineRows(linv, i * n, 0, i + 1, a, n, scratch1, i * n);
        }
    }

    /**
     * tr(L⁻¹aL⁻ᵀ) = Σ_i Σ_{p ≤ i} (L⁻¹a)_ip (L⁻¹)_ip after {@link #whitenLeft}: the same sums in the
     * same order as the diagonal of {@link #whitenRight}, without the rest of the product.
     */
    private double whitenedTrace(double[] linv) {
        final int n = k;
        double[] t1 = scratch1;
        double tr = 0;
        for (int i = 0; i < n; i++) {
            double s = 0;
            int ri = i * n;
            for (int p = 0; p <= i; p++) {
                s += t1[ri + p] * linv[ri + p];
            }
            tr += s;
        }
        return tr;
    }

    /** The second half of {@link #whiten}: wm = (scratch1) L⁻ᵀ, symmetric. */
    private void whitenRight(double[] linv, double[] wm) {
        final int n = k;
        double[] t1 = scratch1;
        // w_ij = Σ_{p ≤ j} t1_ip linv_jp
        for (int i = 0; i < n; i++) {
            for (int j = 0; j <= i; j++) {
                double s = 0;
                int ri = i * n, rj = j * n;
                for (int p = 0; p <= j; p++) {
                    s += t1[ri + p] * linv[rj + p];
                }
                wm[ri + j] = s;
                wm[rj + i] = s;
            }
        }
    }

    /** Remaining diagonal (share of the trace) at which the pivoted factorisation stops. */
    static final double PIVOT_STOP = 1e-14;
    /** Largest Frobenius norm (share of the trace) of the remainder accepted as rounding. */
    static final double ROUNDING_REMAINDER = 1e-12;

    /**
     * Whether a symmetric matrix with a non-negative diagonal is positive semi-definite up to
     * rounding: Cholesky with complete (diagonal) pivoting, stopped once the largest remaining
     * diagonal entry is at most {@link #PIVOT_STOP} of the trace, writes A = R Rᵀ + S with S the
     * remaining Schur complement (Higham (2002), Accuracy and Stability of Numerical Algorithms,
     * 2nd ed., §10.3; from memory), so every eigenvalue of A is at least −‖S‖₂ ≥ −‖S‖_F (Weyl's
     * inequality, R Rᵀ being semidefinite; elementary). True when ‖S‖_F is at most
     * {@link #ROUNDING_REMAINDER} of the trace. The sparse units of the benchmark's 1,000 (one in
     * four fails the plain Cholesky test) had eigenvalues down to −6·10⁻¹⁶ of the largest. Does not
     * modify a.
     */
    static boolean semidefiniteToRounding(double[] a, int k) {
        double trace = 0;
        for (int i = 0; i < k; i++) {
            trace += a[i * k + i];
        }
        if (!(trace >= 0) || Double.isInfinite(trace)) {
            return false;
        }
        double[] w = a.clone();
        int j = 0;
        for (; j < k; j++) {
            int p = j;
            for (int i = j + 1; i < k; i++) {
                if (w[i * k + i] > w[p * k + p]) {
                    p = i;
                }
            }
            if (!(w[p * k + p] > PIVOT_STOP * trace)) {
                break;
            }
            if (p != j) { // symmetric permutation of rows and columns j and p
                for (int c = 0; c < k; c++) {
                    double t = w[j * k + c];
                    w[j * k + c] = w[p * k + c];
                    w[p * k + c] = t;
                }
                for (int r = 0; r < k; r++) {
                    double t = w[r * k + j];
                    w[r * k + j] = w[r * k + p];
                    w[r * k + p] = t;
                }
            }
            // column j of R, then the whole trailing block (both triangles: later swaps read either)
            double d = Math.sqrt(w[j * k + j]);
            for (int i = j + 1; i < k; i++) {
                w[i * k + j] /= d;
            }
            for (int i = j + 1; i < k; i++) {
                double lij = w[i * k + j];
                for (int c = j + 1; c < k; c++) {
                    w[i * k + c] -= lij * w[c * k + j];
                }
            }
        }
        double ss = 0;
        for (int i = j; i < k; i++) {
            for (int c = j; c < k; c++) {
                double v = w[i * k + c];
                ss += v * v;
            }
        }
        return Math.sqrt(ss) <= ROUNDING_REMAINDER * trace;
    }

    /**
     * Makes a symmetric covariance positive semi-definite in place when it is not: cov = V Λ V' is
     * replaced by V Λ₊ V' (negative eigenvalues set to 0), the nearest positive semi-definite matrix
     * in the Frobenius norm (Higham (1988), Computing a nearest symmetric positive semidefinite
     * matrix, Linear Algebra Appl. 103; from memory). Left untouched (bit for bit): a matrix
     * with a Cholesky factor (positive definite), one whose negative eigenvalues are shown to be at
     * rounding level ({@link #semidefiniteToRounding}), and one whose eigenvalues are all ≥ 0.
     * Sandwich covariances are positive semi-definite in exact arithmetic; when the data carry
     * little information in some direction (a sparse unit with fewer occupied bins than coordinates,
     * identical observations) rounding leaves eigenvalues of about −10⁻¹⁶ of the largest, and
     * exceptionally a diagonal entry slightly below 0 (always projected).
     *
     * @return true when the matrix was changed
     */
    static boolean projectPsd(double[] cov, int k) {
        boolean negDiag = false;
        for (int i = 0; i < k; i++) {
            negDiag |= cov[i * k + i] < 0;
        }
        if (!negDiag && (Cholesky.factor(cov.clone(), k, k, 0) < 0 || semidefiniteToRounding(cov, k))) {
            // positive definite, or semidefinite to rounding: nothing to change, and the
            // eigen-decomposition (about 60 times the work of a Cholesky factor) is not needed
            return false;
        }
        DMatrixRMaj m = new DMatrixRMaj(k, k, true, cov);
        org.ejml.interfaces.decomposition.EigenDecomposition_F64<DMatrixRMaj> eig =
                DecompositionFactory_DDRM.eig(k, true, true);
        if (!eig.decompose(m)) {
            if (negDiag) {
                throw new DensaException("covariance eigen-decomposition failed (" + k + " x " + k + ")",
                        new SolveDiagnostics("eigen-decomposition of a covariance", k, Double.NaN));
            }
            return false;
        }
        boolean neg = false;
        for (int i = 0; i < k; i++) {
            neg |= eig.getEigenvalue(i).getReal() < 0;
        }
        if (!neg && !negDiag) {
            return false;
        }
        double[] out = new double[k * k];
        for (int e = 0; e < k; e++) {
            double l = eig.getEigenvalue(e).getReal();
            DMatrixRMaj v = eig.getEigenVector(e);
            if (!(l > 0) || v == null) {
                continue;
            }
            for (int i = 0; i < k; i++) {
                double vi = l * v.data[i];
                for (int j = 0; j < k; j++) {
                    out[i * k + j] += vi * v.data[j];
                }
            }
        }
        for (int i = 0; i < k; i++) { // exact symmetry
            for (int j = 0; j < i; j++) {
                double a = 0.5 * (out[i * k + j] + out[j * k + i]);
                out[i * k + j] = a;
                out[j * k + i] = a;
            }
        }
        System.arraycopy(out, 0, cov, 0, k * k);
        return true;
    }
}
