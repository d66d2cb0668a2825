package io.densa.core.estimate;

import io.densa.core.estimate.EstimationSupport.SampleData;
import io.densa.core.internal.Cholesky;
import java.util.Arrays;

/**
 * Damped Newton maximisation of a penalised log-likelihood in raw basis coefficients, with its
 * working arrays (one instance per thread; nothing is allocated inside the iteration). Internal.
 *
 * <p>With η(x) = φ(x)·β, A_j = ∫_{bin j} e^η dP and Z = Σ_j A_j (all by the layout's quadrature,
 * shifted by max η for log-sum-exp):
 * <ul>
 * <li>binned counts: ℓ(β) = Σ_j n_j log(A_j / Z) (the multinomial log-likelihood of the counts
 * given that an observation falls in the bins);</li>
 * <li>raw samples: ℓ(β) = Σ_i w_i η(x_i) − W log Z = t·β − W log Z with t = Σ_i w_i φ(x_i),
 * W = Σ_i w_i.</li>
 * </ul>
 * The objective is Φ(β) = ℓ(β) − λ β'Pβ − β'Qβ, Q the fixed reference prior (none when null).
 * Gradient ℓ' = t + Σ_q r_q φ_q with
 * r_q = w_q e^{η_q}(n_{j(q)}/A_{j(q)} − N/Z). Observed information (counts)
 * −ℓ'' = N(S/Z − m m') − Σ_j n_j (S_j/A_j − m_j m_j'), m and S the mean and second moment of φ
 * under the density, m_j, S_j within bin j; expected (Fisher) information
 * F = N (Σ_j π_j m_j m_j' − m m'). The step solves (−ℓ'' + 2λP + 2Q) Δ = Φ'; when the observed matrix
 * is not positive definite the Fisher matrix is used (Fisher scoring). Steps are halved until
 * the Armijo condition Φ(β + tΔ) ≥ Φ(β) + 10⁻⁴ t Φ'·Δ holds. The objective and its derivatives
 * are {@link PenalizedObjective}'s, the covariance {@link NewtonCovariance}'s; this class owns the
 * coefficients and the iteration.
 */
final class PenalizedNewton {
    private final PenalizedObjective lik;
    private final NewtonCovariance covariance;
    private final int k;
    private final int k1;
    private final double[] rawPenalty;
    // state
    private final double[] beta;
    private final double[] trial;
    private final double[] step;
    /** The objective's gradient and information matrix (stride k1). */
    private final double[] grad;
    private final double[] hess;
    private int iterations;
    private String failure;
    /** Whether the last solve stopped because the penalised information was numerically singular. */
    private boolean singular;
    /** Whether {@link #hess} holds the Cholesky factor of the current Newton iteration. */
    private boolean newtonFactored;
    /** The last Newton factor (lower triangle, K × K) and its log determinant, kept when a fit returns. */
    private final double[] newtonFactor;
    private double newtonLogDet = Double.NaN;
    /**
     * Set when {@link #solveForSearch} returned converged and nothing has touched the engine since:
     * the objective is evaluated at β, {@link #hess} holds the Newton factor at β and {@link #step}
     * the Newton step, both at {@link #resumeLambda}, with objective {@link #resumeObjective} and
     * decrement {@link #resumeDecrement}. The next fit then starts without evaluating β again (the
     * quadrature terms do not depend on λ; only the penalty is recomputed), and a {@link #solve} at
     * the same λ starts by taking that step instead of recomputing it: the same numbers, one
     * evaluation (and one derivative pass) fewer. Cleared by every method that changes β, the data,
     * the evaluation or the matrices.
     */
    private boolean resumable;
    /** The Newton factorisation's relative pivot floor: {@link #SINGULAR_PIVOT} without a prior, else 0. */
    private final double pivotFloor;
    private double resumeLambda;
    private double resumeObjective;
    private double resumeDecrement;

    PenalizedNewton(BinLayout lay, double[] rawPenalty) {
        this(lay, rawPenalty, null);
    }

    /** With a fixed quadratic prior term β'Qβ (raw K × K, already weighted; null for none). */
    PenalizedNewton(BinLayout lay, double[] rawPenalty, double[] prior) {
        this.lik = new PenalizedObjective(lay, rawPenalty, prior);
        this.pivotFloor = prior == null ? SINGULAR_PIVOT : 0.0;
        this.covariance = new NewtonCovariance(lik, lay.k, rawPenalty, prior);
        this.k = lay.k;
        this.k1 = k + 1;
        this.rawPenalty = rawPenalty;
        beta = new double[k1];
        trial = new double[k1];
        step = new double[k1];
        grad = lik.grad;
        hess = lik.hess;
        newtonFactor = new double[k * k];
    }

    /** Optional K × D map from log(n_j + 1/2) to starting coefficients, and its constant. */
    private double[] startMap;
    private double[] startConst;

    /**
     * Starting coefficients from the counts: a lightly penalised least-squares fit of the log
     * histogram heights log((n_j + 1/2)/(h_j p(x_j))) (zero start when no map is set).
     */
    void startFromCounts() {
        resumable = false;
        double[] counts = lik.counts();
        Arrays.fill(beta, 0.0);
        if (startMap == null || counts == null) {
            return;
        }
        int d = lik.bins().bins;
        double[] logs = startLogs.length == d ? startLogs : (startLogs = new double[d]);
        for (int j = 0; j < d; j++) {
            double n = counts[j];
            int c = (int) n;
            logs[j] = c == n && c >= 0 && c < LOG_HALF.length ? LOG_HALF[c] : Math.log(n + 0.5);
        }
        // four coefficients at a time, each summed in registers over the bins in order (the same
        // sums as bin by bin into β, without a store and reload per bin)
        int i = 0;
        for (; i + 3 < k; i += 4) {
            int o0 = i * d, o1 = o0 + d, o2 = o1 + d, o3 = o2 + d;
            double b0 = startConst[i], b1 = startConst[i + 1], b2 = startConst[i + 2], b3 = startConst[i + 3];
            for (int j = 0; j < d; j++) {
                double lj = logs[j];
                b0 += startMap[o0 + j] * lj;
                b1 += startMap[o1 + j] * lj;
                b2 += startMap[o2 + j] * lj;
                b3 += startMap[o3 + j] * lj;
            }
            beta[i] = b0;
            beta[i + 1] = b1;
            beta[i + 2] = b2;
            beta[i + 3] = b3;
        }
        for (; i < k; i++) {
            double b = startConst[i];
            for (int j = 0, o = i * d; j < d; j++) {
                b += startMap[o + j] * logs[j];
            }
            beta[i] = b;
        }
        beta[k] = 0.0;
    }

    /** log(n + 1/2) for the counts n = 0 … 4095 (the same values as computing them each time). */
    private static final double[] LOG_HALF = new double[4096];

    static {
        for (int n = 0; n < LOG_HALF.length; n++) {
            LOG_HALF[n] = Math.log(n + 0.5);
        }
    }

    /** log(n_j + 1/2) of the current unit (scratch of {@link #startFromCounts}). */
    private double[] startLogs = new double[0];

    /**
     * Relative size of a predicted gain Φ'·Δ below which Φ can no longer rank two points (sums of
     * many logarithms carry rounding errors of this order): the full Newton step is then taken
     * without the Armijo test, which would only compare rounding errors.
     */
    private static final double RESOLUTION = 1e-11;
    /**
     * A Newton factorisation fails (the information is called singular) when a pivot falls below
     * this fraction of its column's diagonal: the information then has a direction about 10¹⁴ times
     * weaker than its diagonal, along which a Newton step is rounding error (a few units of double
     * precision's 2.2·10⁻¹⁶ per entry, the usual numerical-rank threshold K·ε; Golub &amp; Van Loan
     * (2013), Matrix Computations, 4th ed., on numerical rank, from memory). Exact zeros, which only came from
     * exponentials underflowing far out along such a direction, are no longer needed to say so.
     * Applied without a reference prior only: with one, the information is positive definite by
     * construction, and a direction determined by the prior alone may be 10¹⁴ times weaker than
     * the data's (some 10¹⁵ events) without being singular.
     */
    private static final double SINGULAR_PIVOT = 1e-14;

    /** Optional K × K upper triangular map from raw coefficients to coordinates (c = U β). */
    private double[] coordinateMap;

    /** ‖U v‖∞ over the first K entries (‖v‖∞ without a map). */
    private double coordinateNorm(double[] v) {
        double m = 0;
        for (int i = 0; i < k; i++) {
            double s;
            if (coordinateMap == null) {
                s = v[i];
            } else {
                s = 0;
                int o = i * k;
                for (int j = i; j < k; j++) {
                    s += coordinateMap[o + j] * v[j];
                }
            }
            m = Math.max(m, Math.abs(s));
        }
        return m;
    }

    /**
     * Newton iterations from the current beta at smoothing λ. Every accepted step is taken; the
     * fit has converged after a full Newton step Δ (no halving) with Newton decrement
     * Φ'·Δ ≤ tol (1 + |Φ|) and coordinate step ‖UΔ‖∞ ≤ √tol (1 + ‖Uβ‖∞): the decrement is the
     * gradient in the metric of the penalised information, the step size guards the directions of
     * low curvature, and because the last step is taken, the remaining error is of the order of
     * its square (quadratic convergence of Newton's method; Nocedal &amp; Wright (2006), Numerical
     * Optimization, 2nd ed., Springer, Thm. 3.5; from memory).
     *
     * <p>On every return the objective's last evaluation is at the final β (its quadrature state,
     * log-likelihood and derivatives can be read without evaluating again).
     *
     * @return true on convergence; otherwise {@link #failure} says why
     */
    boolean solve(double lambda, int maxIter, double tol) {
        return solve(lambda, maxIter, tol, true);
    }

    /**
     * As {@link #solve(double, int, double)} for the fits of the smoothing-parameter search, whose
     * criterion only needs Φ to O(tol (1 + |Φ|)): returns as soon as the Newton decrement is below
     * tol (1 + |Φ|), without taking that last step (one evaluation fewer per fit; the final fit at
     * the chosen λ uses the exact rule).
     */
    boolean solveForSearch(double lambda, int maxIter, double tol) {
        return solve(lambda, maxIter, tol, false);
    }

    private boolean solve(double lambda, int maxIter, double tol, boolean exact) {
        boolean ok = iterate(lambda, maxIter, tol, exact);
        if (newtonFactored) {
            // keep the last Newton factor: the Fisher information and the covariance reuse hess
            for (int i = 0; i < k; i++) {
                System.arraycopy(hess, i * k1, newtonFactor, i * k, i + 1);
            }
            newtonLogDet = Cholesky.logDeterminant(newtonFactor, k, k);
        } else {
            newtonLogDet = Double.NaN;
        }
        return ok;
    }

    private boolean iterate(double lambda, int maxIter, double tol, boolean exact) {
        boolean resume = exact && resumable && lambda == resumeLambda;
        boolean evaluated = resumable;
        resumable = false;
        failure = null;
        singular = false;
        iterations = 0;
        newtonFactored = resume;
        double obj = resume ? resumeObjective : evaluated ? lik.objectiveAtLastEvaluation(beta, lambda)
                : lik.evaluate(beta, lambda);
        if (!(obj > Double.NEGATIVE_INFINITY)) {
            failure = "the starting coefficients give probability 0 to an occupied bin";
            return false;
        }
        double stepTol = Math.sqrt(tol);
        double lastDec = Double.NaN;
        double lastStep = Double.NaN;
        for (int it = 1; it <= maxIter; it++) {
            iterations = it;
            double dec;
            if (resume && it == 1) {
                dec = resumeDecrement; // hess and step as the search's last iteration left them at β
            } else {
                newtonFactored = false;
                lik.derivatives(lambda, false, true, beta);
                if (Cholesky.factor(hess, k, k1, pivotFloor) >= 0) {
                    lik.derivatives(lambda, true, true, beta);
                    if (Cholesky.factor(hess, k, k1, pivotFloor) >= 0) {
                        singular = true;
                        failure = "penalised information matrix is singular at iteration " + it
                                + " (too few occupied bins for K = " + k + " without enough smoothing)";
                        return false;
                    }
                }
                newtonFactored = true;
                System.arraycopy(grad, 0, step, 0, k);
                Cholesky.solve(hess, k, k1, step, 0);
                dec = 0;
                for (int i = 0; i < k; i++) {
                    dec += grad[i] * step[i];
                }
                if (!(dec >= 0) || !Double.isFinite(dec)) {
                    failure = "non-finite Newton step at iteration " + it;
                    return false;
                }
            }
            double scale = 1 + Math.abs(obj);
            // the step size enters the exact stopping rule; a search fit needs it for messages only
            double size = exact || it == maxIter ? coordinateNorm(step) / (1 + coordinateNorm(beta)) : Double.NaN;
            lastDec = dec / scale;
            lastStep = size;
            if (!exact && dec <= tol * scale) {
                resumable = true;
                resumeLambda = lambda;
                resumeObjective = obj;
                resumeDecrement = dec;
                return true;
            }
            double t = 1.0;
            boolean accepted = false;
            double o = obj;
            if (dec <= RESOLUTION * scale) {
                for (int i = 0; i < k; i++) {
                    trial[i] = beta[i] + step[i];
                }
                trial[k] = 0.0;
                o = lik.evaluate(trial, lambda);
                // Φ cannot resolve the predicted gain; accept unless it clearly decreased
                accepted = o >= obj - RESOLUTION * scale;
            }
            for (int ls = 0; ls < 60 && !accepted; ls++) {
                for (int i = 0; i < k; i++) {
                    trial[i] = beta[i] + t * step[i];
                }
                trial[k] = 0.0;
                o = lik.evaluate(trial, lambda);
                if (o >= obj + 1e-4 * t * dec) {
                    accepted = true;
                    break;
                }
                t *= 0.5;
            }
            if (!accepted) {
                if (Double.isNaN(lastStep)) {
                    lastStep = coordinateNorm(step) / (1 + coordinateNorm(beta));
                }
                lik.evaluate(beta, lambda);
                failure = "line search failed at iteration " + it + " (relative Newton decrement " + lastDec
                        + ", relative step " + lastStep + ")";
                return false;
            }
            System.arraycopy(trial, 0, beta, 0, k1);
            obj = o;
            if (t == 1.0 && dec <= tol * scale && size <= stepTol) {
                return true;
            }
        }
        failure = "no convergence in " + maxIter + " Newton iterations (last relative Newton decrement " + lastDec
                + ", relative coordinate step " + lastStep + ")";
        return false;
    }

    // ---------------------------------------------------------------- covariance (NewtonCovariance)

    /**
     * The unpenalised Fisher information F (K × K, row-major, into {@link #fisher}) at the last
     * evaluated point (beta): expected multinomial information for counts, (Σw²/W) times the
     * observed information for samples.
     */
    void fisherInformation() {
        resumable = false;
        lik.fisherInformation();
    }

    /** See {@link NewtonCovariance#sandwich(double, double[], double[])}. */
    double sandwich(double lambda, double[] u, double[] cov) {
        resumable = false;
        return covariance.sandwich(lambda, u, cov);
    }

    /** See {@link NewtonCovariance#sandwich(double, double[], double[], boolean)}. */
    double sandwich(double lambda, double[] u, double[] cov, boolean robust) {
        resumable = false;
        return covariance.sandwich(lambda, u, cov, robust);
    }

    /** See {@link NewtonCovariance#sandwich(double, double[], double[], boolean, double[])}. */
    double sandwich(double lambda, double[] u, double[] cov, boolean robust, double[] extra) {
        resumable = false;
        return covariance.sandwich(lambda, u, cov, robust, extra);
    }

    /**
     * log det H of the Newton matrix of the last iteration of {@link #solve} or
     * {@link #solveForSearch}: H = −∇²Φ, the observed information plus 2λP (and the reference
     * prior's 2Q), at the coefficients where that iteration started (the returned β for
     * {@link #solveForSearch}; for {@link #solve} the point before the final full step, which is
     * at most √tol relative in size); the expected information in place of the observed one where
     * the observed matrix was not positive definite (Fisher scoring). NaN if no iteration factored it.
     */
    double newtonLogDet() {
        return newtonLogDet;
    }

    /**
     * The path of the estimate in ρ = ln λ at the current β: dβ/dρ = −H⁻¹ 2λPβ, by implicit
     * differentiation of the penalised score equation ℓ'(β) − 2λPβ − 2Qβ = 0, with H the Newton
     * matrix of the last iteration ({@link #newtonLogDet}): the exact derivative when H is the
     * observed information at β. Into out (K + 1 values, out[K] = 0); NaN if no iteration factored H.
     */
    void smoothingTangent(double lambda, double[] out) {
        if (Double.isNaN(newtonLogDet)) {
            java.util.Arrays.fill(out, Double.NaN);
            return;
        }
        for (int i = 0; i < k; i++) {
            double r = 0;
            for (int j = 0; j < k; j++) {
                r += rawPenalty[i * k + j] * beta[j];
            }
            out[i] = -2 * lambda * r;
        }
        out[k] = 0.0;
        Cholesky.solve(newtonFactor, k, k, out, 0);
    }

    /** Sets β = from + t · direction (K + 1 values; β_K = 0). */
    void setCoefficientsAlong(double[] from, double t, double[] direction) {
        resumable = false;
        for (int i = 0; i < k; i++) {
            beta[i] = from[i] + t * direction[i];
        }
        beta[k] = 0.0;
    }

    /** Trace of the K × K Fisher information (after {@link #fisherInformation}). */
    double fisherTrace() {
        return lik.fisherTrace();
    }

    // ---------------------------------------------------------------- data (PenalizedObjective)

    // ---------------------------------------------------------------- state, owned here

    /** Counts mode: the unit's counts (not copied; not modified here) and total N, with Σw² = N and no sample. */
    void useCounts(double[] c, double n) {
        resumable = false;
        lik.useCounts(c, n);
    }

    /** Replaces the counts and the total only (the training part of a fold, or a unit of the smoothing spline). */
    void setCounts(double[] c, double n) {
        resumable = false;
        lik.setCounts(c, n);
    }

    /** Sample mode: the sample (its sufficient statistic copied) and the totals. */
    void useSample(SampleData s, double n, double n2) {
        resumable = false;
        lik.useSample(s, n, n2);
    }

    /** Replaces the sample statistic (K + 1 values, copied) and the totals (a fold's training part). */
    void setSampleStatistics(double[] lin, double n, double n2) {
        resumable = false;
        lik.setSampleStatistics(lin, n, n2);
    }

    /** Restores counts (may be null), totals and the sample statistic (copied) saved before a cross-validation. */
    void restoreData(double[] c, double n, double n2, double[] lin) {
        resumable = false;
        lik.restoreData(c, n, n2, lin);
    }

    /** A fresh copy of the sample statistic (K + 1 values). */
    double[] sampleStatistics() {
        return lik.sampleStatistics();
    }

    /** The current counts (null in sample mode); the array given to {@link #useCounts}, not to be modified. */
    double[] counts() {
        return lik.counts();
    }

    boolean hasCounts() {
        return lik.hasCounts();
    }

    /** Total weight N of the current data. */
    double total() {
        return lik.total();
    }

    /** Σw² of the current data (N for counts). */
    double total2() {
        return lik.total2();
    }

    /** The bin layout of the unit. */
    BinLayout bins() {
        return lik.bins();
    }

    // ---------------------------------------------------------------- coefficients and the last evaluation

    /** Map from raw coefficients to coordinates (c = U β), used by the convergence test; null for none. */
    void setCoordinateMap(double[] u) {
        resumable = false;
        coordinateMap = u;
    }

    /** Optional K × D map from log(n_j + 1/2) to starting coefficients and its constant (both null: zero start). */
    void setStartMap(double[] map, double[] constant) {
        resumable = false;
        startMap = map;
        startConst = constant;
    }

    /** Copies the K + 1 coefficients β into dst. */
    void copyCoefficientsTo(double[] dst) {
        System.arraycopy(beta, 0, dst, 0, k + 1);
    }

    /** A fresh copy of the K + 1 coefficients β. */
    double[] coefficients() {
        return beta.clone();
    }

    /** Sets the K + 1 coefficients β from src (the same values keep the last search fit resumable). */
    void setCoefficients(double[] src) {
        if (resumable && !Arrays.equals(src, 0, k + 1, beta, 0, k + 1)) {
            resumable = false;
        }
        System.arraycopy(src, 0, beta, 0, k + 1);
    }

    /** Sets β to K raw coefficients and β_K = 0. */
    void setRawCoefficients(double[] raw) {
        resumable = false;
        System.arraycopy(raw, 0, beta, 0, k);
        beta[k] = 0;
    }

    /** β = 0. */
    void clearCoefficients() {
        resumable = false;
        Arrays.fill(beta, 0.0);
    }

    /** Coordinates c = U β of the current coefficients into out[off..off+K). */
    void coordinatesInto(double[] u, double[] out, int off) {
        EstimationSupport.toCoordinates(u, k, beta, out, off);
    }

    /** Φ at the current β; see {@link PenalizedObjective#evaluate(double[], double)}. */
    double evaluate(double lambda) {
        resumable = false;
        return lik.evaluate(beta, lambda);
    }

    /** β'Pβ at the current β. */
    double penalty() {
        return lik.penalty(beta);
    }

    /** β'Qβ of the prior at the current β. */
    double priorPenalty() {
        return lik.priorPenalty(beta);
    }

    /** {@link PenalizedObjective#logLikelihoodPerBinShift(double[])} at the current β. */
    double logLikelihoodPerBinShift() {
        return lik.logLikelihoodPerBinShift(beta);
    }

    /** Z / e^shift of the last evaluation. */
    double zScaled() {
        return lik.zScaled();
    }

    /** Bin mass A_j / e^shift of the last evaluation. */
    double mass(int j) {
        return lik.mass(j);
    }

    /** The log-sum-exp shift of the last evaluation. */
    double shift() {
        return lik.shift();
    }

    /** Log-likelihood at the last evaluated point. */
    double logLikelihood() {
        return lik.logLikelihood();
    }

    /** Newton iterations of the last solve. */
    int iterations() {
        return iterations;
    }

    /** Why the last solve failed ("" or null when it converged). */
    String failure() {
        return failure;
    }

    /** Whether the last solve stopped because the penalised information was numerically singular. */
    boolean singularInformation() {
        return singular;
    }
}
