package io.densa.spatial.variogram;

import io.densa.core.DensaException;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.apache.commons.math3.exception.MathArithmeticException;
import org.apache.commons.math3.exception.MathIllegalArgumentException;
import org.apache.commons.math3.exception.MathIllegalStateException;
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
 * without derivatives, Cambridge report DAMTP 2009/NA06 — from memory). The optimiser works on
 * ln(partial sill / max γ̂), ln(range / h_max) (the exponent itself for the power model, whose
 * coefficient enters as its value at h_max) and nugget / max γ̂, so that every coordinate spans a
 * few units whatever the data's scale, and on the criterion divided by its starting value.
 *
 * <p>Starting values (common practice): sill = mean γ̂ of the last third of the bins, nugget = the
 * straight line through the first two bins at lag 0 (clamped to [0, ½ sill]), range = the first
 * lag where γ̂ reaches 95% of the sill. BOBYQA runs from
 * there and from the best point of a profile over 25 ranges spaced evenly on a log scale (for
 * each range the partial sill and nugget solve a weighted linear least-squares problem, with
 * weights |N(h_j)| / γ̂(h_j)² for Cressie's criterion); the better end point is kept.
 *
 * <p>Bounds: nugget in [0, 2 max γ̂]; range in [10⁻³, 3] × the largest bin lag h_max unless the
 * caller sets bounds (power exponent in [0.01, 1.99]); partial sill in [10⁻⁶ max γ̂,
 * 10 max γ̂ · max(1, range bound / h_max)]. <b>The default upper bound does not truncate:</b> when
 * the fit ends on it, the range bound (and with it the partial-sill bound) is widened tenfold and
 * the fit resumed from the best point, up to 1000 h_max; only a range still on the widest bound,
 * or on a bound the caller set, is reported as at a bound. On a long-range field a network of a
 * dozen stations easily has its optimum beyond 3 h_max (the test suite reproduces two, at 5.1 and
 * 7.5 h_max, where a bound of 3 h_max leaves Cressie's criterion 2.7% and 68% above the optimum).
 *
 * <p>If BOBYQA fails (Commons Math reports, for instance, that a trust-region step failed to
 * reduce its model), the fit continues with a compass search (coordinate-wise pattern search with
 * halving steps; Kolda, Lewis, Torczon (2003), Optimization by direct search, SIAM Rev. 45(3) —
 * from memory) from the best point evaluated, and the fit carries a
 * {@link VariogramFit.WarningKind#OPTIMISER_FALLBACK} warning; no Commons Math exception escapes.
 *
 * <p>Warnings ({@link VariogramFit#warnings()}): a practical range beyond h_max
 * ({@link VariogramFit.WarningKind#RANGE_BEYOND_LAGS}), a parameter on a bound that was not widened,
 * the optimiser fallback, an exhausted evaluation budget.
 */
public final class VariogramFitting {
    /** Widest default range bound, in multiples of the largest bin lag. */
    static final double MAX_RANGE_FACTOR = 1000;
    /** Ranges of the profile that gives the second starting point. */
    private static final int PROFILE_POINTS = 25;

    private VariogramFitting() {
    }

    /** Fits the first (or only) sector. */
    public static VariogramFit fit(EmpiricalVariogram empirical, VariogramFitOptions options) {
        return fit(empirical, 0, options);
    }

    /**
     * Fits one sector of the empirical variogram.
     *
     * @throws IllegalArgumentException if fewer bins than parameters + 1 exist, or γ̂ is zero in
     *                                  every bin
     * @throws DensaException           if the criterion is not finite at the start, or no finite
     *                                  criterion value was found
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
        double gmax = 0, hmax = 0;
        for (int b = 0; b < cnt.length; b++) {
            if (cnt[b] > 0) {
                h[u] = lag[b];
                g[u] = gam[b];
                w[u] = cnt[b];
                gmax = Math.max(gmax, g[u]);
                hmax = Math.max(hmax, h[u]);
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
        if (!(hmax > 0)) {
            throw new IllegalArgumentException("every bin has mean lag 0 (coincident locations only); nothing to fit");
        }
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
        boolean power = fam == VariogramModel.Family.POWER;
        boolean userMax = !Double.isNaN(options.maxRange());
        double rlo, rhi;
        if (power) {
            rlo = Double.isNaN(options.minRange()) ? 0.01 : options.minRange();
            rhi = userMax ? Math.min(1.99, options.maxRange()) : 1.99;
            if (!(rlo < rhi)) {
                throw new IllegalArgumentException("power exponent bounds [" + rlo + ", " + rhi + "] are empty; the"
                        + " exponent lies in (0, 2), so give bounds below 1.99");
            }
            a = 1.0;
            c = g[used - 1] - c0; // the structure's value at h_max
        } else {
            rlo = Double.isNaN(options.minRange()) ? 1e-3 * hmax : options.minRange();
            rhi = userMax ? options.maxRange() : 3 * hmax;
        }
        a = Math.min(rhi, Math.max(rlo, a));
        double cLo = 1e-6 * gmax;
        double cHi = power ? 1e3 * gmax : sillBound(gmax, rhi, hmax);
        c = Math.min(cHi, Math.max(cLo, c));
        Problem pr = new Problem(fam, options.smoothness(), nug, options.method(), h, g, w, gmax, hmax, cLo,
                options.maxEvaluations());
        double[] start = pr.toX(c, a, c0);
        double startVal = pr.criterion(pr.model(start));
        if (!Double.isFinite(startVal)) {
            throw new DensaException("variogram fit criterion is not finite at the starting values",
                    new VariogramFitDiagnostics(fam, c, a, c0));
        }
        pr.normaliseBy(startVal);
        double[][] box = pr.bounds(rlo, rhi, cHi);
        Run best = pr.run(clamp(start, box), box);
        double[] prof = pr.profileStart(rlo, rhi, cHi);
        if (prof != null) {
            Run second = pr.run(clamp(prof, box), box);
            if (second.value < best.value) {
                best = second;
            }
        }
        // the default range bound must not truncate: widen it while the fit ends on it
        double cap = MAX_RANGE_FACTOR * hmax;
        while (!power && !userMax && rhi < cap && (pr.atUpper(best.x, box, 1) || pr.atUpper(best.x, box, 0))) {
            rhi = Math.min(cap, 10 * rhi);
            cHi = sillBound(gmax, rhi, hmax);
            box = pr.bounds(rlo, rhi, cHi);
            Run wider = pr.run(clamp(best.x, box), box);
            if (wider.value <= best.value) {
                best = wider;
            }
        }
        VariogramModel m = pr.model(best.x);
        double crit = pr.criterion(m);
        if (!Double.isFinite(crit)) {
            throw new DensaException("variogram fit found no finite criterion value", new VariogramFitDiagnostics(fam, c, a, c0));
        }
        double[] par = pr.fromX(best.x);
        double[] fitted = new double[lag.length];
        for (int b = 0; b < lag.length; b++) {
            fitted[b] = cnt[b] > 0 ? m.gamma(lag[b]) : Double.NaN;
        }
        // in units of the power of two of max γ̂ (exact), so that the squares of semivariances beyond
        // 1e154 do not overflow
        double unit = Math.scalb(1.0, -Math.getExponent(gmax));
        double sse = 0;
        for (int i = 0; i < used; i++) {
            double d = (g[i] - m.gamma(h[i])) * unit;
            sse += d * d;
        }
        boolean lowRange = par[1] <= rlo * 1.001;
        boolean highRange = par[1] >= rhi * 0.999;
        List<VariogramFit.Warning> warnings = new ArrayList<>();
        String rangeName = power ? "power exponent" : "range";
        if (highRange) {
            warnings.add(new VariogramFit.Warning(VariogramFit.WarningKind.PARAMETER_AT_BOUND, userMax || power
                    ? fmt("the %s %.4g ended on its upper bound %.4g; the optimum may lie beyond it", rangeName, par[1],
                            rhi)
                    : fmt("the range reached %.4g, the widest bound tried (%.0f times the largest lag %.4g): the"
                            + " variogram keeps rising over these lags like an unbounded one, and no finite range"
                            + " fits best; consider the power family", par[1], MAX_RANGE_FACTOR, hmax)));
        }
        if (lowRange) {
            warnings.add(new VariogramFit.Warning(VariogramFit.WarningKind.PARAMETER_AT_BOUND, power
                    ? fmt("the power exponent %.4g ended on its lower bound %.4g", par[1], rlo)
                    : fmt("the range %.4g ended on its lower bound %.4g: the structure is shorter than the shortest"
                            + " lag (%.4g) and acts as a nugget", par[1], rlo, h[0])));
        }
        String sillName = power ? "power structure's value at the largest lag" : "partial sill";
        if (par[0] <= cLo * 1.001) {
            warnings.add(new VariogramFit.Warning(VariogramFit.WarningKind.PARAMETER_AT_BOUND, fmt("the %s %.4g"
                    + " ended on its lower bound %.4g (10^-6 of the largest semivariance): the bins show no spatial"
                    + " structure", sillName, par[0], cLo)));
        } else if (pr.atUpper(best.x, box, 0)) {
            warnings.add(new VariogramFit.Warning(VariogramFit.WarningKind.PARAMETER_AT_BOUND, fmt("the %s %.4g"
                    + " ended on its upper bound", sillName, par[0])));
        }
        if (nug && par[2] >= 2 * gmax * 0.999) {
            warnings.add(new VariogramFit.Warning(VariogramFit.WarningKind.PARAMETER_AT_BOUND, fmt("the nugget %.4g"
                    + " ended on its upper bound, twice the largest semivariance", par[2])));
        }
        if (!power) {
            double reach = par[1]; // the practical range, by the parametrisation of every bounded family
            if (reach > hmax) {
                warnings.add(new VariogramFit.Warning(VariogramFit.WarningKind.RANGE_BEYOND_LAGS, fmt("the fitted"
                        + " practical range %.4g is %.2f times the largest lag %.4g of the empirical variogram: the"
                        + " sill and the range are extrapolated beyond the lags observed, over which a longer range"
                        + " and a larger sill are hard to tell apart", reach, reach / hmax, hmax)));
            }
        }
        if (best.fallback != null) {
            warnings.add(new VariogramFit.Warning(VariogramFit.WarningKind.OPTIMISER_FALLBACK, "BOBYQA failed ("
                    + best.fallback + "); the fit was completed by a compass search from the best point it had"
                    + " found"));
        }
        if (!best.converged) {
            warnings.add(new VariogramFit.Warning(VariogramFit.WarningKind.NOT_CONVERGED, "the budget of "
                    + options.maxEvaluations() + " criterion evaluations per optimiser run was spent before"
                    + " convergence; raise it with VariogramFitOptions.withMaxEvaluations"));
        }
        double rmse = Math.sqrt(sse / used) / unit;
        if (!Double.isFinite(rmse)) {
            throw new DensaException("the root mean squared difference between the fitted and the empirical"
                    + " semivariances (" + rmse + ") exceeds the double range; rescale the densities' coordinates",
                    new VariogramFitDiagnostics(fam, par[0], par[1], nug ? par[2] : 0));
        }
        return new VariogramFit(m, options.method(), crit, rmse, fitted, used,
                pr.evaluations, best.converged, lowRange || highRange, hmax, warnings);
    }

    private static String fmt(String format, Object... args) {
        return String.format(Locale.ROOT, format, args);
    }

    /** Upper bound of the partial sill for a range bound rhi: 10 max γ̂ · max(1, rhi / h_max). */
    private static double sillBound(double gmax, double rhi, double hmax) {
        return 10 * gmax * Math.max(1, rhi / hmax);
    }

    private static double[] clamp(double[] x, double[][] box) {
        double[] out = x.clone();
        for (int i = 0; i < out.length; i++) {
            out[i] = Math.min(box[1][i], Math.max(box[0][i], out[i]));
        }
        return out;
    }

    /** One optimiser run: end point, criterion, whether it converged, the fallback reason if any. */
    private record Run(double[] x, double value, boolean converged, String fallback) {
    }

    /**
     * The fitting problem in the optimiser's coordinates x = (ln(s / max γ̂), ln(a / h_max) or the
     * power exponent ω, c0 / max γ̂), where s is the partial sill (for the power model the
     * structure's value c h_max^ω at the largest lag, which separates the coefficient from the
     * exponent): every coordinate then ranges over a few units whatever the data's scale. The
     * optimiser sees the criterion divided by its value at the start and capped at 10¹² (a
     * non-finite value counts as the cap), so that its quadratic models never overflow.
     */
    private static final class Problem {
        static final double CAP = 1e12;
        final VariogramModel.Family fam;
        final double nu;
        final boolean nug;
        final boolean power;
        final VariogramFitOptions.Method method;
        final double[] h;
        final double[] g;
        final double[] w;
        final double gmax;
        final double hmax;
        final double cLo;
        final int budget;
        double fScale = 1;
        int evaluations;

        Problem(VariogramModel.Family fam, double nu, boolean nug, VariogramFitOptions.Method method, double[] h,
                double[] g, double[] w, double gmax, double hmax, double cLo, int budget) {
            this.fam = fam;
            this.nu = nu;
            this.nug = nug;
            this.power = fam == VariogramModel.Family.POWER;
            this.method = method;
            this.h = h;
            this.g = g;
            this.w = w;
            this.gmax = gmax;
            this.hmax = hmax;
            this.cLo = cLo;
            this.budget = budget;
        }

        void normaliseBy(double startValue) {
            fScale = startValue > 0 ? startValue : 1;
        }

        double[] toX(double s, double a, double c0) {
            double xa = power ? a : Math.log(a / hmax);
            return nug ? new double[] {Math.log(s / gmax), xa, c0 / gmax} : new double[] {Math.log(s / gmax), xa};
        }

        /** (s, a, c0). */
        double[] fromX(double[] x) {
            return new double[] {gmax * Math.exp(x[0]), power ? x[1] : hmax * Math.exp(x[1]),
                nug ? Math.max(0, x[2] * gmax) : 0};
        }

        double[][] bounds(double rlo, double rhi, double sHi) {
            return new double[][] {toX(cLo, rlo, 0), toX(sHi, rhi, 2 * gmax)};
        }

        /** Whether coordinate i is within 10⁻³ of its upper bound (0.1% for the logarithms). */
        boolean atUpper(double[] x, double[][] box, int i) {
            return x[i] >= box[1][i] - 1e-3;
        }

        /** The model at x, or null if its parameters are not valid. */
        VariogramModel model(double[] x) {
            double[] p = fromX(x);
            double c = power ? p[0] / Math.pow(hmax, p[1]) : p[0];
            if (!(c > 0) || Double.isInfinite(c) || !(p[1] > 0) || Double.isInfinite(p[1]) || (power && !(p[1] < 2))) {
                return null;
            }
            return build(fam, c, p[1], nu, p[2]);
        }

        double value(double[] x) {
            evaluations++;
            VariogramModel m = model(x);
            double v = m == null ? Double.NaN : criterion(m) / fScale;
            return v <= CAP ? v : CAP;
        }

        double criterion(VariogramModel m) {
            return m == null ? Double.NaN : VariogramFitting.criterion(m, h, g, w, method);
        }

        /** BOBYQA from start within box, with the compass search if it fails. */
        Run run(double[] start, double[][] box) {
            int np = start.length;
            double[] best = start.clone();
            double[] bestVal = {value(start)};
            ObjectiveFunction obj = new ObjectiveFunction(x -> {
                double v = value(x);
                if (v < bestVal[0]) {
                    bestVal[0] = v;
                    System.arraycopy(x, 0, best, 0, np);
                }
                return v;
            });
            double minWidth = Double.POSITIVE_INFINITY;
            for (int i = 0; i < np; i++) {
                minWidth = Math.min(minWidth, box[1][i] - box[0][i]);
            }
            double radius = Math.min(0.2, 0.49 * minWidth);
            boolean converged = true;
            String fallback = null;
            try {
                BOBYQAOptimizer opt = new BOBYQAOptimizer(2 * np + 1, radius, 1e-10);
                PointValuePair r = opt.optimize(new MaxEval(budget), obj, GoalType.MINIMIZE, new InitialGuess(start),
                        new SimpleBounds(box[0], box[1]));
                if (r.getValue() <= bestVal[0]) {
                    System.arraycopy(r.getPoint(), 0, best, 0, np);
                    bestVal[0] = r.getValue();
                }
            } catch (TooManyEvaluationsException e) {
                converged = false;
            } catch (MathIllegalStateException | MathIllegalArgumentException | MathArithmeticException e) {
                fallback = e.getClass().getSimpleName() + ": " + e.getMessage();
                converged = compass(best, bestVal, box);
            }
            return new Run(best, bestVal[0], converged, fallback);
        }

        /**
         * Compass search from x (value fx[0]) inside box, updating both; steps start at a tenth of
         * each coordinate's range (at most 0.5) and halve when no coordinate move improves, down to
         * 10⁻¹⁰. Returns whether it finished within the budget.
         */
        boolean compass(double[] x, double[] fx, double[][] box) {
            int np = x.length;
            double[] step = new double[np];
            for (int i = 0; i < np; i++) {
                step[i] = Math.min(0.5, 0.1 * (box[1][i] - box[0][i]));
            }
            double[] y = new double[np];
            int evals = 0;
            while (evals < budget) {
                boolean moved = false;
                boolean small = true;
                for (int i = 0; i < np && !moved; i++) {
                    if (step[i] > 1e-10) {
                        small = false;
                    }
                    for (int sign = -1; sign <= 1 && !moved; sign += 2) {
                        System.arraycopy(x, 0, y, 0, np);
                        y[i] = Math.min(box[1][i], Math.max(box[0][i], x[i] + sign * step[i]));
                        if (y[i] == x[i]) {
                            continue;
                        }
                        double v = value(y);
                        evals++;
                        if (v < fx[0]) {
                            System.arraycopy(y, 0, x, 0, np);
                            fx[0] = v;
                            moved = true;
                        }
                    }
                }
                if (small) {
                    return true;
                }
                if (!moved) {
                    for (int i = 0; i < np; i++) {
                        step[i] *= 0.5;
                    }
                }
            }
            return false;
        }

        /**
         * The best point of a profile over PROFILE_POINTS ranges (exponents for the power model)
         * evenly spaced on a log scale in [rlo, rhi]: for each, the partial sill and nugget solve the
         * weighted linear least-squares problem min Σ v_j (γ̂_j − c0 − c ρ(h_j))² within their bounds,
         * with v_j = 1 (ordinary) or |N(h_j)| / γ̂_j² (a linearisation of Cressie's criterion). Null if
         * no profile point has a finite criterion.
         */
        double[] profileStart(double rlo, double rhi, double cHi) {
            int nb = h.length;
            double[] v = new double[nb];
            for (int j = 0; j < nb; j++) {
                double gg = Math.max(g[j], 1e-3 * gmax);
                v[j] = method == VariogramFitOptions.Method.WEIGHTED_CRESSIE ? w[j] / (gg * gg) : 1;
            }
            double[] bestX = null;
            double bestVal = Double.POSITIVE_INFINITY;
            double[] phi = new double[nb];
            for (int t = 0; t < PROFILE_POINTS; t++) {
                double a = rlo * Math.pow(rhi / rlo, t / (PROFILE_POINTS - 1.0));
                VariogramModel unit = build(fam, 1, a, nu, 0);
                double s11 = 0, s12 = 0, s22 = 0, t1 = 0, t2 = 0;
                for (int j = 0; j < nb; j++) {
                    phi[j] = unit.gammaUnchecked(h[j]);
                    s11 += v[j];
                    s12 += v[j] * phi[j];
                    s22 += v[j] * phi[j] * phi[j];
                    t1 += v[j] * g[j];
                    t2 += v[j] * phi[j] * g[j];
                }
                if (!(s22 > 0)) {
                    continue;
                }
                double c = t2 / s22, c0 = 0;
                if (nug) {
                    double det = s11 * s22 - s12 * s12;
                    if (det > 1e-12 * s11 * s22) {
                        c0 = (s22 * t1 - s12 * t2) / det;
                        c = (s11 * t2 - s12 * t1) / det;
                    }
                    if (!(c0 >= 0)) {
                        c0 = 0;
                        c = t2 / s22;
                    } else if (c0 > 2 * gmax) {
                        c0 = 2 * gmax;
                        c = (t2 - c0 * s12) / s22;
                    }
                }
                if (power) {
                    c *= Math.pow(hmax, a); // the value at h_max
                }
                c = Math.min(cHi, Math.max(cLo, c));
                double[] x = toX(c, a, c0);
                double val = value(x);
                if (val < bestVal) {
                    bestVal = val;
                    bestX = x;
                }
            }
            return bestX;
        }
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
