package io.densa.spatial.spacetime;

import io.densa.core.DensaException;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramModel;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.apache.commons.math3.exception.MathArithmeticException;
import org.apache.commons.math3.exception.MathIllegalArgumentException;
import org.apache.commons.math3.exception.MathIllegalStateException;
import org.apache.commons.math3.optim.InitialGuess;
import org.apache.commons.math3.optim.MaxEval;
import org.apache.commons.math3.optim.SimpleBounds;
import org.apache.commons.math3.optim.nonlinear.scalar.GoalType;
import org.apache.commons.math3.optim.nonlinear.scalar.ObjectiveFunction;
import org.apache.commons.math3.optim.nonlinear.scalar.noderiv.BOBYQAOptimizer;

/**
 * Least-squares fitting of a {@link SpaceTimeModel} to a {@link SpaceTimeVariogram}: Cressie's
 * weighted least squares, minimising Σ_b N_b [γ̂_b / γ(h_b, u_b; θ) − 1]² over the non-empty lag
 * classes b at their mean lags (Cressie (1985), Fitting variogram models by weighted least
 * squares, Math. Geol. 17(5) — the weights N/γ² of the spatial fit, applied per space–time class),
 * or ordinary least squares Σ_b [γ̂_b − γ_b]². The optimiser is Powell's BOBYQA (Commons Math;
 * Powell (2009), The BOBYQA algorithm for bound constrained optimization without derivatives,
 * DAMTP 2009/NA06 — from memory), run from five starting pairs of ranges (the centre and the
 * corners of [0.2, 1] × the largest mean lags); the best end point is kept. If BOBYQA fails, a compass search (Kolda, Lewis &amp; Torczon (2003), Optimization by direct
 * search, SIAM Rev. 45(3) — from memory) finishes from the best point evaluated and the fit says
 * so.
 *
 * <p>Parameters (each fitted with the space–time nugget c0):
 * <ul>
 * <li>separable: the spatial partial sill, spatial range, temporal range;</li>
 * <li>product-sum: the spatial sill, spatial range, temporal sill, temporal range and
 *     k / k_max ∈ [10⁻³, 1] with k_max = 1 / max(sill_s, sill_t), so that every point of the box is
 *     a valid model;</li>
 * <li>Gneiting: σ², the spatial and temporal practical ranges and β ∈ [0, 1] (shapes fixed by the
 *     options).</li>
 * </ul>
 * With {@link SpaceTimeFitOptions#withSpatialNugget} the separable and product-sum fits add the
 * spatial margin's nugget n_s ∈ [0, 2 max γ̂] (named "spatial nugget"; in the product-sum model
 * k_max uses the spatial sill including it). The optimiser works on ln(sill / max γ̂), ln(range / largest mean lag) on that axis, c0 / max γ̂
 * and the unit-free β and k / k_max. Bounds: sills in [10⁻⁶, 10] max γ̂, ranges in [10⁻³, 10] ×
 * the largest mean lag of the axis, nugget in [0, 2 max γ̂]. Parameters that end on a bound are
 * named in {@link SpaceTimeFit#atBound()}.
 *
 * <p>Stateless and thread-safe.
 */
public final class SpaceTimeFitting {
    private static final double RANGE_LO = 1e-3;
    private static final double RANGE_HI = 10;
    private static final double SILL_LO = 1e-6;
    private static final double SILL_HI = 10;
    /** Starting ranges as fractions of the largest mean spatial and temporal lags. */
    private static final double[][] STARTS = {{0.5, 0.5}, {0.2, 0.2}, {0.2, 1}, {1, 0.2}, {1, 1}};

    private SpaceTimeFitting() {
    }

    /**
     * Fits a model of the given family.
     *
     * @throws IllegalArgumentException if fewer classes than parameters + 1 are non-empty, no pair
     *                                  lies at distinct locations or at distinct times, or γ̂ is 0
     *                                  in every class
     * @throws DensaException           if the criterion is not finite at any starting point
     */
    public static SpaceTimeFit fit(SpaceTimeVariogram empirical, SpaceTimeModel.Kind kind,
            SpaceTimeFitOptions options) {
        Objects.requireNonNull(empirical, "empirical");
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(options, "options");
        double[][] rows = empirical.rows();
        double gmax = empirical.maxSemivariance();
        double hmax = 0, umax = 0, gmin = Double.POSITIVE_INFINITY;
        for (double[] r : rows) {
            hmax = Math.max(hmax, r[0]);
            umax = Math.max(umax, r[1]);
            gmin = Math.min(gmin, r[2]);
        }
        Problem p = new Problem(kind, options, rows, gmax, hmax, umax);
        if (rows.length < p.names.length + 1) {
            throw new IllegalArgumentException("fitting " + p.names.length + " parameters of the " + kind + " model"
                    + " needs at least " + (p.names.length + 1) + " non-empty lag classes, got " + rows.length
                    + "; use more or wider lag classes");
        }
        if (!(gmax > 0)) {
            throw new IllegalArgumentException("the empirical space-time variogram is zero in every class; nothing"
                    + " to fit");
        }
        if (!(hmax > 0) || !(umax > 0)) {
            throw new IllegalArgumentException("the lag classes hold no pair " + (hmax > 0 ? "at distinct times"
                    : "at distinct locations") + "; a space-time model needs both spatial and temporal lags");
        }
        double nug0 = 0.5 * gmin;
        double sill0 = Math.max(0.9 * gmax - nug0, 0.1 * gmax);
        Run best = null;
        for (double[] f : STARTS) {
            double[] x = p.start(sill0, f[0] * hmax, f[1] * umax, nug0);
            Run r = p.run(x, options.maxEvaluations());
            if (r != null && (best == null || r.value < best.value)) {
                best = r;
            }
        }
        if (best == null) {
            throw new DensaException("the space-time fit criterion is not finite at any starting point",
                    new SpaceTimeDiagnostics("space-time fit criterion", -1, Double.NaN));
        }
        SpaceTimeModel m = p.model(best.x);
        double crit = p.criterion(best.x);
        double sse = 0;
        for (double[] r : rows) {
            double d = r[2] - m.gamma(r[0], r[1]);
            sse += d * d;
        }
        List<String> at = new ArrayList<>();
        for (int i = 0; i < best.x.length; i++) {
            double w = p.hi[i] - p.lo[i];
            if (best.x[i] <= p.lo[i] + 1e-6 * w || best.x[i] >= p.hi[i] - 1e-6 * w) {
                at.add(p.names[i]);
            }
        }
        return new SpaceTimeFit(m, options.method(), crit, Math.sqrt(sse / rows.length), rows.length,
                List.of(p.names), p.parameters(best.x), at, best.fallback, p.evaluations);
    }

    /** An optimiser end point. */
    private record Run(double[] x, double value, boolean fallback) {
    }

    /** The criterion in optimiser coordinates. */
    private static final class Problem {
        final SpaceTimeModel.Kind kind;
        final SpaceTimeFitOptions opt;
        final double[][] rows;
        final double g;
        final double h;
        final double u;
        final String[] names;
        final double[] lo;
        final double[] hi;
        /** Whether the last parameter is the spatial margin's nugget (separable and product-sum only). */
        final boolean spatialNugget;
        double[] bestX;
        double bestValue;
        int evaluations;

        Problem(SpaceTimeModel.Kind kind, SpaceTimeFitOptions opt, double[][] rows, double g, double h, double u) {
            this.kind = kind;
            this.opt = opt;
            this.rows = rows;
            this.g = g;
            this.h = h;
            this.u = u;
            double ls0 = Math.log(SILL_LO), ls1 = Math.log(SILL_HI), lr0 = Math.log(RANGE_LO), lr1 = Math.log(RANGE_HI);
            String[] named;
            double[] low;
            double[] high;
            switch (kind) {
                case SEPARABLE:
                    named = new String[] {"partial sill", "spatial range", "temporal range", "nugget"};
                    low = new double[] {ls0, lr0, lr0, 0};
                    high = new double[] {ls1, lr1, lr1, 2};
                    break;
                case PRODUCT_SUM:
                    named = new String[] {"spatial sill", "spatial range", "temporal sill", "temporal range",
                        "k fraction", "nugget"};
                    low = new double[] {ls0, lr0, ls0, lr0, 1e-3, 0};
                    high = new double[] {ls1, lr1, ls1, lr1, 1, 2};
                    break;
                default:
                    named = new String[] {"sill", "spatial range", "temporal range", "beta", "nugget"};
                    low = new double[] {ls0, lr0, lr0, 0, 0};
                    high = new double[] {ls1, lr1, lr1, 1, 2};
            }
            spatialNugget = opt.spatialNugget() && kind != SpaceTimeModel.Kind.GNEITING;
            // the spatial margin's nugget, when fitted, is the last parameter, in [0, 2] max γ̂
            names = spatialNugget ? append(named, "spatial nugget") : named;
            lo = spatialNugget ? append(low, 0) : low;
            hi = spatialNugget ? append(high, 2) : high;
        }

        private static String[] append(String[] a, String v) {
            String[] out = java.util.Arrays.copyOf(a, a.length + 1);
            out[a.length] = v;
            return out;
        }

        private static double[] append(double[] a, double v) {
            double[] out = java.util.Arrays.copyOf(a, a.length + 1);
            out[a.length] = v;
            return out;
        }

        double[] start(double sill, double rs, double rt, double nug) {
            double[] x;
            switch (kind) {
                case SEPARABLE:
                    x = new double[] {Math.log(sill / g), Math.log(rs / h), Math.log(rt / u), nug / g};
                    break;
                case PRODUCT_SUM: {
                    double half = Math.log(0.6 * sill / g);
                    x = new double[] {half, Math.log(rs / h), half, Math.log(rt / u), 0.5, nug / g};
                    break;
                }
                default:
                    x = new double[] {Math.log(sill / g), Math.log(rs / h), Math.log(rt / u), 0.5, nug / g};
            }
            if (spatialNugget) {
                // the starting nugget split evenly between the space–time and the spatial nugget
                x[x.length - 1] = 0.5 * nug / g;
                x = append(x, 0.5 * nug / g);
            }
            for (int i = 0; i < x.length; i++) {
                x[i] = Math.min(hi[i], Math.max(lo[i], x[i]));
            }
            return x;
        }

        /** The parameters in model units. */
        double[] parameters(double[] x) {
            double[] q = structured(x);
            return spatialNugget ? append(q, g * x[x.length - 1]) : q;
        }

        /** The parameters of the family itself (without the spatial nugget). */
        private double[] structured(double[] x) {
            switch (kind) {
                case SEPARABLE:
                    return new double[] {g * Math.exp(x[0]), h * Math.exp(x[1]), u * Math.exp(x[2]), g * x[3]};
                case PRODUCT_SUM:
                    return new double[] {g * Math.exp(x[0]), h * Math.exp(x[1]), g * Math.exp(x[2]),
                        u * Math.exp(x[3]), x[4], g * x[5]};
                default:
                    return new double[] {g * Math.exp(x[0]), h * Math.exp(x[1]), u * Math.exp(x[2]), x[3], g * x[4]};
            }
        }

        SpaceTimeModel model(double[] x) {
            double[] q = structured(x);
            double ns = spatialNugget ? g * x[x.length - 1] : 0;
            switch (kind) {
                case SEPARABLE:
                    return SpaceTimeModel.separable(marginal(opt.spatialFamily(), q[0], q[1], opt.spatialSmoothness())
                            .withNugget(ns), marginal(opt.temporalFamily(), 1, q[2], opt.temporalSmoothness()), q[3]);
                case PRODUCT_SUM: {
                    double k = q[4] * SpaceTimeModel.maxProductSumK(q[0] + ns, q[2]);
                    return SpaceTimeModel.productSum(marginal(opt.spatialFamily(), q[0], q[1], opt.spatialSmoothness())
                            .withNugget(ns), marginal(opt.temporalFamily(), q[2], q[3], opt.temporalSmoothness()), k,
                            q[5]);
                }
                default:
                    return SpaceTimeModel.gneiting(q[0], q[1], q[2], q[3], opt.spatialShape(), opt.temporalShape(),
                            q[4]);
            }
        }

        private static VariogramModel marginal(VariogramModel.Family f, double c, double a, double nu) {
            switch (f) {
                case SPHERICAL: return VariogramModel.spherical(c, a);
                case GAUSSIAN: return VariogramModel.gaussian(c, a);
                case MATERN: return VariogramModel.matern(c, a, nu);
                default: return VariogramModel.exponential(c, a);
            }
        }

        double criterion(double[] x) {
            SpaceTimeModel m;
            try {
                m = model(x);
            } catch (IllegalArgumentException e) {
                return Double.MAX_VALUE; // a point whose parameters under- or overflow
            }
            boolean wls = opt.method() == VariogramFitOptions.Method.WEIGHTED_CRESSIE;
            double s = 0;
            for (double[] r : rows) {
                double gm = m.gamma(r[0], r[1]);
                double d = wls ? r[2] / gm - 1 : (r[2] - gm) / g;
                s += wls ? r[3] * d * d : d * d;
            }
            double v = wls ? s : s * g * g;
            return v < Double.MAX_VALUE ? v : Double.MAX_VALUE;
        }

        private double tracked(double[] x) {
            evaluations++;
            double v = criterion(x);
            if (v < bestValue) {
                bestValue = v;
                bestX = x.clone();
            }
            return v;
        }

        Run run(double[] x0, int maxEval) {
            bestX = x0.clone();
            bestValue = criterion(x0);
            if (!(bestValue < Double.MAX_VALUE)) {
                return null;
            }
            double scale = bestValue > 0 ? bestValue : 1;
            try {
                BOBYQAOptimizer o = new BOBYQAOptimizer(2 * x0.length + 1, 0.1, 1e-6);
                double[] x = o.optimize(new MaxEval(maxEval), new ObjectiveFunction(z -> tracked(z) / scale),
                        GoalType.MINIMIZE, new InitialGuess(x0), new SimpleBounds(lo, hi)).getPoint();
                double v = criterion(x);
                return v <= bestValue ? new Run(x, v, false) : new Run(bestX, bestValue, false);
            } catch (MathIllegalStateException | MathIllegalArgumentException | MathArithmeticException e) {
                double[] x = compass(bestX, maxEval);
                return new Run(x, criterion(x), true);
            }
        }

        /** Coordinate-wise pattern search with halving steps, inside the box. */
        private double[] compass(double[] x0, int maxEval) {
            double[] x = x0.clone();
            double fx = criterion(x);
            double step = 0.25;
            int evals = 0;
            while (step > 1e-6 && evals < maxEval) {
                boolean moved = false;
                for (int i = 0; i < x.length && evals < maxEval; i++) {
                    for (int sgn = -1; sgn <= 1; sgn += 2) {
                        double[] y = x.clone();
                        y[i] = Math.min(hi[i], Math.max(lo[i], x[i] + sgn * step * (hi[i] - lo[i])));
                        double fy = criterion(y);
                        evals++;
                        if (fy < fx) {
                            x = y;
                            fx = fy;
                            moved = true;
                            break;
                        }
                    }
                }
                if (!moved) {
                    step /= 2;
                }
            }
            return x;
        }
    }
}
