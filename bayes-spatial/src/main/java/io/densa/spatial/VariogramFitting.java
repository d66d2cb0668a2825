package io.densa.spatial;

import io.densa.core.DensaException;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Objects;
import org.apache.commons.math3.exception.TooManyEvaluationsException;
import org.apache.commons.math3.optim.InitialGuess;
import org.apache.commons.math3.optim.MaxEval;
import org.apache.commons.math3.optim.PointValuePair;
import org.apache.commons.math3.optim.SimpleBounds;
import org.apache.commons.math3.optim.nonlinear.scalar.GoalType;
import org.apache.commons.math3.optim.nonlinear.scalar.ObjectiveFunction;
import org.apache.commons.math3.optim.nonlinear.scalar.noderiv.BOBYQAOptimizer;

/**
 * Least-squares fitting of a variogram model to an empirical trace-variogram, by Cressie's
 * weighted least squares (Cressie (1985), Fitting variogram models by weighted least squares, Math.
 * Geol. 17(5)) or by ordinary least squares, under positivity and range bounds, with Powell's
 * BOBYQA (Commons Math; Powell (2009), The BOBYQA algorithm for bound constrained optimization
 * without derivatives, Cambridge report DAMTP 2009/NA06 — from memory) on parameters scaled by
 * their starting values.
 *
 * <p>Starting values from the empirical variogram (common practice): sill = mean γ̂ of the last
 * third of the non-empty bins, nugget = the straight line through the first two bins at lag 0
 * (clamped to [0, ½ sill]), range = the first lag where γ̂ reaches 95% of the sill (divided by
 * 3 for the Matérn scale). Bounds: partial sill in [10⁻⁶, 10] × max γ̂, nugget in
 * [0, 2 max γ̂], range as in {@link VariogramFitOptions}.
 */
public final class VariogramFitting {
    private VariogramFitting() {
    }

    /** Fits the first (or only) sector. */
    public static VariogramFit fit(EmpiricalVariogram empirical, VariogramFitOptions options) {
        return fit(empirical, 0, options);
    }

    /**
     * Fits one sector of the empirical variogram.
     *
     * @throws IllegalArgumentException if fewer non-empty bins than parameters + 1 exist
     * @throws DensaException           if the criterion is not finite at the start
     */
    public static VariogramFit fit(EmpiricalVariogram empirical, int sector, VariogramFitOptions options) {
        Objects.requireNonNull(empirical, "empirical");
        Objects.requireNonNull(options, "options");
        double[] lag = empirical.meanLags(sector);
        double[] gam = empirical.semivariances(sector);
        long[] cnt = empirical.counts(sector);
        int used = 0;
        for (long c : cnt) {
            if (c > 0) {
                used++;
            }
        }
        double[] h = new double[used];
        double[] g = new double[used];
        double[] w = new double[used];
        int u = 0;
        double gmax = 0;
        for (int b = 0; b < cnt.length; b++) {
            if (cnt[b] > 0) {
                h[u] = lag[b];
                g[u] = gam[b];
                w[u] = cnt[b];
                gmax = Math.max(gmax, g[u]);
                u++;
            }
        }
        VariogramModel.Family fam = options.family();
        boolean nug = options.nugget();
        int np = nug ? 3 : 2;
        if (used < np + 1) {
            throw new IllegalArgumentException("fitting " + np + " parameters needs at least " + (np + 1)
                    + " non-empty bins, got " + used);
        }
        if (!(gmax > 0)) {
            throw new IllegalArgumentException("the empirical variogram is zero in every bin; nothing to fit");
        }
        double hmax = h[used - 1];
        // starting values
        int tail = Math.max(1, used / 3);
        double sill = 0;
        for (int i = used - tail; i < used; i++) {
            sill += g[i];
        }
        sill /= tail;
        double c0 = 0;
        if (nug && used >= 2 && h[1] > h[0]) {
            c0 = g[0] - h[0] * (g[1] - g[0]) / (h[1] - h[0]);
            c0 = Math.max(0, Math.min(0.5 * sill, c0));
        }
        double c = Math.max(sill - c0, 0.1 * sill);
        double a = hmax / 2;
        for (int i = 0; i < used; i++) {
            if (g[i] >= 0.95 * sill) {
                a = Math.max(h[i], hmax / 20);
                break;
            }
        }
        double rlo, rhi;
        if (fam == VariogramModel.Family.POWER) {
            rlo = Double.isNaN(options.minRange()) ? 0.01 : options.minRange();
            rhi = Double.isNaN(options.maxRange()) ? 1.99 : Math.min(1.99, options.maxRange());
            a = 1.0;
            c = Math.max(1e-12, (g[used - 1] - c0) / hmax);
        } else {
            if (fam == VariogramModel.Family.MATERN) {
                a /= 3;
            }
            rlo = Double.isNaN(options.minRange()) ? 1e-3 * hmax : options.minRange();
            rhi = Double.isNaN(options.maxRange()) ? 3 * hmax : options.maxRange();
        }
        a = Math.min(rhi, Math.max(rlo, a));
        double cLo = 1e-6 * gmax, cHi = fam == VariogramModel.Family.POWER ? 1e6 * Math.max(c, 1e-12) : 10 * gmax;
        c = Math.min(cHi, Math.max(cLo, c));
        final double cs = c, as = a, ss = Math.max(sill, 1e-300);
        double[] lower = nug ? new double[] {cLo / cs, rlo / as, 0} : new double[] {cLo / cs, rlo / as};
        double[] upper = nug ? new double[] {cHi / cs, rhi / as, 2 * gmax / ss}
            : new double[] {cHi / cs, rhi / as};
        double[] start = nug ? new double[] {1, 1, c0 / ss} : new double[] {1, 1};
        for (int i = 0; i < np; i++) {
            start[i] = Math.min(upper[i], Math.max(lower[i], start[i]));
        }
        double nu = options.smoothness();
        VariogramFitOptions.Method method = options.method();
        double[] best = start.clone();
        double[] bestVal = {Double.POSITIVE_INFINITY};
        int[] evals = {0};
        ObjectiveFunction obj = new ObjectiveFunction(x -> {
            evals[0]++;
            VariogramModel m = build(fam, x[0] * cs, x[1] * as, nu, nug ? x[2] * ss : 0);
            double v = criterion(m, h, g, w, method);
            if (v < bestVal[0]) {
                bestVal[0] = v;
                System.arraycopy(x, 0, best, 0, x.length);
            }
            return Double.isFinite(v) ? v : 1e300;
        });
        double startVal = criterion(build(fam, start[0] * cs, start[1] * as, nu, nug ? start[2] * ss : 0), h, g, w,
                method);
        if (!Double.isFinite(startVal)) {
            throw new DensaException("variogram fit criterion is not finite at the starting values",
                    new FitStart(fam, start[0] * cs, start[1] * as, nug ? start[2] * ss : 0));
        }
        double minWidth = Double.POSITIVE_INFINITY;
        for (int i = 0; i < np; i++) {
            minWidth = Math.min(minWidth, upper[i] - lower[i]);
        }
        double radius = Math.min(0.2, 0.49 * minWidth);
        boolean converged = true;
        try {
            BOBYQAOptimizer opt = new BOBYQAOptimizer(2 * np + 1, radius, 1e-10);
            PointValuePair r = opt.optimize(new MaxEval(options.maxEvaluations()), obj, GoalType.MINIMIZE,
                    new InitialGuess(start), new SimpleBounds(lower, upper));
            if (r.getValue() <= bestVal[0]) {
                System.arraycopy(r.getPoint(), 0, best, 0, np);
                bestVal[0] = r.getValue();
            }
        } catch (TooManyEvaluationsException e) {
            converged = false;
        }
        double cFit = best[0] * cs, aFit = best[1] * as, c0Fit = nug ? best[2] * ss : 0;
        VariogramModel m = build(fam, cFit, aFit, nu, c0Fit);
        double[] fitted = new double[lag.length];
        double sse = 0;
        for (int b = 0; b < lag.length; b++) {
            fitted[b] = cnt[b] > 0 ? m.gamma(lag[b]) : Double.NaN;
        }
        for (int i = 0; i < used; i++) {
            double d = g[i] - m.gamma(h[i]);
            sse += d * d;
        }
        boolean atBound = aFit <= rlo * 1.001 || aFit >= rhi * 0.999;
        return new VariogramFit(m, method, criterion(m, h, g, w, method), Math.sqrt(sse / used), fitted, used, evals[0],
                converged, atBound);
    }

    /** Starting point at which the criterion failed. */
    record FitStart(VariogramModel.Family family, double partialSill, double range, double nugget) {
    }

    private static VariogramModel build(VariogramModel.Family fam, double c, double a, double nu, double c0) {
        VariogramModel m = VariogramModel.of(fam, c, a, nu);
        return c0 > 0 ? m.withNugget(c0) : m;
    }

    static double criterion(VariogramModel m, double[] h, double[] g, double[] w, VariogramFitOptions.Method method) {
        double s = 0;
        for (int i = 0; i < h.length; i++) {
            double model = m.gamma(h[i]);
            if (method == VariogramFitOptions.Method.WEIGHTED_CRESSIE) {
                double r = g[i] / model - 1;
                s += w[i] * r * r;
            } else {
                double r = g[i] - model;
                s += r * r;
            }
        }
        return s;
    }

    /**
     * Fits each candidate and returns the fits ordered by increasing criterion (model comparison by
     * fit criterion; candidates should share the method for the criteria to be comparable).
     */
    public static List<VariogramFit> compare(EmpiricalVariogram empirical, List<VariogramFitOptions> candidates) {
        Objects.requireNonNull(candidates, "candidates");
        List<VariogramFit> out = new ArrayList<>();
        for (VariogramFitOptions o : candidates) {
            out.add(fit(empirical, o));
        }
        out.sort(Comparator.comparingDouble(VariogramFit::criterion));
        return out;
    }
}
