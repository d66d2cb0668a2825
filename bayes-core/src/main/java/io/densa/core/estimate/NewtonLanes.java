package io.densa.core.estimate;

import io.densa.core.internal.UnitLanes;
import java.util.function.Supplier;

/**
 * Fits at a fixed λ of units of counts on one cubic-spline layout, {@link UnitLanes#lanes()} units
 * at a time: each lane has its own {@link PenalizedNewton} (coefficients, iteration, Cholesky
 * factor, and afterwards the covariance), while the quadrature passes, the evaluation and the node
 * pass of the observed information, run for all lanes together, one unit per lane of a SIMD
 * vector, and so do the Newton factorisation and solve. The passes give each lane the bits the
 * one-unit passes give, and each engine answers the same requests in the same order as its own
 * {@link PenalizedNewton#solve}, so a unit's fit is the same to the bit as alone, whichever units
 * share the lanes. A lane whose unit has finished takes the next unit at once (with a fresh
 * engine); the finished engines wait until as many as there are lanes have finished, and their
 * Fisher information and robust sandwich covariances are computed together, one unit per lane
 * again ({@link UnitLanes#expectedInformation}, {@link UnitLanes#covarianceStart}: the same bits
 * as {@link PenalizedObjective#fisherInformation} and {@link NewtonCovariance#sandwich}).
 * Internal.
 *
 * <p>A round: the lanes that asked for derivatives get them from one pass (a lane whose observed
 * information is not positive definite gets the expected one from its own engine), then every
 * lane that asked for an evaluation (after the round's derivatives, all of them) gets it from one
 * pass.
 */
final class NewtonLanes {
    /** The unit-by-unit side of a batch: loading a unit into an engine and finishing it. */
    interface Units {
        /**
         * Loads unit i's counts into row and the engine (useCounts with row) and sets its start;
         * false when the unit needs no fit (it has been handled).
         */
        boolean load(int i, PenalizedNewton eng, double[] row);

        /**
         * Finishes unit i after its iteration (diagnostics, output) with its robust sandwich
         * covariance and edf, or computes them when cov is null.
         */
        void finish(int i, PenalizedNewton eng, boolean converged, double[] cov, double edf);
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
    private int waitingCount;
    /** The smoothing parameter; the covariance batch's penalty, prior (or null), coordinate map and matrices. */
    private final double lambda;
    private final double[] pen, prior, u;
    private final double[] jm, fm, linv, t1, edf, meat, wm, mm, t2, cov;
    private final int[] covFailed;
    /** The expected-information pass of the waiting engines, one per lane. */
    private final double[] fEx, fMass, fTotals, fZ, fHess, fMvec, fUj;
    private final int[] unit;
    private final int[] need;
    private final double[] beta, counts, totals, zs, eta, ex, mass, res, grad, hess, mvec, uj, factor, steps;
    private final int[] failed;
    /** Lowest column of row i that a node pass touches (the band of the information; the layout's). */
    private final int[] bandLo;

    /**
     * For units of counts on layout at λ; engines makes an engine (coordinate map and start map
     * set), pen, prior and u are the engines' penalty, prior (or null) and coordinate map.
     */
    NewtonLanes(UnitLanes kern, BinLayout layout, Supplier<PenalizedNewton> engines, double lambda, double[] pen,
            double[] prior, double[] u) {
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
        this.lambda = lambda;
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
        fEx = new double[lay.nodes() * l];
        fMass = new double[lay.bins() * l];
        fTotals = new double[l];
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
    }

    /** Fits units from..to−1 at this batch's λ with the engines' {@link PenalizedNewton#solve} settings. */
    void fit(int from, int to, int maxIter, double tol, Units units) {
        int next = from;
        for (int l = 0; l < lanes; l++) {
            next = load(l, next, to, maxIter, tol, units);
        }
        while (true) {
            boolean differentiate = false;
            for (int l = 0; l < lanes; l++) {
                differentiate |= unit[l] >= 0 && need[l] == PenalizedNewton.DIFFERENTIATE;
            }
            if (differentiate) {
                kern.derivatives(lay, counts, totals, ex, mass, zs, grad, hess, mvec, uj);
                int k = k1 - 1;
                for (int l = 0; l < lanes; l++) {
                    if (unit[l] >= 0 && need[l] == PenalizedNewton.DIFFERENTIATE) {
                        PenalizedObjective lik = eng[l].objective();
                        copyDerivatives(l, lik, grad, hess, mvec);
                        lik.finishDerivatives(lambda, true, eng[l].betaView());
                        double[] h = lik.hess;
                        for (int i = 0; i < k; i++) {
                            for (int c = i * k1, end = c + i; c <= end; c++) {
                                factor[c * lanes + l] = h[c];
                            }
                        }
                    }
                }
                kern.cholesky(factor, k, k1, pivotFloor, failed);
                for (int l = 0; l < lanes; l++) {
                    if (unit[l] >= 0 && need[l] == PenalizedNewton.DIFFERENTIATE) {
                        double[] g = eng[l].objective().grad;
                        for (int i = 0; i < k; i++) {
                            steps[i * lanes + l] = g[i];
                        }
                    }
                }
                kern.solve(factor, k, k1, steps); // the Newton steps (read only where the factor exists)
                for (int l = 0; l < lanes; l++) {
                    if (unit[l] >= 0 && need[l] == PenalizedNewton.DIFFERENTIATE) {
                        PenalizedNewton e = eng[l];
                        PenalizedObjective lik = e.objective();
                        if (failed[l] < 0) {
                            double[] h = lik.hess;
                            for (int i = 0; i < k; i++) {
                                for (int c = i * k1, end = c + i; c <= end; c++) {
                                    h[c] = factor[c * lanes + l];
                                }
                            }
                            need[l] = e.factoredWithStep(steps, l, lanes);
                        } else {
                            need[l] = e.differentiated(); // its own factorisation of the intact matrix
                        }
                        if (need[l] == PenalizedNewton.DIFFERENTIATE_EXPECTED) {
                            copyEvaluation(l, lik); // Fisher scoring: this engine's own pass
                            lik.derivatives(lambda, true, true, e.betaView());
                            need[l] = e.differentiated();
                        }
                        if (need[l] == PenalizedNewton.FINISHED) {
                            next = complete(l, next, to, maxIter, tol, units);
                        }
                    }
                }
            }
            boolean any = false;
            for (int l = 0; l < lanes; l++) {
                if (unit[l] >= 0) {
                    any = true;
                    double[] at = eng[l].evaluationPoint();
                    for (int i = 0; i < k1; i++) {
                        beta[i * lanes + l] = at[i];
                    }
                }
            }
            if (!any) {
                finishWaiting(units);
                return;
            }
            kern.evaluate(lay, beta, counts, eta, ex, mass, res);
            for (int l = 0; l < lanes; l++) {
                if (unit[l] >= 0) {
                    PenalizedNewton e = eng[l];
                    zs[l] = res[l];
                    double o = e.objective().accept(res[l], res[lanes + l], res[2 * lanes + l], e.evaluationPoint(),
                            lambda);
                    need[l] = e.evaluated(o);
                    if (need[l] == PenalizedNewton.FINISHED) {
                        next = complete(l, next, to, maxIter, tol, units);
                    }
                }
            }
        }
    }

    /** Puts the next unit that needs a fit into lane l (none: the lane idles); the next unit index. */
    private int load(int l, int next, int to, int maxIter, double tol, Units units) {
        unit[l] = -1;
        while (next < to) {
            int i = next++;
            if (eng[l] == null) {
                eng[l] = take();
            }
            double[] r = rows.get(eng[l]);
            if (units.load(i, eng[l], r)) {
                for (int j = 0; j < r.length; j++) {
                    counts[j * lanes + l] = r[j];
                }
                totals[l] = eng[l].total();
                unit[l] = i;
                need[l] = eng[l].begin(lambda, maxIter, tol, true);
                if (need[l] != PenalizedNewton.EVALUATE) {
                    throw new IllegalStateException("a fresh start asks for an evaluation first");
                }
                return next;
            }
        }
        return next;
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
    private int complete(int l, int next, int to, int maxIter, double tol, Units units) {
        PenalizedNewton e = eng[l];
        copyEvaluation(l, e.objective());
        e.keepFactor();
        waiting[waitingCount] = e;
        waitingUnit[waitingCount] = unit[l];
        waitingConverged[waitingCount++] = e.converged();
        if (waitingCount == lanes) {
            finishWaiting(units);
        }
        eng[l] = null;
        return load(l, next, to, maxIter, tol, units);
    }

    /**
     * The waiting engines' Fisher information and robust sandwich covariances, one engine per lane
     * (lanes whose J is not positive definite are left to the engine's own
     * {@link NewtonCovariance#sandwich}, which reports it), then each unit's finish; the engines
     * become free.
     */
    private void finishWaiting(Units units) {
        int n = k1 - 1, w = waitingCount;
        if (w == 0) {
            return;
        }
        for (int s = 0; s < w; s++) {
            PenalizedObjective lik = waiting[s].objective();
            for (int q = 0; q < lik.ex.length; q++) {
                fEx[q * lanes + s] = lik.ex[q];
            }
            for (int j = 0; j < lik.mass.length; j++) {
                fMass[j * lanes + s] = lik.mass[j];
            }
            fTotals[s] = lik.total();
            fZ[s] = lik.zScaled();
        }
        kern.expectedInformation(lay, fTotals, fEx, fMass, fZ, fHess, fMvec, fUj);
        for (int s = 0; s < w; s++) {
            PenalizedObjective lik = waiting[s].objective();
            copyDerivatives(s, lik, null, fHess, fMvec);
            lik.finishDerivatives(0.0, false, null); // the rest of PenalizedObjective.fisherInformation
            lik.fisherFromPass();
            double[] f = lik.fisher();
            NewtonCovariance.information(f, lambda, pen, prior, null, n, jm, s, lanes);
            for (int i = 0; i < n * n; i++) {
                fm[i * lanes + s] = f[i];
            }
        }
        kern.covarianceStart(n, jm, fm, linv, t1, edf, covFailed);
        double[] own = new double[n * n];
        for (int s = 0; s < w; s++) {
            PenalizedNewton e = waiting[s];
            double total = e.total();
            double[] m = e.objective().fisher();
            if (covFailed[s] < 0 && total > edf[s] + 1) { // the robust meat, as NewtonCovariance.sandwich
                e.objective().empiricalInformation(own);
                double f = total / (total - edf[s]);
                for (int i = 0; i < n * n; i++) {
                    own[i] *= f;
                }
                m = own;
            }
            for (int i = 0; i < n * n; i++) {
                meat[i * lanes + s] = m[i];
            }
        }
        kern.covarianceFinish(n, linv, meat, u, t1, wm, mm, t2, cov);
        for (int s = 0; s < w; s++) {
            double[] c = null;
            if (covFailed[s] < 0) {
                c = new double[n * n];
                for (int i = 0; i < n * n; i++) {
                    c[i] = cov[i * lanes + s];
                }
            }
            units.finish(waitingUnit[s], waiting[s], waitingConverged[s], c, edf[s]);
            free.add(waiting[s]);
            waiting[s] = null;
        }
        waitingCount = 0;
    }

    private void copyEvaluation(int l, PenalizedObjective lik) {
        double[] x = lik.ex;
        for (int q = 0; q < x.length; q++) {
            x[q] = ex[q * lanes + l];
        }
        double[] a = lik.mass;
        for (int j = 0; j < a.length; j++) {
            a[j] = mass[j * lanes + l];
        }
    }

    /** Lane l's node pass (band of hess, mvec, and grad unless null) into the objective's arrays. */
    private void copyDerivatives(int l, PenalizedObjective lik, double[] gradL, double[] hessL, double[] mvecL) {
        double[] g = lik.grad, h = lik.hess, m = lik.mvec;
        java.util.Arrays.fill(h, 0.0);
        for (int i = 0; i < k1; i++) {
            g[i] = gradL == null ? 0.0 : gradL[i * lanes + l];
            m[i] = mvecL[i * lanes + l];
            int row = i * k1;
            for (int c = bandLo[i]; c <= i; c++) {
                h[row + c] = hessL[(row + c) * lanes + l];
            }
        }
    }
}
