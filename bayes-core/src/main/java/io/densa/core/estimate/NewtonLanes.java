package io.densa.core.estimate;

import io.densa.core.internal.UnitLanes;
import java.util.function.Supplier;

/**
 * Fits of units of counts on one cubic-spline layout, at a fixed λ or at the λ each unit's {@link
 * SmoothingSearch} chooses, {@link UnitLanes#lanes()} units at a time: each lane has its own {@link
 * PenalizedNewton} (coefficients, iteration, Cholesky factor, and afterwards the covariance), while
 * the quadrature passes, the evaluation and the node pass of the observed information, run for all
 * lanes together, one unit per lane of a SIMD vector, and so do the penalised Newton matrices,
 * their factorisation and the solve. The passes give each lane the bits the one-unit passes give,
 * and each engine answers the same requests in the same order as its own {@link
 * PenalizedNewton#solve}, so a unit's fit is the same to the bit as alone, whichever units share
 * the lanes. A lane whose unit has finished takes the next unit at once (with a fresh engine); the
 * finished engines wait until as many as there are lanes have finished, and their Fisher
 * information and robust sandwich covariances are computed together, one unit per lane again
 * ({@link UnitLanes#expectedInformation}, {@link UnitLanes#covarianceStart}: the same bits as
 * {@link PenalizedObjective#fisherInformation} and {@link NewtonCovariance#sandwich}). With a
 * search, each lane's unit runs its search's fits ({@link SmoothingSearch.Steps}: the same fits
 * from the same starts, each at its own λ) and then its final fit at the chosen λ in its lane, and
 * its choice is the one {@link SmoothingSearch#choose} makes alone. Internal.
 *
 * <p>A round: the lanes that asked for derivatives get them from one pass (a lane whose observed
 * information is not positive definite gets the expected one from its own engine), then the lanes
 * that asked for an evaluation get it from one pass. That pass computes every lane; a lane that
 * waits for derivatives (a search fit resumed at the last point it evaluated) gets the same
 * evaluation again, at the point its lane still holds, so its passes' arrays do not change.
 */
final class NewtonLanes {
    /** The unit-by-unit side of a batch: loading a unit into an engine and finishing it. */
    interface Units {
        /**
         * Loads unit i's counts into row and the engine (useCounts with row); false when the unit
         * needs no fit (it has been handled). NewtonLanes then sets the start, from the engine's
         * start map in the lanes (as {@link PenalizedNewton#startFromCounts}, the same bits).
         */
        boolean load(int i, PenalizedNewton eng, double[] row);

        /**
         * Finishes unit i after its iteration at λ (diagnostics, output) with its robust sandwich
         * covariance and edf, or computes them when cov is null; found holds the search's two
         * values ({@link SmoothingSearch#choose}; NaN at a fixed λ); definite: cov has a Cholesky
         * factor ({@link io.densa.core.internal.Cholesky#factor} with no pivot floor), so it is
         * positive definite.
         */
        void finish(int i, PenalizedNewton eng, double lambda, double[] found, boolean converged, double[] cov,
                double edf, boolean definite);
    }

    private final UnitLanes kern;
    private final int lanes;
    private final UnitLanes.Layout lay;
    private final int k1;
    private final PenalizedNewton[] eng;
    private final Supplier<PenalizedNewton> engines;
    /** The engines' Newton pivot floor (the same for all: it depends on the prior only). */
    private final double pivotFloor;
    /**
     * Engines not in a lane (free, or finished and waiting for the covariance batch), made as
     * needed (at most twice the lanes), and each engine's counts row.
     */
    private final java.util.ArrayDeque<PenalizedNewton> free = new java.util.ArrayDeque<>();
    private final java.util.IdentityHashMap<PenalizedNewton, double[]> rows = new java.util.IdentityHashMap<>();
    private final PenalizedNewton[] waiting;
    private final int[] waitingUnit;
    private final boolean[] waitingConverged;
    private final double[] waitingLambda;
    private final double[][] waitingFound;
    private int waitingCount;
    /** The fixed λ (NaN with a search), or the search and its scale; each lane's search and fit. */
    private final double fixedLambda;
    private final SmoothingSearch search;
    private final double scale;
    private final SmoothingSearch.Steps[] plans;
    private final double[][] found;
    /** The search's two values at a fixed λ (read only). */
    private static final double[] NO_SEARCH = {Double.NaN, Double.NaN};
    /** Each lane's λ and whether its fit is one of its search's. */
    private final double[] lam;
    private final boolean[] searching;
    /**
     * Whether the derivative pass's arrays hold lane l's derivatives at its last evaluation (a pass
     * has run since: it computes every lane, each at the evaluation its lane holds).
     */
    private final boolean[] current;
    /**
     * The error of the first unit, in input order, whose finish threw (units are finished in the
     * order their fits end): no later unit is loaded, the units in the lanes are finished, then it
     * is thrown, so that the batch names the unit a unit-by-unit loop would have named.
     */
    private RuntimeException error;
    private int errorUnit;
    /** The fit's settings and units and the next unit to load (per {@link #fit}). */
    private int maxIter, next, to;
    private double tol;
    private Units units;
    /** The covariance batch's penalty, prior (or null), coordinate map and matrices. */
    private final double[] pen, prior, u;
    private final double[] jm, fm, linv, t1, edf, meat, wm, mm, t2, cov;
    private final int[] covFailed, psdFailed;
    private final double[] norms, forms;
    /** Units loaded ahead of the lanes with their starts ({@link #fillQueue}). */
    private final PenalizedNewton[] queued;
    private final int[] queuedUnit;
    private int queuedCount, queuedNext;
    private final double[] startLogs, startBeta;
    /** The queued units' starts (coefficients, counts) and their evaluation (scratch: eta), one unit per lane. */
    private final double[] qBeta, qCounts, qEx, qMass, qRes, qForms;
    private final boolean[] robust;
    /** The expected-information pass of the waiting engines, one per lane. */
    private final double[] fEx, fMass, fCounts, fTotals, fTwoLambda, fZ, fHess, fMvec, fUj, meatScale;
    private final int[] unit;
    private final int[] need;
    private final double[] beta, counts, totals, zs, eta, ex, mass, res, grad, hess, mvec, uj, factor, steps;
    private final int[] failed;
    /** Lowest column of row i that a node pass touches (the band of the information; the layout's). */
    private final int[] bandLo;
    /** The penalised derivatives in lanes: β, 2λ, N/Z² and the gradient per lane; P's and Q's row ranges. */
    private final double[] bd, twoLambda, rankOne, gl;
    private final int[] penRows, priorRows;

    /**
     * For units of counts on layout at a fixed λ (search null) or at the λ search chooses (λ NaN;
     * scale: the search's, see {@link SmoothingSearch#choose}); engines makes an engine (coordinate
     * map and start map set), pen, prior and u are the engines' penalty, prior (or null) and
     * coordinate map.
     */
    NewtonLanes(UnitLanes kern, BinLayout layout, Supplier<PenalizedNewton> engines, double lambda,
            SmoothingSearch search, double scale, double[] pen, double[] prior, double[] u) {
        this.kern = kern;
        this.lanes = kern.lanes();
        this.lay = layout.lanes();
        this.k1 = lay.k1();
        int l = lanes;
        eng = new PenalizedNewton[l];
        this.engines = engines;
        PenalizedNewton first = take();
        free.add(first);
        pivotFloor = first.pivotFloor();
        waiting = new PenalizedNewton[l];
        waitingUnit = new int[l];
        waitingConverged = new boolean[l];
        waitingLambda = new double[l];
        waitingFound = new double[l][];
        this.fixedLambda = lambda;
        this.search = search;
        this.scale = scale;
        plans = new SmoothingSearch.Steps[l];
        found = new double[l][];
        lam = new double[l];
        searching = new boolean[l];
        current = new boolean[l];
        this.pen = pen;
        this.prior = prior;
        this.u = u;
        int kk = (k1 - 1) * (k1 - 1) * l;
        jm = new double[kk];
        fm = new double[kk];
        linv = new double[kk];
        t1 = new double[kk];
        meat = new double[kk];
        wm = new double[kk];
        mm = new double[kk];
        t2 = new double[kk];
        cov = new double[kk];
        edf = new double[l];
        covFailed = new int[l];
        psdFailed = new int[l];
        norms = new double[2 * l];
        forms = new double[2 * l];
        queued = new PenalizedNewton[l];
        queuedUnit = new int[l];
        startLogs = new double[lay.bins() * l];
        startBeta = new double[k1 * l];
        qBeta = new double[k1 * l];
        qCounts = new double[lay.bins() * l];
        qEx = new double[lay.nodes() * l];
        qMass = new double[lay.bins() * l];
        qRes = new double[3 * l];
        qForms = new double[2 * l];
        robust = new boolean[l];
        fEx = new double[lay.nodes() * l];
        fMass = new double[lay.bins() * l];
        fCounts = new double[lay.bins() * l];
        fTotals = new double[l];
        fTwoLambda = new double[l];
        meatScale = new double[l];
        fZ = new double[l];
        fHess = new double[k1 * k1 * l];
        fMvec = new double[k1 * l];
        fUj = new double[k1 * l];
        unit = new int[l];
        need = new int[l];
        beta = new double[k1 * l];
        counts = new double[lay.bins() * l];
        totals = new double[l];
        zs = new double[l];
        eta = new double[lay.nodes() * l];
        ex = new double[lay.nodes() * l];
        mass = new double[lay.bins() * l];
        res = new double[3 * l];
        grad = new double[k1 * l];
        hess = new double[k1 * k1 * l];
        mvec = new double[k1 * l];
        uj = new double[k1 * l];
        factor = new double[k1 * k1 * l];
        steps = new double[k1 * l];
        failed = new int[l];
        bandLo = lay.bandLo();
        bd = new double[k1 * l];
        twoLambda = new double[l];
        rankOne = new double[l];
        gl = new double[k1 * l];
        penRows = io.densa.core.internal.Kernels.rowSupport(pen, k1 - 1);
        priorRows = prior == null ? null : io.densa.core.internal.Kernels.rowSupport(prior, k1 - 1);
    }

    /** Fits units from..to−1 with the engines' {@link PenalizedNewton#solve} settings. */
    void fit(int from, int to, int maxIter, double tol, Units units) {
        this.next = from;
        this.to = to;
        this.maxIter = maxIter;
        this.tol = tol;
        this.units = units;
        queuedCount = queuedNext = 0;
        boolean[] differentiate = new boolean[lanes], evaluate = new boolean[lanes];
        for (int l = 0; l < lanes; l++) {
            load(l);
        }
        while (true) {
            boolean any = false;
            for (int l = 0; l < lanes; l++) {
                differentiate[l] = unit[l] >= 0 && need[l] == PenalizedNewton.DIFFERENTIATE;
                any |= differentiate[l];
            }
            if (any) {
                kern.derivatives(lay, counts, totals, ex, mass, zs, grad, hess, mvec, uj);
                java.util.Arrays.fill(current, true);
                int k = k1 - 1;
                // the penalised matrices and gradients in lanes (λ = 0, where the penalty is skipped: per engine)
                boolean inLanes = true, exact = false; // exact: a lane's fit reads its step's size
                for (int l = 0; l < lanes; l++) {
                    if (differentiate[l]) {
                        inLanes &= lam[l] != 0.0;
                        exact |= !searching[l];
                        double[] b = eng[l].betaView();
                        UnitLanes.setLane(b, k, bd, lanes, l);
                        twoLambda[l] = 2 * lam[l];
                        rankOne[l] = totals[l] / (zs[l] * zs[l]);
                    }
                }
                if (inLanes) {
                    kern.finishDerivatives(k, k1, bandLo, grad, hess, mvec, rankOne, bd, prior, priorRows, pen,
                            penRows, twoLambda, factor, gl);
                    System.arraycopy(gl, 0, steps, 0, k * lanes);
                } else {
                    for (int l = 0; l < lanes; l++) {
                        if (differentiate[l]) {
                            finishOwn(l);
                            double[] h = eng[l].objective().hess, g = eng[l].objective().grad;
                            for (int i = 0; i < k; i++) {
                                for (int c = i * k1, end = c + i; c <= end; c++) {
                                    factor[c * lanes + l] = h[c];
                                }
                                steps[i * lanes + l] = g[i];
                            }
                        }
                    }
                }
                kern.cholesky(factor, k, k1, pivotFloor, failed);
                kern.solve(factor, k, k1, steps); // the Newton steps (read only where the factor exists)
                if (u != null && exact) { // their coordinate norms and the coefficients' (the stopping rule)
                    kern.coordinateNorm(u, k, steps, norms, 0);
                    kern.coordinateNorm(u, k, bd, norms, lanes);
                }
                for (int l = 0; l < lanes; l++) {
                    if (differentiate[l]) {
                        PenalizedNewton e = eng[l];
                        PenalizedObjective lik = e.objective();
                        if (failed[l] < 0) {
                            double[] h = lik.hess, g = lik.grad;
                            for (int i = 0; i < k; i++) {
                                for (int c = i * k1, end = c + i; c <= end; c++) {
                                    h[c] = factor[c * lanes + l];
                                }
                            }
                            if (inLanes) { // the gradient (the step's right-hand side before the solve)
                                UnitLanes.lane(gl, lanes, l, g, k);
                            }
                            double rel = u == null || !exact ? Double.NaN : norms[l] / (1 + norms[lanes + l]);
                            need[l] = e.factoredWithStep(steps, l, lanes, rel); // rel as relativeStep's
                        } else {
                            if (inLanes) {
                                finishOwn(l);
                            }
                            need[l] = e.differentiated(); // its own factorisation of the intact matrix
                        }
                        scoreIfNeeded(l);
                        finished(l);
                    }
                }
            }
            boolean active = false;
            any = false;
            for (int l = 0; l < lanes; l++) {
                active |= unit[l] >= 0;
                evaluate[l] = unit[l] >= 0 && need[l] == PenalizedNewton.EVALUATE;
                if (evaluate[l]) {
                    any = true;
                    double[] at = eng[l].evaluationPoint();
                    UnitLanes.setLane(at, k1, beta, lanes, l);
                }
            }
            if (!active) {
                finishWaiting();
                if (error != null) {
                    throw error;
                }
                return;
            }
            if (!any) {
                continue;
            }
            kern.evaluate(lay, beta, counts, eta, ex, mass, res);
            kern.quadraticForm(pen, penRows, k1 - 1, beta, forms, 0); // β'Pβ and β'Qβ of every lane
            if (prior != null) {
                kern.quadraticForm(prior, priorRows, k1 - 1, beta, forms, lanes);
            }
            for (int l = 0; l < lanes; l++) {
                if (evaluate[l]) {
                    evaluated(l, res, forms, l);
                }
            }
        }
    }

    /**
     * Lane l's evaluation to its engine (Z, shift and ℓ at r[s], r[lanes + s], r[2 lanes + s],
     * β'Pβ and β'Qβ at f[s], f[lanes + s]), then what the engine asks next.
     */
    private void evaluated(int l, double[] r, double[] f, int s) {
        current[l] = false;
        zs[l] = r[s];
        double o = eng[l].objective().accept(r[s], r[lanes + s], r[2 * lanes + s], f[s],
                prior == null ? 0.0 : f[lanes + s], lam[l]);
        need[l] = eng[l].evaluated(o);
        finished(l);
    }

    /** Lane l's node pass (band of hess, mvec, grad) into its objective, then its engine's penalised derivatives. */
    private void finishOwn(int l) {
        PenalizedObjective lik = eng[l].objective();
        UnitLanes.nodePassLane(grad, mvec, hess, bandLo, k1, lanes, l, lik.grad, lik.mvec, lik.hess);
        lik.finishDerivatives(lam[l], true, eng[l].betaView());
    }

    /** Puts the next unit that needs a fit into lane l and begins its first fit (none left: the lane idles). */
    private void load(int l) {
        unit[l] = -1;
        if (eng[l] != null) {
            free.add(eng[l]);
            eng[l] = null;
        }
        while (true) {
            if (queuedNext == queuedCount && !fillQueue()) {
                return;
            }
            int i = queuedUnit[queuedNext];
            int slot = queuedNext;
            PenalizedNewton e = queued[queuedNext];
            queued[queuedNext++] = null;
            if (error != null && i > errorUnit) { // loading stops after a failure (see fit)
                free.add(e);
                continue;
            }
            eng[l] = e;
            UnitLanes.copyLane(qCounts, slot, counts, l, lanes, lay.bins());
            totals[l] = e.total();
            unit[l] = i;
            current[l] = false;
            if (search != null) {
                found[l] = new double[2];
                plans[l] = search.new Steps(e, scale, found[l]);
            }
            begin(l);
            // at its start, evaluated with the queue (fillQueue)
            if (need[l] == PenalizedNewton.EVALUATE && UnitLanes.isLane(e.evaluationPoint(), k1, qBeta, lanes, slot)) {
                UnitLanes.copyLane(qBeta, slot, beta, l, lanes, k1); // the point an evaluation pass repeats
                UnitLanes.copyLane(qEx, slot, ex, l, lanes, lay.nodes());
                UnitLanes.copyLane(qMass, slot, mass, l, lanes, lay.bins());
                evaluated(l, qRes, qForms, slot);
            }
            return;
        }
    }

    /**
     * Loads the next units that need a fit, up to one per lane, each into a free engine, sets their
     * starts in one pass of the lanes and evaluates them in another (a unit's first request, which
     * {@link #load} answers from it: in a lane, a new unit's first evaluation would come after its
     * lane's derivative pass of that round had run without it); false when none is left.
     */
    private boolean fillQueue() {
        queuedCount = queuedNext = 0;
        while (queuedCount < lanes && next < to && (error == null || next < errorUnit)) {
            int i = next++;
            PenalizedNewton e = take();
            double[] r = rows.get(e);
            if (!units.load(i, e, r)) {
                free.add(e);
                continue;
            }
            for (int j = 0; j < r.length; j++) {
                startLogs[j * lanes + queuedCount] = BinLayout.logHalf(r[j]);
            }
            UnitLanes.setLane(r, r.length, qCounts, lanes, queuedCount);
            queued[queuedCount] = e;
            queuedUnit[queuedCount++] = i;
        }
        if (queuedCount == 0) {
            return false;
        }
        double[][] map = queued[0].startMap();
        if (map[0] != null) {
            kern.start(map[0], map[1], k1 - 1, startLogs, startBeta);
        }
        double[] b = new double[k1 - 1]; // zero without a map
        for (int s = 0; s < queuedCount; s++) {
            if (map[0] != null) {
                UnitLanes.lane(startBeta, lanes, s, b, b.length);
            }
            queued[s].setRawCoefficients(b); // as startFromCounts would (β_K = 0)
            UnitLanes.setLane(queued[s].betaView(), k1, qBeta, lanes, s);
        }
        kern.evaluate(lay, qBeta, qCounts, eta, qEx, qMass, qRes); // eta: scratch of every evaluation
        kern.quadraticForm(pen, penRows, k1 - 1, qBeta, qForms, 0);
        if (prior != null) {
            kern.quadraticForm(prior, priorRows, k1 - 1, qBeta, qForms, lanes);
        }
        return true;
    }

    /** Lane l's engine begins its next fit: its search's next one, else the final fit at the chosen or fixed λ. */
    private void begin(int l) {
        PenalizedNewton e = eng[l];
        searching[l] = search != null && plans[l].next();
        if (searching[l]) {
            lam[l] = plans[l].lambda();
            need[l] = e.begin(lam[l], maxIter, search.searchTolerance(), false);
        } else {
            lam[l] = search != null ? plans[l].chosen() : fixedLambda;
            need[l] = e.begin(lam[l], maxIter, tol, true);
        }
        if (need[l] == PenalizedNewton.DIFFERENTIATE && current[l]) {
            // a fit resumed where the last one stopped: its derivative pass is still in the lanes
            finishOwn(l);
            need[l] = e.differentiated();
            scoreIfNeeded(l);
        }
        finished(l);
    }

    /** Fisher scoring where lane l's observed information was not positive definite: its engine's own pass. */
    private void scoreIfNeeded(int l) {
        if (need[l] == PenalizedNewton.DIFFERENTIATE_EXPECTED) {
            PenalizedNewton e = eng[l];
            copyEvaluation(l, e.objective());
            e.objective().derivatives(lam[l], true, true, e.betaView());
            need[l] = e.differentiated();
        }
    }

    /**
     * If lane l's fit has finished: a search fit gives its criterion to the search, as
     * {@link SmoothingSearch#criterionAt} after its fit, and the next fit begins; a final fit
     * completes its unit.
     */
    private void finished(int l) {
        if (need[l] != PenalizedNewton.FINISHED) {
            return;
        }
        PenalizedNewton e = eng[l];
        if (searching[l]) {
            e.keepFactor();
            if (search.criterionReadsEvaluation()) {
                copyEvaluation(l, e.objective());
            }
            plans[l].accept(search.criterionAfter(e, lam[l], null, e.converged()));
            begin(l);
        } else {
            complete(l);
        }
    }

    /** A free engine, or a new one. */
    private PenalizedNewton take() {
        PenalizedNewton e = free.poll();
        if (e == null) {
            e = engines.get();
            rows.put(e, new double[lay.bins()]);
        }
        return e;
    }

    /**
     * Lane l's unit has finished: its engine takes the lane's last evaluation and waits for the
     * covariance batch; the lane takes a free engine and the next unit.
     */
    private void complete(int l) {
        PenalizedNewton e = eng[l];
        copyEvaluation(l, e.objective());
        e.keepFactor();
        waiting[waitingCount] = e;
        waitingUnit[waitingCount] = unit[l];
        waitingLambda[waitingCount] = lam[l];
        waitingFound[waitingCount] = search != null ? found[l] : NO_SEARCH;
        waitingConverged[waitingCount++] = e.converged();
        if (waitingCount == lanes) {
            finishWaiting();
        }
        eng[l] = null;
        plans[l] = null;
        load(l);
    }

    /**
     * The waiting engines' Fisher information and robust sandwich covariances, one engine per lane
     * (lanes whose J is not positive definite are left to the engine's own
     * {@link NewtonCovariance#sandwich}, which reports it), then each unit's finish; the engines
     * become free.
     */
    private void finishWaiting() {
        int n = k1 - 1, w = waitingCount;
        if (w == 0) {
            return;
        }
        for (int s = 0; s < w; s++) {
            PenalizedObjective lik = waiting[s].objective();
            UnitLanes.setLane(lik.ex, lik.ex.length, fEx, lanes, s);
            UnitLanes.setLane(lik.mass, lik.mass.length, fMass, lanes, s);
            fTotals[s] = lik.total();
            fZ[s] = lik.zScaled();
        }
        kern.expectedInformation(lay, fTotals, fEx, fMass, fZ, fHess, fMvec, fUj);
        for (int s = 0; s < w; s++) {
            fTwoLambda[s] = 2 * waitingLambda[s];
        }
        // F and J = F + 2λP (+ 2Q) in the lanes (the rest of PenalizedObjective.fisherInformation, then
        // NewtonCovariance's J); the engines' own arrays are not needed for them
        kern.fisherInformation(k1, bandLo, fHess, fMvec, fTotals, fZ, fTwoLambda, pen, prior, fm, jm);
        kern.covarianceStart(n, jm, fm, linv, t1, edf, covFailed);
        boolean anyRobust = false;
        for (int s = 0; s < w; s++) {
            robust[s] = covFailed[s] < 0 && waiting[s].total() > edf[s] + 1; // as NewtonCovariance.sandwich
            anyRobust |= robust[s];
        }
        if (anyRobust) { // the robust meat of every lane, then scaled or replaced by F lane by lane
            for (int s = 0; s < w; s++) {
                double[] c = waiting[s].objective().counts();
                UnitLanes.setLane(c, c.length, fCounts, lanes, s);
            }
            kern.empiricalInformation(lay, fCounts, fTotals, fEx, fMass, fMvec, fUj, meat);
        }
        for (int s = 0; s < lanes; s++) {
            double total = s < w ? waiting[s].total() : 0.0;
            meatScale[s] = s < w && robust[s] ? total / (total - edf[s]) : Double.NaN;
        }
        kern.meat(n, meat, fm, meatScale);
        kern.covarianceFinish(n, linv, meat, u, t1, wm, mm, t2, cov);
        System.arraycopy(cov, 0, wm, 0, n * n * lanes); // which covariances have a Cholesky factor
        kern.cholesky(wm, n, n, 0.0, psdFailed);
        for (int s = 0; s < w; s++) {
            double[] c = null;
            if (covFailed[s] < 0) {
                c = new double[n * n];
                UnitLanes.lane(cov, lanes, s, c, n * n);
            }
            try {
                units.finish(waitingUnit[s], waiting[s], waitingLambda[s], waitingFound[s], waitingConverged[s], c,
                        edf[s], c != null && psdFailed[s] < 0);
            } catch (RuntimeException ex) {
                if (error == null || waitingUnit[s] < errorUnit) {
                    error = ex;
                    errorUnit = waitingUnit[s];
                }
            }
            free.add(waiting[s]);
            waiting[s] = null;
            waitingFound[s] = null;
        }
        waitingCount = 0;
    }

    private void copyEvaluation(int l, PenalizedObjective lik) {
        UnitLanes.lane(ex, lanes, l, lik.ex, lik.ex.length);
        UnitLanes.lane(mass, lanes, l, lik.mass, lik.mass.length);
    }
}
