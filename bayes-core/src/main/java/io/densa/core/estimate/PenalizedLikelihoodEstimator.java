package io.densa.core.estimate;

import io.densa.core.BayesSpace;
import io.densa.core.ProgressListener;
import io.densa.core.Reference;
import io.densa.core.internal.RoughnessPenalty;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;
import io.densa.core.estimate.DetectionLimits.CensoredCounts;

/**
 * Penalised maximum-likelihood estimation of densities from binned counts or raw samples,
 * directly in a {@link BayesSpace}; zero counts need no replacement. This is the estimator to use
 * for sparse counts (few events per unit).
 *
 * <h2>Model</h2>
 * A density f with coordinates c has clr(x) = Σ_k c_k e_k(x) and P-density e^{clr}/∫e^{clr}dP.
 * For counts n_1..n_D in bins [e_0, e_1), …, [e_{D−1}, e_D] (inside the domain; if they do not
 * cover it, the likelihood is the one given that an observation falls in [e_0, e_D]) the bin
 * probabilities are π_j(c) = ∫_{bin j} e^{clr} dP / Σ_i ∫_{bin i} e^{clr} dP, integrated by
 * Gauss–Legendre rules inside each bin, cut at the basis breakpoints and into pieces no wider
 * than (b − a)/64 (the nodes and the basis at them are computed once per set of edges and shared
 * by all units). The estimate maximises
 * <pre>
 *   Φ(c) = Σ_j n_j log π_j(c) − λ c'Ωc − (w / (2 P(I))) ‖c‖²,      c'Ωc = ∫_a^b (clr^{(l)}(x))² dx,
 * </pre>
 * the roughness penalty of derivative order l (default 2; computed exactly from the derivatives
 * of the B-splines or polynomials, a difference penalty of order l for step bases) and the
 * reference prior of weight w (default 1, see below; ‖c‖² = ‖f‖²_B = ∫ clr² dP). For a sample
 * x_1..x_n with weights w_i (default 1) the log-likelihood is Σ_i w_i log f_P(x_i). This is the
 * penalised likelihood density estimator of Silverman (1982), On the estimation of a probability
 * density function by the maximum penalized likelihood method, Ann. Statist. 10(3) (from memory),
 * written in Bayes-space coordinates.
 *
 * <h2>On a circle</h2>
 * On a {@link BayesSpace#isPeriodic() periodic} space the edges e_0 &lt; … &lt; e_D must span one period
 * (e_D − e_0 = P within a relative 1e-12) and may start anywhere, so a bin may wrap around the cut
 * point (start 0, period 365, edges 10, 20, …, 375: the last bin is [365, 375) ≡ [0, 10)); sample
 * values are taken modulo P; the penalty integrates over the whole circle (no boundary), so only
 * constant clr functions are unpenalised; detection limits are refused.
 *
 * <h2>Regions without events</h2>
 * Two settings decide what a unit's estimate does where it has no events; the package
 * documentation gives the reasoning and the measurements: the reference prior
 * ({@link #withReferencePrior}, weight 1) and the reading of empty bins at an end of the layout as
 * censored ({@link #withEmptyEnds}). {@code withReferencePrior(0).withEmptyEnds(EmptyEnds.COUNTED)}
 * is the plain penalised likelihood.
 *
 * <h2>Algorithm</h2>
 * Damped Newton on the K raw B-spline coefficients (local support: O(Q W²) per iteration for Q
 * quadrature nodes and W = spline order), with log-sum-exp normalisation, the observed
 * information when it is positive definite and Fisher scoring otherwise, and step halving
 * (Armijo). Every accepted step is taken; converged after a full Newton step Δ with Newton
 * decrement Φ'·Δ ≤ tol (1 + |Φ|) and coordinate step ‖Δc‖∞ ≤ √tol (1 + ‖c‖∞), so the remaining
 * error is of the order of the square of that step (tested against an independent maximiser to
 * 10⁻⁸). When the predicted gain is below what Φ can resolve (10⁻¹¹ (1 + |Φ|)) the full step is
 * taken without the Armijo test. The fits of the smoothing-parameter search, which only need the
 * criterion, stop on the decrement alone without that last step. A unit that does not
 * converge is returned with status {@link EstimationDiagnostics.Status#NOT_CONVERGED} and the
 * reason; nothing is returned silently. {@link #newtonCost} gives the flop count of an iteration.
 *
 * <h2>Smoothing parameter</h2>
 * Fixed ({@link #withSmoothing}) or chosen per unit by {@link SmoothingCriterion} (default
 * {@link SmoothingCriterion#MARGINAL_LIKELIHOOD}, the empirical-Bayes choice that reads the
 * penalty as a Gaussian prior on the coordinates; on sparse simulated counts (20–50 events over
 * 50 bins) it has a markedly smaller mean B2 error than AICc, and AIC and GCV undersmooth badly
 * there): the criterion is evaluated on a grid λ = N s 10^g,
 * g = hi, hi − step, …, lo (warm starts from strong to weak smoothing; N the total count and s a
 * scale making the penalty commensurate with the per-event Fisher information at the reference).
 * The scan stops once the criterion has risen at two consecutive grid points after its best
 * value, so the local minimum with the largest λ is taken (criteria for smoothing often have
 * several local minima and the smallest-λ ones undersmooth; common practice), and that grid
 * point is refined within one grid step by three steps of successive parabolic interpolation in
 * log λ through the neighbouring grid values (Brent (1973), Algorithms for Minimization without
 * Derivatives, ch. 5; from memory), or by golden-section search at the ends of the grid or where
 * the criterion is not convex; when the best grid point is the strongest smoothing of the grid and
 * a fit 0.01 decades inside is no better, that end is itself the local minimum with the largest λ
 * and is taken as it is. Refinement fits start on the tangent of the solution path β(log λ) at the
 * best fit (fits during the search use the tolerance max(tol, 10⁻⁹), the final fit tol). With very sparse
 * counts the criteria may decrease all the way down to the end of the grid (undersmoothing);
 * {@link #withSmoothingGrid} sets a floor.
 *
 * <h2>Covariance</h2>
 * Each unit's diagnostics carry the sandwich covariance of its coordinates, with the uncertainty
 * of a chosen λ added; the package documentation gives its form, its sources and how it was checked.
 *
 * <p>Immutable and thread-safe; arrays passed in are not modified. {@code fitAll} runs units in
 * parallel on the common pool (fixed blocks, each unit independent), bit-identical to the serial
 * path.
 */
public final class PenalizedLikelihoodEstimator implements CountEstimator {
    /** Task name of the progress reports of batch fits. */
    public static final String PROGRESS_TASK = "penalised likelihood";

    /**
     * Default weight of the reference prior, in observations: 1, the unit-information prior (see the
     * class documentation).
     */
    public static final double DEFAULT_PRIOR_WEIGHT = 1.0;

    private final BayesSpace space;
    /** Every setting but the space and the progress listener. */
    private final Settings settings;
    private final ProgressListener progress;
    /** The fitting machinery derived from these settings. */
    private final PenalizedFit fit;

    private PenalizedLikelihoodEstimator(BayesSpace space, Settings settings, ProgressListener progress) {
        this.space = space;
        this.settings = settings;
        this.progress = progress;
        this.fit = new PenalizedFit(space, settings, progress);
    }

    /** This estimator with other settings (checked by the caller). */
    private PenalizedLikelihoodEstimator with(Settings changed) {
        return new PenalizedLikelihoodEstimator(space, changed, progress);
    }

    /**
     * The estimator for a space with defaults: penalty on the second derivative (first for
     * linear splines or step bases with two bins), smoothing chosen by the restricted marginal
     * likelihood ({@link SmoothingCriterion#MARGINAL_LIKELIHOOD}) on the grid g = 3, 2, …, −6
     * (step 1), at most 100 Newton iterations, tolerance 10⁻¹², automatic Gauss–Legendre points per
     * piece, zero-total units rejected, whole-number counts required, parallel batches, the reference
     * prior of one observation, runs of empty bins at an end of dense units read as censored
     * ({@link EmptyEnds#CENSORED_IF_DENSE}).
     *
     * @param space the space the densities belong to
     */
    public static PenalizedLikelihoodEstimator withDefaults(BayesSpace space) {
        Objects.requireNonNull(space, "space");
        int order = Math.min(2, RoughnessPenalty.maxOrder(EstimationSupport.rawBasis(space.basis())));
        return new PenalizedLikelihoodEstimator(space, new Settings(order, Double.NaN,
                SmoothingCriterion.MARGINAL_LIKELIHOOD, 5, 1L, -6, 3, 1, 100, 1e-12, 0, ZeroTotalPolicy.REJECT, false,
                true, DEFAULT_PRIOR_WEIGHT, EmptyEnds.CENSORED_IF_DENSE), ProgressListener.NONE);
    }

    /**
     * Penalises the l-th derivative of the clr (or l-th differences for step bases).
     *
     * @param l 1 ≤ l &lt; spline order (≤ degree for polynomials, &lt; number of bins for steps)
     */
    public PenalizedLikelihoodEstimator withPenaltyOrder(int l) {
        return with(settings.change(c -> c.penaltyOrder = l));
    }

    /**
     * Uses a fixed smoothing parameter λ ≥ 0 for every unit (the configured criterion is still
     * evaluated and reported).
     */
    public PenalizedLikelihoodEstimator withSmoothing(double lambda) {
        if (!(lambda >= 0 && Double.isFinite(lambda))) {
            throw new IllegalArgumentException("smoothing parameter must be finite and >= 0, got " + lambda);
        }
        return with(settings.change(c -> c.smoothing = lambda));
    }

    /** Chooses λ per unit by the given criterion (undoes {@link #withSmoothing}). */
    public PenalizedLikelihoodEstimator withCriterion(SmoothingCriterion c) {
        Objects.requireNonNull(c, "criterion");
        return with(settings.change(d -> {
            d.smoothing = Double.NaN;
            d.criterion = c;
        }));
    }

    /**
     * Chooses λ per unit by k-fold cross-validation with the given seed (the fold assignment of
     * unit i uses a stream derived from the seed and i, so it does not depend on threads).
     *
     * @param k    number of folds, 2..50
     * @param seed random seed
     */
    public PenalizedLikelihoodEstimator withCrossValidation(int k, long seed) {
        if (!(k >= 2 && k <= 50)) {
            throw new IllegalArgumentException("number of folds must be in [2, 50], got " + k);
        }
        return with(settings.change(c -> {
            c.smoothing = Double.NaN;
            c.criterion = SmoothingCriterion.CROSS_VALIDATION;
            c.folds = k;
            c.seed = seed;
        }));
    }

    /**
     * The search grid for λ = N s 10^g: g from {@code log10Hi} down to {@code log10Lo} in steps of
     * {@code step}, then refinement within one step (see the class documentation).
     */
    public PenalizedLikelihoodEstimator withSmoothingGrid(double log10Lo, double log10Hi, double step) {
        if (!(Double.isFinite(log10Lo) && Double.isFinite(log10Hi) && log10Lo < log10Hi && step > 0
                && step <= log10Hi - log10Lo)) {
            throw new IllegalArgumentException("smoothing grid needs finite lo < hi and 0 < step <= hi - lo, got lo="
                    + log10Lo + ", hi=" + log10Hi + ", step=" + step);
        }
        return with(settings.change(c -> {
            c.gridLog10Lo = log10Lo;
            c.gridLog10Hi = log10Hi;
            c.gridStep = step;
        }));
    }

    /**
     * Weight w ≥ 0 of the reference prior, in observations: the objective subtracts
     * (w / (2 P(I))) ‖c‖²_B, a Gaussian prior centred at the reference density (the neutral element)
     * with the information of w observations drawn from it (default
     * {@value #DEFAULT_PRIOR_WEIGHT}, the unit-information prior; see the class documentation). 0
     * removes it and gives the plain penalised likelihood, whose estimate in regions without events
     * is then limited by the roughness penalty alone.
     *
     * @param observations finite weight ≥ 0
     */
    public PenalizedLikelihoodEstimator withReferencePrior(double observations) {
        if (!(observations >= 0) || Double.isInfinite(observations)) {
            throw new IllegalArgumentException("reference prior weight must be finite and >= 0 (in observations; 0"
                    + " removes the prior), got " + observations);
        }
        return with(settings.change(c -> c.referencePriorWeight = observations));
    }

    /** How binned counts with a run of empty bins at an end of the layout are read ({@link #withEmptyEnds}). */
    public enum EmptyEnds {
        /**
         * As {@link #CENSORED} for units with at least {@link DetectionLimits#DENSE_EVENTS_PER_BIN}
         * events per bin on average, as {@link #COUNTED} for sparser units (the default).
         */
        CENSORED_IF_DENSE,
        /** Such a run and the first occupied bin after it form one censored cell. */
        CENSORED,
        /** Every bin as recorded (the plain multinomial likelihood; the only reading before this setting). */
        COUNTED
    }

    /**
     * How runs of empty bins at an end of the layout are read. Counts alone cannot tell a density
     * that falls to nothing beyond a unit's outermost events from values beyond a limit recorded at
     * the limit (a detection limit, an instrument's range, a register that files everything above
     * an age in its last class): both give empty bins at the end, then an occupied bin, the second
     * with the clipped values piled into it. Where a unit has at least
     * {@link DetectionLimits#EMPTY_END_RUN} empty bins at an end and no declared limit there,
     * {@link EmptyEnds#CENSORED} makes those bins and the first occupied one one cell reaching the end
     * of the domain, whose count says only "this many values at or beyond the far edge of that bin"
     * (interval censoring, Turnbull (1976), J. R. Stat. Soc. B 38(3); exactly the reading of the
     * limits {@link DetectionLimits#emptyEnds}): clipped data are read correctly without their
     * limits, and the estimate beyond a unit's outermost events no longer rests on where in the edge
     * bin those few events fell; what is given up is that location, and for sparse units, whose empty
     * end bins are mostly sampling noise, calibration: the reported covariance over-states the
     * variance of an estimate whose cells follow the data (see
     * {@link DetectionLimits#DENSE_EVENTS_PER_BIN}). The default
     * {@link EmptyEnds#CENSORED_IF_DENSE} therefore censors only units with at least that many events
     * per bin. A circle ({@link BayesSpace#isPeriodic()}) has no ends. The package documentation gives
     * what each reading did on simulated networks.
     */
    public PenalizedLikelihoodEstimator withEmptyEnds(EmptyEnds reading) {
        Objects.requireNonNull(reading, "reading");
        return with(settings.change(c -> c.emptyEnds = reading));
    }

    /** How runs of empty bins at an end are read (see {@link #withEmptyEnds}). */
    public EmptyEnds emptyEnds() {
        return settings.emptyEnds();
    }

    /** The weight of the reference prior in observations (see {@link #withReferencePrior}). */
    public double referencePriorWeight() {
        return settings.referencePriorWeight();
    }

    /** Largest accepted {@link #withMaxIterations} value. */
    public static final int MAX_ITERATIONS_LIMIT = 10_000;
    /** Smallest accepted {@link #withTolerance} value (below it the criterion is under double rounding). */
    public static final double MIN_TOLERANCE = 1e-15;
    /** Largest accepted {@link #withTolerance} value. */
    public static final double MAX_TOLERANCE = 1e-3;

    /**
     * Maximum Newton iterations per fit, 1..{@value #MAX_ITERATIONS_LIMIT} (default 100; a fit that
     * converges takes a handful).
     */
    public PenalizedLikelihoodEstimator withMaxIterations(int n) {
        if (n < 1 || n > MAX_ITERATIONS_LIMIT) {
            throw new IllegalArgumentException("max iterations must be in [1, " + MAX_ITERATIONS_LIMIT + "], got " + n);
        }
        return with(settings.change(c -> c.maxIterations = n));
    }

    /**
     * Convergence tolerance τ (default 10⁻¹²): a fit has converged after a full Newton step with
     * Newton decrement ≤ τ (1 + |Φ|) and coordinate step ≤ √τ (1 + ‖c‖∞).
     *
     * @param tol in [{@value #MIN_TOLERANCE}, {@value #MAX_TOLERANCE}]
     */
    public PenalizedLikelihoodEstimator withTolerance(double tol) {
        if (!(tol >= MIN_TOLERANCE && tol <= MAX_TOLERANCE)) {
            throw new IllegalArgumentException("tolerance must be in [" + MIN_TOLERANCE + ", " + MAX_TOLERANCE
                    + "] (smaller values are below the rounding of the objective), got " + tol);
        }
        return with(settings.change(c -> c.tolerance = tol));
    }

    /**
     * Gauss–Legendre points per quadrature piece, 2..16, or 0 for automatic (the default: 3 on
     * pieces at most (b − a)/200 wide, 4 otherwise).
     */
    public PenalizedLikelihoodEstimator withQuadraturePoints(int m) {
        if (!(m == 0 || m >= 2 && m <= 16)) {
            throw new IllegalArgumentException("quadrature points must be 0 (automatic) or in [2, 16], got " + m);
        }
        return with(settings.change(c -> c.quadraturePoints = m));
    }

    /** What to do with units without events. */
    public PenalizedLikelihoodEstimator withZeroTotal(ZeroTotalPolicy policy) {
        Objects.requireNonNull(policy, "policy");
        return with(settings.change(c -> c.zeroTotal = policy));
    }

    /**
     * Whether {@code double} counts may be fractional (weighted counts). Cross-validation always
     * needs whole counts.
     */
    public PenalizedLikelihoodEstimator withFractionalCounts(boolean allow) {
        return with(settings.change(c -> c.fractionalCounts = allow));
    }

    /** Whether {@code fitAll} may use the common pool (results are identical either way). */
    public PenalizedLikelihoodEstimator withParallel(boolean p) {
        return with(settings.change(c -> c.parallel = p));
    }

    /**
     * Reports the units finished by {@code fitAll} and {@code fitAllSamples} (task
     * {@value #PROGRESS_TASK}, after each block of units; {@code done} is non-decreasing and reaches
     * the number of units). Calls may come from worker threads of the common pool, one at a time.
     * The default is {@link ProgressListener#NONE}; results do not depend on the listener.
     */
    public PenalizedLikelihoodEstimator withProgressListener(ProgressListener listener) {
        Objects.requireNonNull(listener, "listener");
        return new PenalizedLikelihoodEstimator(space, settings, listener);
    }

    /**
     * Every setting of this estimator except the space and the progress listener, as plain values
     * (what a saved model file stores; see {@link #withSettings}).
     *
     * @param penaltyOrder         derivative order l of the roughness penalty
     * @param smoothing            the fixed λ, or NaN when λ is chosen per unit
     * @param criterion            the criterion that chooses λ (evaluated and reported with a fixed λ too)
     * @param folds                folds of cross-validation
     * @param seed                 seed of cross-validation
     * @param gridLog10Lo          lower end of the λ search grid (log10 of the factor)
     * @param gridLog10Hi          upper end of the λ search grid
     * @param gridStep             step of the λ search grid
     * @param maxIterations        Newton iterations per fit
     * @param tolerance            convergence tolerance
     * @param quadraturePoints     Gauss–Legendre points per piece (0: automatic)
     * @param zeroTotal            what happens to units without events
     * @param fractionalCounts     whether fractional counts are accepted
     * @param parallel             whether batches use the common pool
     * @param referencePriorWeight weight of the reference prior in observations
     * @param emptyEnds            how runs of empty bins at an end are read
     */
    public record Settings(int penaltyOrder, double smoothing, SmoothingCriterion criterion, int folds, long seed,
            double gridLog10Lo, double gridLog10Hi, double gridStep, int maxIterations, double tolerance,
            int quadraturePoints, ZeroTotalPolicy zeroTotal, boolean fractionalCounts, boolean parallel,
            double referencePriorWeight, EmptyEnds emptyEnds) {
        /** A copy with the components that edit sets (the estimator's with… methods check the values first). */
        Settings change(java.util.function.Consumer<Draft> edit) {
            Draft d = new Draft(this);
            edit.accept(d);
            return d.settings();
        }

        /** A mutable copy of every component: the one place that lists them all for {@link #change}. */
        static final class Draft {
            int penaltyOrder, folds, maxIterations, quadraturePoints;
            long seed;
            double smoothing, gridLog10Lo, gridLog10Hi, gridStep, tolerance, referencePriorWeight;
            SmoothingCriterion criterion;
            ZeroTotalPolicy zeroTotal;
            boolean fractionalCounts, parallel;
            EmptyEnds emptyEnds;

            Draft(Settings s) {
                penaltyOrder = s.penaltyOrder;
                smoothing = s.smoothing;
                criterion = s.criterion;
                folds = s.folds;
                seed = s.seed;
                gridLog10Lo = s.gridLog10Lo;
                gridLog10Hi = s.gridLog10Hi;
                gridStep = s.gridStep;
                maxIterations = s.maxIterations;
                tolerance = s.tolerance;
                quadraturePoints = s.quadraturePoints;
                zeroTotal = s.zeroTotal;
                fractionalCounts = s.fractionalCounts;
                parallel = s.parallel;
                referencePriorWeight = s.referencePriorWeight;
                emptyEnds = s.emptyEnds;
            }

            Settings settings() {
                return new Settings(penaltyOrder, smoothing, criterion, folds, seed, gridLog10Lo, gridLog10Hi,
                        gridStep, maxIterations, tolerance, quadraturePoints, zeroTotal, fractionalCounts, parallel,
                        referencePriorWeight, emptyEnds);
            }
        }
    }

    /** The settings of this estimator (see {@link Settings}). */
    public Settings settings() {
        return settings;
    }

    /**
     * This estimator's space and progress listener with every other setting taken from
     * {@code s}, each checked as its {@code with…} method checks it (an estimator built this way
     * from {@link #settings()} fits exactly as the original).
     *
     * @throws IllegalArgumentException naming the first setting that its {@code with…} method refuses
     */
    public PenalizedLikelihoodEstimator withSettings(Settings s) {
        Objects.requireNonNull(s, "settings");
        Objects.requireNonNull(s.criterion(), "settings.criterion");
        Objects.requireNonNull(s.zeroTotal(), "settings.zeroTotal");
        Objects.requireNonNull(s.emptyEnds(), "settings.emptyEnds");
        if (!Double.isNaN(s.smoothing())) {
            withSmoothing(s.smoothing());
        }
        withCrossValidation(s.folds(), s.seed());
        withSmoothingGrid(s.gridLog10Lo(), s.gridLog10Hi(), s.gridStep());
        withMaxIterations(s.maxIterations());
        withTolerance(s.tolerance());
        withQuadraturePoints(s.quadraturePoints());
        withReferencePrior(s.referencePriorWeight());
        return new PenalizedLikelihoodEstimator(space, s, progress);
    }

    /** The space. */
    @Override
    public BayesSpace space() {
        return space;
    }

    /** The penalty matrix Ω in the space's coordinates (c'Ωc = roughness of the clr), K × K. */
    public DMatrixRMaj penalty() {
        return new DMatrixRMaj(space.dimension(), space.dimension(), true, fit.penaltyInCoordinates());
    }

    /** Cost of one Newton iteration for one unit with these bin edges ({@link NewtonCost#of}). */
    public NewtonCost newtonCost(double[] edges) {
        return NewtonCost.of(space, edges, settings.quadraturePoints());
    }

    // ---------------------------------------------------------------- binned counts

    /**
     * Fits many units sharing bin edges; runs of empty bins at an end as {@link #withEmptyEnds} says
     * (by default read as censored: such units are fitted as with
     * {@link #fitAll(double[], int[][], String[], DetectionLimits)} and the limits of
     * {@link DetectionLimits#emptyEnds}).
     *
     * @param counts n rows of D counts (not modified)
     * @param ids    n ids, or null
     * @return the densities (ids kept) and per-unit diagnostics, in input order
     * @throws IllegalArgumentException naming the unit id and bin of the first bad count
     */
    @Override
    public BatchEstimate fitAll(double[] edges, int[][] counts, String[] ids) {
        Objects.requireNonNull(counts, "counts");
        return readsEmptyEnds() ? CensoredCounts.emptyEnds(this, fit, edges, counts, ids) : fit.counts(edges, counts, ids);
    }

    /** Whether runs of empty bins at an end may be read as censored (the setting, on a space with ends). */
    boolean readsEmptyEnds() {
        return settings.emptyEnds() != EmptyEnds.COUNTED && !space.isPeriodic();
    }

    /** The fewest events with which a unit's empty end runs are read as censored over d bins (∞: never). */
    double emptyEndMinTotal(int d) {
        return !readsEmptyEnds() ? Double.POSITIVE_INFINITY
                : settings.emptyEnds() == EmptyEnds.CENSORED ? 0 : DetectionLimits.DENSE_EVENTS_PER_BIN * d;
    }

    /** The fitting machinery: {@code counts} reads every bin as recorded, whatever {@link #withEmptyEnds} says. */
    PenalizedFit penalizedFit() {
        return fit;
    }

    /**
     * Fits many units sharing bin edges, some of which recorded values beyond a detection limit at
     * the limit (left- or right-censored data, {@link DetectionLimits}). For such a unit the bins
     * from the domain's end up to the bin holding its limit form one cell that reaches the end of
     * the domain, and its likelihood uses the probability of that cell (interval censoring): the
     * values piled at the limit say "at most L", not "exactly here", and the empty bins below say
     * nothing. Units without a limit are fitted exactly as by
     * {@link #fitAll(double[], int[][], String[])}, in one batch; censored units are fitted in
     * batches of units that share their cells (the progress listener sees these batches
     * separately). Under {@link EmptyEnds#CENSORED} (the default) an end without a declared limit
     * is read as {@link #fitAll(double[], int[][], String[])} reads it.
     *
     * @param limits one entry per unit (NaN: no limit)
     * @throws IllegalArgumentException as {@link #fitAll(double[], int[][], String[])}, or for a
     *                                  limit outside the binned range or limits that leave no
     *                                  uncensored bin (naming the unit)
     */
    public BatchEstimate fitAll(double[] edges, int[][] counts, String[] ids, DetectionLimits limits) {
        Objects.requireNonNull(counts, "counts");
        Objects.requireNonNull(limits, "limits");
        if (readsEmptyEnds()) {
            fit.checkCounts(EstimationSupport.checkEdges(space, edges), counts, ids);
        }
        return CensoredCounts.fitAll(this, edges, counts, ids, limits);
    }

    /** Fits many units of counts given as doubles; see {@link #fitAll(double[], int[][], String[])}. */
    @Override
    public BatchEstimate fitAll(double[] edges, double[][] counts, String[] ids) {
        Objects.requireNonNull(counts, "counts");
        return readsEmptyEnds() ? CensoredCounts.emptyEnds(this, fit, edges, counts, ids) : fit.counts(edges, counts, ids);
    }

    // ---------------------------------------------------------------- raw samples

    /**
     * Fits one unweighted sample.
     *
     * @param values observations in [a, b], or any finite values on a periodic space (taken modulo the
     *               period) (not modified)
     * @throws IllegalArgumentException for values outside the domain or NaN (naming the index), or
     *                                  an empty sample under {@link ZeroTotalPolicy#REJECT}
     */
    public UnitEstimate fitSample(double[] values) {
        return fitAllSamples(new double[][] {Objects.requireNonNull(values, "values")}, null, null).unit(0);
    }

    /**
     * Fits one weighted sample: log-likelihood Σ_i w_i log f(x_i).
     *
     * @param weights finite weights ≥ 0, one per value, with a positive sum (not modified)
     */
    public UnitEstimate fitSample(double[] values, double[] weights) {
        Objects.requireNonNull(values, "values");
        Objects.requireNonNull(weights, "weights");
        return fitAllSamples(new double[][] {values}, new double[][] {weights}, null).unit(0);
    }

    /**
     * Fits many samples.
     *
     * @param values  n samples (not modified)
     * @param weights n weight arrays matching the samples, or null for unit weights
     * @param ids     n ids, or null
     */
    public BatchEstimate fitAllSamples(double[][] values, double[][] weights, String[] ids) {
        Objects.requireNonNull(values, "values");
        if (settings.criterion() == SmoothingCriterion.GCV) {
            throw new IllegalArgumentException("GCV needs binned counts; for raw samples use SmoothingCriterion.AIC"
                    + " or CROSS_VALIDATION");
        }
        return fit.samples(values, weights, ids);
    }

    /** The space and every setting, e.g. for a log or a JShell session. */
    @Override
    public String toString() {
        Settings s = settings;
        return "PenalizedLikelihoodEstimator[" + space + ", penalty order " + s.penaltyOrder()
                + (Double.isNaN(s.smoothing()) ? ", lambda by " + s.criterion() + " over log10 in [" + s.gridLog10Lo()
                        + ", " + s.gridLog10Hi() + "] step " + s.gridStep()
                        + (s.criterion() == SmoothingCriterion.CROSS_VALIDATION ? ", " + s.folds() + " folds, seed "
                                + s.seed() : "") : ", lambda " + s.smoothing())
                + ", prior weight " + s.referencePriorWeight() + ", at most " + s.maxIterations()
                + " iterations, tolerance " + s.tolerance() + ", "
                + (s.quadraturePoints() == 0 ? "automatic" : String.valueOf(s.quadraturePoints()))
                + " quadrature points, zero totals " + s.zeroTotal() + ", empty ends " + s.emptyEnds()
                + (s.fractionalCounts() ? ", fractional counts" : "")
                + (s.parallel() ? ", parallel" : "") + "]";
    }
}
