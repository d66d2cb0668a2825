package io.densa.core.estimate;

import io.densa.core.internal.Cholesky;
import io.densa.core.internal.GoldenSection;
import io.densa.core.internal.ScatteredCurvature;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.decomposition.eig.SymmetricQRAlgorithmDecomposition_DDRM;

/**
 * The smoothing-parameter search of {@link PenalizedLikelihoodEstimator}: the criteria (AIC, AICc,
 * GCV, marginal likelihood, cross-validation) at a fit, and the choice of λ per unit on the grid
 * λ = N s 10^g with its refinement. Immutable (the engine passed in holds the state); internal.
 */
final class SmoothingSearch {
    private static final int GOLDEN_STEPS = 7;
    /** Tolerance of the fits during the search (at least the configured one). */
    static final double SEARCH_TOLERANCE = 1e-9;
    /**
     * Rise of the criterion V = −2 log marginal likelihood above its best that bounds the plausible
     * range of λ (a likelihood ratio of e⁻³ ≈ 0.05).
     */
    static final double PLAUSIBLE_RISE = 6;

    private final SmoothingCriterion criterion;
    private final double gridLo;
    private final double gridHi;
    private final double gridStep;
    private final int maxIterations;
    private final double tolerance;
    private final int k;
    private final double[] u;
    private final double[] rawPenalty;
    private final double[] prior;
    private final int penaltyRank;
    /** log det(2Q) of the reference prior (with {@link #pencil}; unused without it). */
    private final double priorLogDet;
    /**
     * The eigenvalues μ_i ≥ 0 of L⁻¹(2P)L⁻ᵀ, 2Q = L Lᵀ, so that
     * log det(2λP + 2Q) = log det(2Q) + Σ_i log(1 + λ μ_i) at every λ without a factorisation;
     * null without a prior or when these could not be computed (then {@link #logDetPrior} factors).
     */
    private final double[] pencil;

    SmoothingSearch(PenalizedLikelihoodEstimator.Settings s, int k, double[] u, double[] rawPenalty, double[] prior,
            int penaltyRank) {
        this.criterion = s.criterion();
        this.gridLo = s.gridLog10Lo();
        this.gridHi = s.gridLog10Hi();
        this.gridStep = s.gridStep();
        this.maxIterations = s.maxIterations();
        this.tolerance = s.tolerance();
        this.k = k;
        this.u = u;
        this.rawPenalty = rawPenalty;
        this.prior = prior;
        this.penaltyRank = penaltyRank;
        double[] mu = null;
        double ld = Double.NaN;
        if (prior != null) {
            double[] l = new double[k * k];
            for (int i = 0; i < k * k; i++) {
                l[i] = 2 * prior[i];
            }
            if (Cholesky.factor(l, k, k, 0) < 0) {
                ld = Cholesky.logDeterminant(l, k, k);
                double[] linv = new double[k * k];
                Cholesky.invertLower(l, k, linv);
                double[] twoP = new double[k * k];
                for (int i = 0; i < k * k; i++) {
                    twoP[i] = 2 * rawPenalty[i];
                }
                SymmetricQRAlgorithmDecomposition_DDRM eig = new SymmetricQRAlgorithmDecomposition_DDRM(false);
                if (eig.decompose(new DMatrixRMaj(k, k, true, Cholesky.lowerCongruence(linv, twoP, k)))) {
                    mu = new double[k];
                    for (int i = 0; i < k; i++) {
                        mu[i] = Math.max(0.0, eig.getEigenvalue(i).getReal()); // P is PSD: −1e-17 is rounding
                    }
                }
            }
        }
        this.pencil = mu;
        this.priorLogDet = ld;
    }

    /**
     * The λ of one unit chosen by the criterion (see the estimator's class documentation): the grid
     * scan from strong to weak smoothing, stopped two rises after the best value, refined by
     * successive parabolic interpolation or by golden-section search. When the best grid value is
     * the strongest smoothing on the grid and the criterion still falls towards it (a fit
     * {@link #EDGE_STEP} decades inside gives a value at least as large), that end is the choice
     * without the golden-section search, which would end there too for a criterion monotone on the
     * last step; otherwise the search runs as before. Leaves the engine at the coefficients of the
     * best fit found; found[0] receives {@link #plausibleWidth} of the grid values the scan
     * computed (no further fits: scanning on until the criterion had risen by
     * {@link #PLAUSIBLE_RISE} changed the replicate study's ratios by at most 0.02 and cost 6 % more
     * time), found[1] the curvature of the criterion (per decade²) at the choice from the values the
     * search computed ({@link ScatteredCurvature#curvatureAt}); where they do not determine it, with
     * the marginal likelihood, from two more fits ({@link #CURVATURE_STEP}), else NaN.
     */
    double choose(PenalizedNewton eng, double scale, CrossValidationFolds cv, double[] found) {
        Steps st = new Steps(eng, scale, found);
        while (st.next()) {
            st.accept(criterionAt(eng, st.lambda(), cv));
        }
        return st.chosen();
    }

    /**
     * One unit's {@link #choose} as steps, so that several units' searches can share the lanes of
     * their fits ({@link NewtonLanes}): while {@link #next} asks for a fit (it has set the engine's
     * start), the criterion of the engine's fit at {@link #lambda} goes to {@link #accept}; then
     * {@link #chosen} is the choice, the engine holds its coefficients and found its two values.
     */
    final class Steps {
        private static final int SCAN = 0, PARABOLA = 1, EDGE = 2, GOLDEN = 3, CURVATURE = 4, DONE = 5;
        private final PenalizedNewton eng;
        private final double scale;
        private final double[] found;
        private final int steps;
        private final double[] scanG, scanC;
        private final double[] bestBeta;
        private final Path path;
        private final ScatteredCurvature evaluated;
        private int phase = SCAN, scanned, s, rising;
        private double bestG = gridHi, bestC = Double.POSITIVE_INFINITY, prev = Double.POSITIVE_INFINITY;
        private double cAbove = Double.POSITIVE_INFINITY, cBelow = Double.POSITIVE_INFINITY;
        /** The successive parabolic interpolation's points, their number, its passes and the best one's index. */
        private double[] gs, cs;
        private int m, pass, b;
        private GoldenSection.Steps golden;
        /** log10 λ of the fit asked for, and of the choice. */
        private double x, chosenG;
        /** The criterion at the choice and at {@link #CURVATURE_STEP} decades above it (its fits). */
        private double chosenC, upC;
        private int curvatureFits;

        /** found: receives the plausible width and the curvature (see {@link #choose}). */
        Steps(PenalizedNewton eng, double scale, double[] found) {
            this.eng = eng;
            this.scale = scale;
            this.found = found;
            steps = (int) Math.floor((gridHi - gridLo) / gridStep + 1e-9);
            scanG = new double[steps + 1];
            scanC = new double[steps + 1];
            bestBeta = new double[k + 1];
            path = new Path(k, criterion != SmoothingCriterion.CROSS_VALIDATION);
            evaluated = new ScatteredCurvature(steps + 1 + 4 + GOLDEN_STEPS + 2);
            found[1] = Double.NaN;
        }

        /** The λ of the fit asked for. */
        double lambda() {
            return lambdaAt(eng.total(), scale, x);
        }

        /** The chosen λ (once {@link #next} has returned false). */
        double chosen() {
            return lambdaAt(eng.total(), scale, chosenG);
        }

        /** Whether a fit is wanted (at {@link #lambda}, from the start set in the engine); false: done. */
        boolean next() {
            switch (phase) {
                case SCAN:
                    // the grid scan from strong to weak smoothing, stopped two rises after the best
                    if (s <= steps && rising < 2) {
                        x = gridHi - s * gridStep;
                        return true;
                    }
                    endScan();
                    return next();
                case PARABOLA:
                    return parabola();
                case EDGE:
                    x = bestG - EDGE_STEP;
                    path.startNearBest(eng, bestBeta, bestG, x);
                    return true;
                case GOLDEN:
                    if (!golden.done()) {
                        x = golden.point();
                        path.startNearBest(eng, bestBeta, bestG, x);
                        return true;
                    }
                    choice(golden.result());
                    return next();
                case CURVATURE:
                    if (curvatureFits < 2) {
                        x = chosenG + (curvatureFits == 0 ? CURVATURE_STEP : -CURVATURE_STEP);
                        path.startNearBest(eng, bestBeta, bestG, x);
                        return true;
                    }
                    done();
                    return false;
                default:
                    return false;
            }
        }

        /** The criterion at the fit {@link #next} asked for. */
        void accept(double c) {
            if (phase != CURVATURE) {
                evaluated.add(x, c);
            }
            switch (phase) {
                case SCAN:
                    scanG[scanned] = x;
                    scanC[scanned++] = c;
                    if (c < bestC) {
                        bestC = c;
                        bestG = x;
                        rising = 0;
                        cAbove = s > 0 ? prev : Double.POSITIVE_INFINITY;
                        cBelow = Double.POSITIVE_INFINITY;
                        keepBest();
                    } else if (bestC < Double.POSITIVE_INFINITY) {
                        if (rising == 0) {
                            cBelow = c;
                        }
                        rising++;
                        // a first rise that is already implausible (V at least PLAUSIBLE_RISE above the best)
                        // ends the scan: the second would not add to the plausible range
                        if (rising == 1 && c - bestC >= PLAUSIBLE_RISE) {
                            rising = 2;
                        }
                    }
                    prev = c;
                    s++;
                    break;
                case PARABOLA:
                    if (m == 3) {
                        gs[3] = x;
                        cs[3] = c;
                        m = 4;
                    } else {
                        // drop the point farthest from the best
                        int far = 0;
                        for (int i = 1; i < 4; i++) {
                            if (Math.abs(gs[i] - gs[b]) > Math.abs(gs[far] - gs[b])) {
                                far = i;
                            }
                        }
                        gs[far] = x;
                        cs[far] = c;
                    }
                    if (c < bestC) {
                        bestC = c;
                        bestG = x;
                        keepBest();
                    }
                    pass++;
                    break;
                case EDGE:
                    if (c >= bestC) {
                        choice(bestG);
                    } else {
                        startGolden();
                    }
                    break;
                case GOLDEN:
                    golden.accept(c);
                    break;
                case CURVATURE:
                    if (curvatureFits++ == 0) {
                        upC = c;
                    } else { // the central difference (NaN or ±∞ where a fit failed)
                        found[1] = (upC - 2 * chosenC + c) / (CURVATURE_STEP * CURVATURE_STEP);
                    }
                    break;
                default:
                    throw new IllegalStateException("the search is done");
            }
        }

        private void keepBest() {
            eng.copyCoefficientsTo(bestBeta);
            path.keepBest(eng, lambda());
        }

        /**
         * After the scan: successive parabolic interpolation where the best grid value is bracketed
         * by larger ones; else the strongest smoothing if the criterion still falls towards it (a
         * fit {@link #EDGE_STEP} decades inside is no better), else golden-section search.
         */
        private void endScan() {
            found[0] = plausibleWidth(scanG, scanC, scanned, gridStep);
            double denom = cAbove - 2 * bestC + cBelow;
            if (Double.isFinite(denom) && denom > 0) {
                gs = new double[] {bestG - gridStep, bestG, bestG + gridStep, 0};
                cs = new double[] {cBelow, bestC, cAbove, 0};
                m = 3;
                phase = PARABOLA;
            } else if (bestG >= gridHi && bestC < Double.POSITIVE_INFINITY) {
                phase = EDGE;
            } else {
                startGolden();
            }
        }

        /** Golden-section refinement of log10 λ on [bestG − step, bestG + step] (grid ends or flat spots). */
        private void startGolden() {
            double lo = Math.max(gridLo, bestG - gridStep), hi = Math.min(gridHi, bestG + gridStep);
            golden = new GoldenSection.Steps(lo, hi, GOLDEN_STEPS, bestG, bestC);
            phase = GOLDEN;
        }

        /**
         * The next of three steps of successive parabolic interpolation in g = log10(λ) (Brent 1973,
         * Algorithms for Minimization without Derivatives, ch. 5; from memory), or the end.
         */
        private boolean parabola() {
            if (pass < 3) {
                b = 0;
                for (int i = 1; i < m; i++) {
                    if (cs[i] < cs[b]) {
                        b = i;
                    }
                }
                // neighbours of the best point in g order
                int left = -1, right = -1;
                for (int i = 0; i < m; i++) {
                    if (gs[i] < gs[b] && (left < 0 || gs[i] > gs[left])) {
                        left = i;
                    }
                    if (gs[i] > gs[b] && (right < 0 || gs[i] < gs[right])) {
                        right = i;
                    }
                }
                if (left >= 0 && right >= 0) {
                    double x0 = gs[left], x1 = gs[b], x2 = gs[right];
                    double f0 = cs[left], f1 = cs[b], f2 = cs[right];
                    double num = (x1 - x0) * (x1 - x0) * (f1 - f2) - (x1 - x2) * (x1 - x2) * (f1 - f0);
                    double den = (x1 - x0) * (f1 - f2) - (x1 - x2) * (f1 - f0);
                    if (den != 0 && Double.isFinite(num / den)) {
                        double xn = Math.max(x0, Math.min(x2, x1 - 0.5 * num / den));
                        if (Math.abs(xn - x1) >= 1e-3 * gridStep) {
                            x = xn;
                            path.startNearBest(eng, bestBeta, bestG, x);
                            return true;
                        }
                    }
                }
            }
            choice(bestG);
            return next();
        }

        /**
         * The search has chosen log10 λ = g: its curvature there from the values it computed, else
         * (marginal likelihood: the λ-uncertainty term reads it) from two more fits, ±
         * {@link #CURVATURE_STEP} decades from the choice, which start from the best fit's tangent
         * prediction as the refinement's do and take the criterion at the choice from the search;
         * then done.
         */
        private void choice(double g) {
            chosenG = g;
            found[1] = evaluated.curvatureAt(g);
            chosenC = evaluated.valueAt(g);
            if (Double.isNaN(found[1]) && criterion == SmoothingCriterion.MARGINAL_LIKELIHOOD
                    && Double.isFinite(chosenC)) {
                phase = CURVATURE;
            } else {
                done();
            }
        }

        /** The engine back at the best fit's coefficients (where the final fit starts). */
        private void done() {
            eng.setCoefficients(bestBeta);
            phase = DONE;
        }
    }

    /**
     * Half-width (decades of λ) of the central difference of the criterion where the search's own
     * values do not determine its curvature at the choice ({@link Steps}): wide enough that the
     * criterion's error at the search tolerance (about 10⁻⁹ of the penalised log-likelihood) stays
     * far below the second difference.
     */
    static final double CURVATURE_STEP = 0.25;

    /**
     * Width (decades) of the plausible range of log10 λ: from the smallest to the largest scanned
     * grid point whose criterion V = −2 log marginal likelihood is within {@link #PLAUSIBLE_RISE} of
     * the best, plus one grid step (each point standing for a cell one step wide); NaN when no
     * value is finite. The scan stops two rises after the best, so the range may end there.
     */
    static double plausibleWidth(double[] g, double[] c, int n, double step) {
        double best = Double.POSITIVE_INFINITY;
        for (int i = 0; i < n; i++) {
            best = Math.min(best, c[i]);
        }
        if (!Double.isFinite(best)) {
            return Double.NaN;
        }
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < n; i++) {
            if (c[i] - best < PLAUSIBLE_RISE) {
                lo = Math.min(lo, g[i]);
                hi = Math.max(hi, g[i]);
            }
        }
        return hi - lo + step;
    }

    /**
     * How far inside the strongest smoothing of the grid (decades) the criterion is checked before
     * that end is taken: below the golden-section search's resolution on one grid step
     * (0.618⁹ ≈ 0.013 decades for 7 steps) and well above the criterion's error at the search
     * tolerance.
     */
    static final double EDGE_STEP = 0.01;

    static double lambdaAt(double total, double scale, double g) {
        return total * scale * Math.pow(10.0, g);
    }

    /**
     * log det(2λP + 2Q) (raw coordinates), or NaN if not positive definite: from the eigenvalues of
     * the pencil (computed once per estimator), else by a Cholesky factorisation at this λ.
     */
    double logDetPrior(double lambda) {
        if (pencil != null) {
            double s = priorLogDet;
            for (double mu : pencil) {
                s += Math.log1p(lambda * mu);
            }
            return s;
        }
        double[] m = new double[k * k];
        for (int i = 0; i < k * k; i++) {
            m[i] = 2 * lambda * rawPenalty[i] + 2 * prior[i];
        }
        if (Cholesky.factor(m, k, k, 0) >= 0) {
            return Double.NaN;
        }
        return Cholesky.logDeterminant(m, k, k);
    }

    /**
     * Where the refinement starts each fit: at the best fit so far continued linearly along its
     * tangent dβ/dρ, ρ = ln λ ({@link PenalizedNewton#smoothingTangent}), the first-order predictor
     * of continuation methods (Allgower &amp; Georg (1990), Numerical Continuation Methods,
     * Springer, ch. 2; from memory), instead of at the best fit itself. Only where the iteration
     * starts changes; every fit still runs to the search tolerance. (The grid scan's steps of a
     * decade are too long for a linear predictor to pay: measured, 1.5 % fewer Newton iterations there.)
     * Per call of {@link #choose}.
     */
    private static final class Path {
        final double[] bestTangent;
        /**
         * Whether the criterion leaves the full-data fit's Newton factor in the engine (all but
         * cross-validation, whose last fits are on folds).
         */
        final boolean factored;
        boolean bestKnown;

        Path(int k, boolean factored) {
            bestTangent = new double[k + 1];
            this.factored = factored;
        }

        /**
         * The fit just evaluated (at λ, its Newton factor still in the engine) is the best so
         * far: keeps its tangent.
         */
        void keepBest(PenalizedNewton eng, double lambda) {
            bestKnown = factored;
            if (factored) {
                eng.smoothingTangent(lambda, bestTangent);
                for (double v : bestTangent) {
                    bestKnown &= Double.isFinite(v);
                }
            }
        }

        /** Starts the engine at the prediction for log10 λ = g from the best fit (at bestG). */
        void startNearBest(PenalizedNewton eng, double[] bestBeta, double bestG, double g) {
            if (bestKnown) {
                eng.setCoefficientsAlong(bestBeta, (g - bestG) * LN10, bestTangent);
            } else {
                eng.setCoefficients(bestBeta);
            }
        }
    }

    private static final double LN10 = Math.log(10);

    /** Fits at λ from the current beta and returns the criterion (+∞ on failure). */
    double criterionAt(PenalizedNewton eng, double lambda, CrossValidationFolds cv) {
        return criterionAfter(eng, lambda, cv, eng.solveForSearch(lambda, maxIterations, searchTolerance()));
    }

    /**
     * Whether {@link #criterionAfter} reads the objective's quadrature state (exponentials and bin
     * masses) beyond Φ's parts: the criteria with an edf do (its Fisher information); the marginal
     * likelihood reads the log-likelihood and the Newton factor only.
     */
    boolean criterionReadsEvaluation() {
        return criterion != SmoothingCriterion.MARGINAL_LIKELIHOOD;
    }

    /** The tolerance of the search's fits: the configured one, at least {@link #SEARCH_TOLERANCE}. */
    double searchTolerance() {
        return Math.max(tolerance, SEARCH_TOLERANCE);
    }

    /**
     * The criterion after the engine's search fit at λ (+∞ unless converged): what
     * {@link #criterionAt} returns after its fit.
     */
    double criterionAfter(PenalizedNewton eng, double lambda, CrossValidationFolds cv, boolean converged) {
        if (!converged) {
            return Double.POSITIVE_INFINITY;
        }
        double loglik = eng.logLikelihood();
        double edf = Double.NaN;
        // the marginal likelihood needs log det H only, from the factor the last Newton iteration left
        if (criterion != SmoothingCriterion.MARGINAL_LIKELIHOOD && criterion != SmoothingCriterion.CROSS_VALIDATION) {
            eng.fisherInformation();
            edf = eng.sandwich(lambda, u, null, false, null);
            if (Double.isNaN(edf)) {
                return Double.POSITIVE_INFINITY;
            }
        }
        double c = criterionValue(eng, lambda, edf, loglik, cv);
        return Double.isNaN(c) ? Double.POSITIVE_INFINITY : c;
    }

    /** The criterion at the fitted beta (eng arrays must hold beta's evaluation for GCV). */
    double criterionValue(PenalizedNewton eng, double lambda, double edf, double loglik, CrossValidationFolds cv) {
        switch (criterion) {
            case AIC:
                return -2 * loglik + 2 * edf;
            case MARGINAL_LIKELIHOOD: {
                double ld = eng.newtonLogDet();
                if (Double.isNaN(ld)) {
                    return Double.POSITIVE_INFINITY;
                }
                if (prior != null) {
                    // proper prior: defined at every λ ≥ 0
                    double lp = logDetPrior(lambda);
                    return Double.isNaN(lp) ? Double.POSITIVE_INFINITY : -2 * loglik + 2 * lambda * eng.penalty()
                            + 2 * eng.objective().priorPenalty(eng.betaView()) + ld - lp;
                }
                if (!(lambda > 0)) {
                    return Double.POSITIVE_INFINITY; // improper prior without normalising constant at λ = 0
                }
                return -2 * loglik + 2 * lambda * eng.penalty() + ld - penaltyRank * Math.log(2 * lambda);
            }
            case AICC: {
                double nEff = eng.total();
                return nEff > edf + 1 ? -2 * loglik + 2 * edf * nEff / (nEff - edf - 1) : Double.POSITIVE_INFINITY;
            }
            case GCV: {
                if (!eng.hasCounts()) {
                    throw new IllegalArgumentException("GCV needs binned counts; for raw samples use"
                            + " SmoothingCriterion.AIC or CROSS_VALIDATION");
                }
                eng.evaluate(lambda);
                int d = eng.bins().bins;
                double dev = 0;
                double z = eng.objective().zScaled();
                for (int j = 0; j < d; j++) {
                    double nj = eng.counts()[j];
                    if (nj > 0) {
                        dev += nj * Math.log(nj / (eng.total() * eng.objective().mass(j) / z));
                    }
                }
                dev = Math.max(0.0, 2 * dev); // ≥ 0 by Gibbs' inequality; rounding can give −1e-15
                double den = d - edf;
                return den > 0 ? d * dev / (den * den) : Double.POSITIVE_INFINITY;
            }
            default:
                return cv.score(lambda);
        }
    }

    /** Why the criterion cannot be evaluated at a converged fit (it is undefined there). */
    String undefinedCriterion(PenalizedNewton eng, double lambda, double edf) {
        switch (criterion) {
            case MARGINAL_LIKELIHOOD:
                if (prior == null && !(lambda > 0)) {
                    return "the marginal likelihood is undefined at lambda = 0 without the reference prior (its"
                            + " improper prior has no normalising constant)";
                }
                break;
            case AICC:
                return "AICc is undefined with N = " + eng.total() + " <= edf + 1 = " + (edf + 1)
                        + " at lambda = " + lambda + " (it needs more than edf + 1 events)";
            case GCV:
                return "GCV is undefined with edf = " + edf + " >= number of bins " + eng.bins().bins
                        + " at lambda = " + lambda;
            default:
                break;
        }
        return criterion + " could not be evaluated at lambda = " + lambda;
    }
}
