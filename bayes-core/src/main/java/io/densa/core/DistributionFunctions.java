package io.densa.core;

import io.densa.core.internal.Sorted;

/**
 * pdf, log pdf, cdf, tail probabilities, quantiles, mean and variance of a density of a
 * {@link BayesSpace} from its {@link Shape}: panel masses summed from the left (cdf) or from the
 * right (tails), the partial panel by its rule or its adaptive leaves. Immutable; internal.
 */
final class DistributionFunctions {
    private final BayesSpace space;
    private final QuadratureGrid grid;
    private final PanelIntegration integration;
    private final double a;
    private final double b;
    private final Reference reference;
    private final Basis basis;
    private final int pts;
    private final double[] glx;
    private final double[] glw;
    private final double[] panelLo;
    private final double[] panelHi;

    DistributionFunctions(BayesSpace space, QuadratureGrid grid, PanelIntegration integration) {
        this.space = space;
        this.grid = grid;
        this.integration = integration;
        this.a = space.lower();
        this.b = space.upper();
        this.reference = space.reference();
        this.basis = space.basis();
        this.pts = grid.pts;
        this.glx = grid.glx;
        this.glw = grid.glw;
        this.panelLo = grid.panelLo;
        this.panelHi = grid.panelHi;
    }

    double clrRaw(Shape sh, double x, double[] scratch) {
        return basis.combine(x, sh.rawCoef, scratch) - sh.offset;
    }

    /**
     * Lebesgue pdf at x for a shape: 0 outside the domain.
     *
     * @throws IllegalArgumentException if x is NaN
     * @throws DensaException           if the value exceeds the largest double, or the shape is a
     *                                  point mass below the double resolution
     */
    double pdf(Shape sh, double x, double[] scratch) {
        x = space.wrap(x);
        if (!(x >= a && x <= b)) {
            if (Double.isNaN(x)) {
                throw new IllegalArgumentException("x is NaN; pdf accepts any other x (0 outside the domain ["
                        + a + ", " + b + "])");
            }
            return 0.0;
        }
        if (sh.isPointMass()) {
            throw PanelIntegration.concentrated(sh.atom);
        }
        double clr = clrRaw(sh, x, scratch);
        double v = space.referenceDensity(x) * Math.exp(sh.logRelative(clr));
        if (v == Double.POSITIVE_INFINITY) {
            double log = Math.log(space.referenceDensity(x)) + sh.logRelative(clr);
            if (!(log < MAX_LOG)) {
                throw new DensaException("the pdf at x = " + x + " is e^" + log
                        + ", beyond the largest double; logPdf(x) gives its logarithm",
                        new EvaluationDiagnostics("log pdf", x, log));
            }
            v = Math.exp(log);
        }
        return v;
    }

    /** log of the largest double. */
    private static final double MAX_LOG = Math.log(Double.MAX_VALUE);

    /**
     * Natural log of the Lebesgue pdf at x in [a, b].
     *
     * @throws IllegalArgumentException if x is outside the domain or NaN (the log pdf is −∞ there)
     * @throws DensaException           if the shape is a point mass below the double resolution
     */
    double logPdf(Shape sh, double x, double[] scratch) {
        x = space.wrap(x);
        if (!(x >= a && x <= b)) {
            throw new IllegalArgumentException("logPdf accepts x in the domain [" + a + ", " + b + "] only (the pdf is 0"
                    + " outside it, its log −∞), got x = " + x);
        }
        if (sh.isPointMass()) {
            throw PanelIntegration.concentrated(sh.atom);
        }
        double ref = space.referenceDensity(x);
        if (!(ref > 0)) {
            throw new IllegalArgumentException("logPdf at x = " + x + " is −∞: the reference " + reference
                    + " has weight 0 there (the pdf is 0); points where the reference weight is positive are accepted");
        }
        double v = Math.log(ref) + sh.logRelative(clrRaw(sh, x, scratch));
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException("logPdf at x = " + x + " is " + v + ": beyond the double range");
        }
        return v;
    }

    /** The pdf inside the domain, unchecked (may overflow to +∞; used as a Newton slope). */
    private double density(Shape sh, double x, double[] scratch) {
        return space.referenceDensity(x) * Math.exp(sh.logRelative(clrRaw(sh, x, scratch)));
    }

    /** ∫ pdf over [u, v] by the panel's rule mapped to [u, v]. */
    private double piece(Shape sh, double u, double v, double[] scratch) {
        if (!(v > u)) {
            return 0.0;
        }
        double h = 0.5 * (v - u), c = 0.5 * (u + v);
        double s = 0;
        for (int i = 0; i < pts; i++) {
            double y = c + h * glx[i];
            s += glw[i] * space.referenceDensity(y) * Math.exp(sh.logRelative(clrRaw(sh, y, scratch)));
        }
        return h * s;
    }

    /** ∫_{panelLo[j]}^{x} pdf (x in panel j), clamped to the panel mass. */
    double partial(Shape sh, int j, double x, double[] scratch) {
        double[] e = sh.leafEdges == null ? null : sh.leafEdges[j];
        double v;
        if (e == null) {
            v = piece(sh, panelLo[j], x, scratch);
        } else {
            int l = Sorted.lastAtMost(e, 0, e.length - 2, x);
            v = sh.leafCum[j][l] + Math.min(sh.leafCum[j][l + 1] - sh.leafCum[j][l], piece(sh, e[l], x, scratch));
        }
        return Math.min(sh.mass[j], v);
    }

    /** ∫_{x}^{panelHi[j]} pdf (x in panel j), clamped to the panel mass. */
    double upperPartial(Shape sh, int j, double x, double[] scratch) {
        double[] e = sh.leafEdges == null ? null : sh.leafEdges[j];
        double v;
        if (e == null) {
            v = piece(sh, x, panelHi[j], scratch);
        } else {
            int l = Sorted.lastAtMost(e, 0, e.length - 2, x);
            v = sh.leafTail[j][l + 1] + Math.min(sh.leafTail[j][l] - sh.leafTail[j][l + 1],
                    piece(sh, x, e[l + 1], scratch));
        }
        return Math.min(sh.mass[j], v);
    }

    /**
     * P(X ≤ x): panel masses to the left plus the partial panel; non-decreasing in x, 0 for
     * x ≤ a and 1 for x ≥ b.
     *
     * @throws IllegalArgumentException if x is NaN
     */
    double cdf(Shape sh, double x, double[] scratch) {
        checkCdfPoint(x);
        x = x == b ? x : space.wrap(x);
        if (x <= a) {
            return 0.0;
        }
        if (x >= b) {
            return 1.0;
        }
        if (sh.isPointMass()) {
            return x < sh.atom ? 0.0 : 1.0;
        }
        int j = grid.panelOf(x);
        double v = sh.cum[j] + partial(sh, j, x, scratch);
        return Math.min(1.0, Math.max(0.0, v));
    }

    /**
     * P(X &gt; t), summed from the right (panel masses to the right plus the partial panel) so
     * that small upper tails keep their relative accuracy.
     */
    double tail(Shape sh, double t, double[] scratch) {
        checkThreshold(t);
        t = t == b ? t : space.wrap(t);
        if (t <= a) {
            return 1.0;
        }
        if (t >= b) {
            return 0.0;
        }
        if (sh.isPointMass()) {
            return t < sh.atom ? 1.0 : 0.0;
        }
        int j = grid.panelOf(t);
        double v = sh.tail[j + 1] + upperPartial(sh, j, t, scratch);
        return Math.min(1.0, Math.max(0.0, v));
    }

    /**
     * The x with P(X ≤ x) = p. Lower halves solve cdf(x) = p from the left, upper halves solve
     * P(X &gt; x) = 1 − p from the right (1 − p is exact for p ≥ 1/2), so both tails keep relative
     * accuracy; within the panel, safeguarded Newton steps (bisection fallback) down to the double spacing at x.
     */
    double quantile(Shape sh, double p, double[] scratch) {
        checkProbability(p);
        if (p == 0) {
            return a;
        }
        if (p == 1) {
            return b;
        }
        if (sh.isPointMass()) {
            return sh.atom;
        }
        int np = panelLo.length;
        boolean upper = p > 0.5;
        int j;
        double need;
        if (!upper) {
            int lo = 0, hi = np - 1;
            while (lo < hi) { // last panel j with cum[j] < p
                int mid = (lo + hi + 1) >>> 1;
                if (sh.cum[mid] < p) {
                    lo = mid;
                } else {
                    hi = mid - 1;
                }
            }
            j = lo;
            need = Math.min(p - sh.cum[j], sh.mass[j]);
        } else {
            double r = 1 - p;
            int lo = 0, hi = np - 1;
            while (lo < hi) { // first panel j with tail[j + 1] < r
                int mid = (lo + hi) >>> 1;
                if (sh.tail[mid + 1] < r) {
                    hi = mid;
                } else {
                    lo = mid + 1;
                }
            }
            j = lo;
            need = Math.min(r - sh.tail[j + 1], sh.mass[j]);
        }
        double u = panelLo[j], v = panelHi[j];
        double massJ = sh.mass[j];
        double frac = massJ > 0 ? Math.min(1, Math.max(0, need / massJ)) : 0.5;
        double x = upper ? v - (v - u) * frac : u + (v - u) * frac;
        double left = u, right = v;
        // to the double spacing at x: a sharply peaked density needs x to full resolution
        for (int it = 0; it < 200; it++) {
            double tol = Math.ulp(Math.max(Math.abs(left), Math.abs(right)));
            // g increasing in x for both branches
            double g = upper ? need - upperPartial(sh, j, x, scratch) : partial(sh, j, x, scratch) - need;
            if (g > 0) {
                right = x;
            } else {
                left = x;
            }
            double d = density(sh, x, scratch);
            double nx = d > 0 && d < Double.POSITIVE_INFINITY ? x - g / d : Double.NaN;
            if (!(nx > left && nx < right)) {
                nx = 0.5 * (left + right);
            }
            if (Math.abs(nx - x) <= tol || right - left <= tol) {
                x = nx;
                break;
            }
            x = nx;
        }
        return Math.min(b, Math.max(a, x));
    }

    /** Mean ∫ x f(x) dx of a shape, from its clr values at the nodes (within [a, b]). */
    double mean(Shape sh, double[] clrNodes) {
        if (sh.isPointMass()) {
            return sh.atom;
        }
        return Math.min(b, Math.max(a, integration.moment(sh, clrNodes, 1, 0.0)));
    }

    /**
     * The first trigonometric moment (∫ cos θ f dx, ∫ sin θ f dx) with θ = 2π(x − a)/(b − a) (Mardia &amp;
     * Jupp (2000), Directional Statistics, Wiley, 3.4.1), by the panels' rules or adaptive leaves.
     */
    double[] trigMoments(Shape sh, double[] clrNodes) {
        if (sh.isPointMass()) {
            double t = 2 * Math.PI * (sh.atom - a) / (b - a);
            return new double[] {Math.cos(t), Math.sin(t)};
        }
        return new double[] {integration.moment(sh, clrNodes, 3, a), integration.moment(sh, clrNodes, 4, a)};
    }

    /** Variance ∫ (x − mean)² f(x) dx (≥ 0). */
    double variance(Shape sh, double[] clrNodes) {
        if (sh.isPointMass()) {
            return 0.0;
        }
        return Math.max(0.0, integration.moment(sh, clrNodes, 2, mean(sh, clrNodes)));
    }


    /** Requires a cdf evaluation point that is not NaN (any other x is accepted). */
    void checkCdfPoint(double x) {
        if (Double.isNaN(x)) {
            throw new IllegalArgumentException("x is NaN; cdf accepts any other x, including points outside the"
                    + " domain [" + a + ", " + b + "] (0 below it, 1 above)");
        }
    }

    /** Requires a tail-probability threshold that is not NaN (any other t is accepted). */
    void checkThreshold(double t) {
        if (Double.isNaN(t)) {
            throw new IllegalArgumentException("threshold is NaN; tail probabilities accept any other threshold,"
                    + " including points outside the domain [" + a + ", " + b + "] (1 below it, 0 above)");
        }
    }

    /**
     * Requires a probability in [0, 1] (quantile(0) = a, quantile(1) = b).
     *
     * @throws IllegalArgumentException otherwise, NaN included
     */
    void checkProbability(double p) {
        if (!(p >= 0 && p <= 1)) {
            throw new IllegalArgumentException("probability must be in [0, 1] (0 gives the domain's lower end " + a
                    + ", 1 its upper end " + b + "), got " + p);
        }
    }

    /**
     * Derived quantities of one density needed to evaluate it: log normaliser, panel masses with
     * their prefix and suffix sums, which panels need adaptive quadrature, raw-function
     * coefficients. Built once by {@link BayesSpace} and not modified afterwards; internal.
     */
    static final class Shape {
        /**
         * log ∫ exp(clr) dP = shift + logTotal, kept as two terms: the shift is the largest clr value
         * (possibly huge), logTotal = log ∫ exp(clr − shift) dP a moderate number; evaluating
         * exp((clr − shift) − logTotal) keeps logTotal even when the shift is so large that
         * shift + logTotal would round it away.
         */
        final double shift;
        final double logTotal;
        /** Probability of each quadrature panel. */
        final double[] mass;
        /** cum[j] = Σ_{i &lt; j} mass[i] (length panels + 1). */
        final double[] cum;
        /** tail[j] = Σ_{i ≥ j} mass[i] (length panels + 1). */
        final double[] tail;
        /**
         * Per panel, the edges of its adaptive leaves (null for a panel integrated by its plain rule;
         * the whole array null when no panel is sharp), with prefix and suffix sums of leaf masses.
         */
        final double[][] leafEdges;
        final double[][] leafCum;
        final double[][] leafTail;
        /** Raw-function coefficients: clr(x) = φ(x)·rawCoef − offset. */
        final double[] rawCoef;
        final double offset;
        /**
         * NaN, or the point where a density concentrated below the double resolution puts its whole
         * mass (logTotal is then NaN: the pdf is not representable).
         */
        final double atom;

        Shape(double shift, double logTotal, double[] mass, double[] cum, double[] tail, double[][] leafEdges, double[][] leafCum,
                double[][] leafTail, double[] rawCoef, double offset, double atom) {
            this.shift = shift;
            this.logTotal = logTotal;
            this.mass = mass;
            this.cum = cum;
            this.tail = tail;
            this.leafEdges = leafEdges;
            this.leafCum = leafCum;
            this.leafTail = leafTail;
            this.rawCoef = rawCoef;
            this.offset = offset;
            this.atom = atom;
        }

        /** log ∫ exp(clr) dP (rounded: see {@link #shift}). */
        double logZ() {
            return shift + logTotal;
        }

        /** log pdf relative to the reference: clr − log ∫ exp(clr) dP, in the accurate order. */
        double logRelative(double clr) {
            return (clr - shift) - logTotal;
        }

        boolean isPointMass() {
            return !Double.isNaN(atom);
        }
    }
}
