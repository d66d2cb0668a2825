package io.densa.core.estimate;

import io.densa.core.estimate.EstimationSupport.SampleData;
import io.densa.core.internal.Cholesky;
import java.util.Arrays;

/**
 * Damped Newton maximisation of a penalised log-likelihood Φ(β) = ℓ(β) − λ β'Pβ − β'Qβ in raw
 * basis coefficients ({@link PenalizedObjective} defines ℓ, its gradient and its observed and
 * expected information), with its working arrays (one instance per thread; nothing is allocated
 * inside the iteration). Internal. The step solves (−ℓ'' + 2λP + 2Q) Δ = Φ'; when the observed
 * matrix is not positive definite the Fisher matrix is used (Fisher scoring). Steps are halved
 * until the Armijo condition Φ(β + tΔ) ≥ Φ(β) + 10⁻⁴ t Φ'·Δ holds. This class owns the
 * coefficients and the iteration, which runs as steps ({@link #begin}) that ask for an
 * evaluation or derivatives, answered by the objective here or, for units carried in vector
 * lanes, by {@link NewtonLanes}; the covariance is {@link NewtonCovariance}'s.
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

    /** See {@link #setStartMap}. */
    private double[] startMap, startConst;

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
        BinLayout.start(counts, startMap, startConst, k, logs, beta);
    }

    private double[] startLogs = new double[0]; // log(n_j + 1/2), scratch of startFromCounts

    /** The start map and its constant of {@link #setStartMap}, {map, constant} (nulls: the zero start). */
    double[][] startMap() {
        return new double[][] {startMap, startConst};
    }

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
        keepFactor();
        return ok;
    }

    /** After an iteration: keeps its last Newton factor and log determinant (NaN without one). */
    void keepFactor() {
        if (newtonFactored) {
            // keep the last Newton factor: the Fisher information and the covariance reuse hess
            for (int i = 0; i < k; i++) {
                System.arraycopy(hess, i * k1, newtonFactor, i * k, i + 1);
            }
            newtonLogDet = Cholesky.logDeterminant(newtonFactor, k, k);
        } else {
            newtonLogDet = Double.NaN;
        }
    }

    /** The relative pivot floor of the Newton factorisation ({@link Cholesky#factor}). */
    double pivotFloor() {
        return pivotFloor;
    }

    /** The objective (its arrays are where {@link NewtonLanes} puts a lane's passes). */
    PenalizedObjective objective() {
        return lik;
    }

    /** The K + 1 coefficients β (not a copy; not to be modified). */
    double[] betaView() {
        return beta;
    }

    private boolean iterate(double lambda, int maxIter, double tol, boolean exact) {
        int need = begin(lambda, maxIter, tol, exact);
        while (need != FINISHED) {
            if (need == EVALUATE) {
                need = evaluated(lik.evaluate(evaluationPoint, lambda));
            } else {
                lik.derivatives(lambda, need == DIFFERENTIATE_EXPECTED, true, beta);
                need = differentiated();
            }
        }
        return converged;
    }

    // ------------------------------------------------ the iteration as steps (driven here or by NewtonLanes)

    /** What the iteration asks for next: Φ at {@link #evaluationPoint}, Φ' and the observed or expected information at β, or nothing. */
    static final int EVALUATE = 0, DIFFERENTIATE = 1, DIFFERENTIATE_EXPECTED = 2, FINISHED = 3;
    /** Which evaluation or derivatives the iteration waits for. */
    private static final int START = 0, OBSERVED = 1, EXPECTED = 2, FULL_STEP = 3, ARMIJO = 4, RESTORE = 5;
    private int phase;
    private double[] evaluationPoint;
    private boolean converged, iterExact, iterResume;
    private int iterMax, lineSteps;
    private double iterLambda, iterTol, obj, dec, scale, size, t, lastDec, lastStep;

    /**
     * Starts Newton iterations from the current β at λ (see {@link #solve}); the caller then
     * answers each request with {@link #evaluated} or {@link #differentiated} until
     * {@link #FINISHED}, when {@link #converged()} and {@link #failure()} tell the outcome.
     */
    int begin(double lambda, int maxIter, double tol, boolean exact) {
        boolean resume = exact && resumable && lambda == resumeLambda;
        boolean evaluated = resumable;
        resumable = singular = converged = false;
        failure = null;
        iterations = 0;
        newtonFactored = iterResume = resume;
        iterExact = exact;
        iterLambda = lambda;
        iterMax = maxIter;
        iterTol = tol;
        lastDec = lastStep = Double.NaN;
        if (resume || evaluated) {
            return started(resume ? resumeObjective : lik.objectiveAtLastEvaluation(beta, lambda));
        }
        return evaluate(START, beta);
    }

    /** The coefficients the requested evaluation is at (β or the trial point; K + 1 values, not a copy). */
    double[] evaluationPoint() {
        return evaluationPoint;
    }

    /** Whether the iteration {@link #begin} started has converged (read after {@link #FINISHED}). */
    boolean converged() {
        return converged;
    }

    private int evaluate(int next, double[] at) {
        phase = next;
        evaluationPoint = at;
        return EVALUATE;
    }

    private int started(double o) {
        if (!(o > Double.NEGATIVE_INFINITY)) {
            failure = "the starting coefficients give probability 0 to an occupied bin";
            return FINISHED;
        }
        obj = o;
        return nextIteration();
    }

    private int nextIteration() {
        if (iterations >= iterMax) {
            failure = "no convergence in " + iterMax + " Newton iterations (last relative Newton decrement "
                    + lastDec + ", relative coordinate step " + lastStep + ")";
            return FINISHED;
        }
        iterations++;
        if (iterResume && iterations == 1) {
            dec = resumeDecrement; // hess and step as the search's last iteration left them at β
            return stepFound();
        }
        newtonFactored = false;
        phase = OBSERVED;
        return DIFFERENTIATE;
    }

    /** Takes the gradient and information at β (in grad and hess): the Newton step, or Fisher scoring when the observed information is not positive definite. */
    int differentiated() {
        if (Cholesky.factor(hess, k, k1, pivotFloor) >= 0) {
            if (phase == OBSERVED) {
                phase = EXPECTED;
                return DIFFERENTIATE_EXPECTED;
            }
            singular = true;
            failure = "penalised information matrix is singular at iteration " + iterations
                    + " (too few occupied bins for K = " + k + " without enough smoothing)";
            return FINISHED;
        }
        System.arraycopy(grad, 0, step, 0, k);
        Cholesky.solve(hess, k, k1, step, 0);
        return solved();
    }

    /**
     * As {@link #differentiated} when hess holds its successful factorisation and the Newton step
     * (the same bits as {@link Cholesky#solve}) is lane {@code lane} of x, {@code lanes} per entry;
     * relativeStep: ‖UΔ‖∞ / (1 + ‖Uβ‖∞) computed in the lanes (the same bits), or NaN.
     */
    int factoredWithStep(double[] x, int lane, int lanes, double relativeStep) {
        for (int i = 0; i < k; i++) {
            step[i] = x[i * lanes + lane];
        }
        givenStep = relativeStep;
        int next = solved();
        givenStep = Double.NaN;
        return next;
    }

    private double givenStep = Double.NaN; // the step's relative size from the lanes, during factoredWithStep

    /** The step is in {@link #step}: its decrement, then the line search or the end. */
    private int solved() {
        newtonFactored = true;
        double d = 0;
        for (int i = 0; i < k; i++) {
            d += grad[i] * step[i];
        }
        if (!(d >= 0) || !Double.isFinite(d)) {
            failure = "non-finite Newton step at iteration " + iterations;
            return FINISHED;
        }
        dec = d;
        return stepFound();
    }

    private int stepFound() {
        scale = 1 + Math.abs(obj);
        // the step size enters the exact stopping rule; a search fit needs it for messages only
        size = iterExact || iterations == iterMax ? relativeStep() : Double.NaN;
        lastDec = dec / scale;
        lastStep = size;
        if (!iterExact && dec <= iterTol * scale) {
            resumable = true;
            resumeLambda = iterLambda;
            resumeObjective = obj;
            resumeDecrement = dec;
            converged = true;
            return FINISHED;
        }
        t = 1.0;
        lineSteps = 0;
        if (dec <= RESOLUTION * scale) {
            for (int i = 0; i < k; i++) {
                trial[i] = beta[i] + step[i];
            }
            trial[k] = 0.0;
            return evaluate(FULL_STEP, trial);
        }
        return armijoTrial();
    }

    /** ‖UΔ‖∞ / (1 + ‖Uβ‖∞): the size of the Newton step relative to the coordinates. */
    private double relativeStep() {
        if (!Double.isNaN(givenStep)) {
            return givenStep;
        }
        return EstimationSupport.coordinateNorm(coordinateMap, step, k)
                / (1 + EstimationSupport.coordinateNorm(coordinateMap, beta, k));
    }

    private int armijoTrial() {
        if (lineSteps >= 60) {
            if (Double.isNaN(lastStep)) {
                lastStep = relativeStep();
            }
            return evaluate(RESTORE, beta);
        }
        for (int i = 0; i < k; i++) {
            trial[i] = beta[i] + t * step[i];
        }
        trial[k] = 0.0;
        return evaluate(ARMIJO, trial);
    }

    /** Takes Φ at {@link #evaluationPoint} (the objective evaluated there): the next request. */
    int evaluated(double o) {
        switch (phase) {
            case START:
                return started(o);
            case FULL_STEP:
                // Φ cannot resolve the predicted gain; accept unless it clearly decreased
                return o >= obj - RESOLUTION * scale ? accepted(o) : armijoTrial();
            case ARMIJO:
                if (o >= obj + 1e-4 * t * dec) {
                    return accepted(o);
                }
                t *= 0.5;
                lineSteps++;
                return armijoTrial();
            default: // RESTORE: the evaluation is back at β
                failure = "line search failed at iteration " + iterations + " (relative Newton decrement " + lastDec
                        + ", relative step " + lastStep + ")";
                return FINISHED;
        }
    }

    private int accepted(double o) {
        System.arraycopy(trial, 0, beta, 0, k1);
        obj = o;
        if (t == 1.0 && dec <= iterTol * scale && size <= Math.sqrt(iterTol)) {
            converged = true;
            return FINISHED;
        }
        return nextIteration();
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
