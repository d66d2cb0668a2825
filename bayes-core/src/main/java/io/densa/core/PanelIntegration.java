package io.densa.core;

import java.util.Arrays;
import io.densa.core.DistributionFunctions.Shape;

/**
 * The non-linear integrals of a {@link BayesSpace}: the normaliser and panel masses of a density
 * ({@link Shape}) by log-sum-exp over the quadrature panels, sharp panels refined adaptively
 * ({@link AdaptiveIntegrand}) after a search for the clr's peak, and the moments. Immutable;
 * internal.
 */
final class PanelIntegration {
    /**
     * A panel is integrated adaptively when the clr varies by more than this across its nodes: the
     * panel's Gauss–Legendre rule is then no longer accurate to rounding for exp(clr) (an
     * 8-point rule loses about 1e-14 relative accuracy at a log-range of 4, 1e-11 at 6).
     */
    private static final double SHARP_RANGE = 3.0;
    /** A refined panel's own relative error bound (keeps tail probabilities relatively accurate). */
    private static final double PANEL_REL = 1e-11;
    /** A refined panel's error bound relative to the whole normaliser. */
    private static final double TOTAL_REL = 1e-14;
    /** Up to this node range a panel is split into equal sub-panels of range about SUB_RANGE. */
    private static final double FIXED_RANGE = 40.0;
    private static final double SUB_RANGE = 2.5;
    /** Panels whose largest node value is below exp(−60) of the largest overall are not refined (tails down to ~1e-16 keep ~1e-10 relative accuracy). */
    private static final double NEGLIGIBLE = -60.0;
    /** Depth limit of the peak search (a panel halved 60 times is below the double spacing). */
    private static final int PEAK_DEPTH = 60;

    private final BayesSpace space;
    private final QuadratureGrid grid;
    private final OrthonormalBasis ob;
    private final Basis basis;
    private final int dim;
    private final int pts;
    private final double overshoot;
    private final double[] glx;
    private final double[] panelLo;
    private final double[] panelHi;
    private final double[] nodes;
    private final double[] weights;
    private final double[] logRefNodes;
    private final boolean flatReference;
    private final int localWidth;

    PanelIntegration(BayesSpace space, QuadratureGrid grid, OrthonormalBasis ob, Basis basis) {
        this.space = space;
        this.grid = grid;
        this.ob = ob;
        this.basis = basis;
        this.dim = basis.size();
        this.pts = grid.pts;
        this.overshoot = grid.overshoot;
        this.glx = grid.glx;
        this.panelLo = grid.panelLo;
        this.panelHi = grid.panelHi;
        this.nodes = grid.nodes;
        this.weights = grid.weights;
        this.logRefNodes = grid.logRefNodes;
        this.flatReference = grid.flatReference;
        this.localWidth = ob.localWidth;
    }

    /** Computes the shape (normaliser, panel masses) of coordinates c[off..off+K). */
    Shape shape(double[] c, int off, double[] clrNodes) {
        int q = nodes.length;
        if (clrNodes == null) {
            clrNodes = new double[q];
            ob.clrAtNodes(c, off, clrNodes);
        }
        double[] bc = new double[dim];
        double offset = ob.rawCoefficients(c, off, bc);
        int np = panelLo.length;
        double[] sums = new double[np];
        double[][] leaves = new double[np][];
        double[] peak = new double[1];
        double shift = panelSums(clrNodes, 0, bc, offset, sums, leaves, peak);
        double total = 0;
        boolean anySharp = false;
        for (int j = 0; j < np; j++) {
            total += sums[j];
            anySharp |= leaves[j] != null;
        }
        if (!(total > 0)) {
            return pointMass(peak[0], bc, offset);
        }
        double logTotal = Math.log(total);
        double[] mass = new double[np];
        double[] cum = new double[np + 1];
        double[] tail = new double[np + 1];
        for (int j = 0; j < np; j++) {
            mass[j] = sums[j] / total;
            cum[j + 1] = cum[j] + mass[j];
        }
        for (int j = np - 1; j >= 0; j--) {
            tail[j] = tail[j + 1] + mass[j];
        }
        double[][] leafEdges = null, leafCum = null, leafTail = null;
        if (anySharp) {
            leafEdges = new double[np][];
            leafCum = new double[np][];
            leafTail = new double[np][];
            for (int j = 0; j < np; j++) {
                double[] lv = leaves[j];
                if (lv == null) {
                    continue;
                }
                int nl = lv.length / 2; // pairs (lo, unnormalised mass), in order
                double[] e = new double[nl + 1];
                double[] cu = new double[nl + 1];
                double[] ta = new double[nl + 1];
                for (int l = 0; l < nl; l++) {
                    e[l] = lv[2 * l];
                    cu[l + 1] = cu[l] + lv[2 * l + 1] / total;
                }
                e[nl] = panelHi[j];
                for (int l = nl - 1; l >= 0; l--) {
                    ta[l] = ta[l + 1] + lv[2 * l + 1] / total;
                }
                leafEdges[j] = e;
                leafCum[j] = cu;
                leafTail[j] = ta;
            }
        }
        // the mean is not computed here: it costs a second exp pass and most callers (cdf, tail,
        // quantile, pdf) do not need it; see mean(Shape, double[])
        return new Shape(shift, logTotal, mass, cum, tail, leafEdges, leafCum, leafTail, bc, offset, Double.NaN);
    }

    /**
     * The shape of a density whose whole mass lies within the resolution of the adaptive rule
     * (about 1e-17 of a panel) around x: every evaluated point but those next to x underflows.
     * Probabilities, quantiles and moments treat it as a point mass at x; its pdf is not
     * representable (see {@link DistributionFunctions#pdf(Shape, double, double[])}).
     */
    private Shape pointMass(double x, double[] bc, double offset) {
        int np = panelLo.length;
        int j = grid.panelOf(x);
        double[] mass = new double[np];
        double[] cum = new double[np + 1];
        double[] tail = new double[np + 1];
        mass[j] = 1.0;
        for (int i = 0; i < np; i++) {
            cum[i + 1] = cum[i] + mass[i];
        }
        for (int i = np - 1; i >= 0; i--) {
            tail[i] = tail[i + 1] + mass[i];
        }
        return new Shape(Double.NaN, Double.NaN, mass, cum, tail, null, null, null, bc, offset, x);
    }

    /**
     * Panel integrals exp(−shift) ∫_panel exp(clr) dP into sums, refining sharp panels adaptively
     * (their leaf intervals and masses go to leaves[j] as (lo, mass) pairs when leaves is not
     * null); returns the shift and writes the point of the largest clr value found to peakAt[0]
     * (when peakAt is not null).
     *
     * <p>The shift is the largest clr value at the nodes when no panel is sharp. Otherwise a sharp
     * clr may peak between the nodes far above that value (at a domain end, a knot, or inside a
     * panel), so that exp would overflow: the shift is then the clr's maximum over the sharp panels
     * to within 1, found by {@link #peakSearch} (log-sum-exp with a guaranteed shift: no term of the
     * sums exceeds e times its weight).
     *
     * @throws DensaException if the clr cannot be evaluated accurately enough (see
     *                        {@link #requireResolvable})
     */
    private double panelSums(double[] clrNodes, int off, double[] bc, double offset, double[] sums,
            double[][] leaves, double[] peakAt) {
        requireResolvable(bc, offset);
        int q = nodes.length;
        double max = Double.NEGATIVE_INFINITY;
        int maxAt = 0;
        for (int i = 0; i < q; i++) {
            double v = clrNodes[off + i];
            if (v > max) { // values are finite: plain comparisons are cheaper than Math.max
                max = v;
                maxAt = i;
            }
        }
        if (peakAt != null) {
            peakAt[0] = nodes[maxAt];
        }
        int np = panelLo.length;
        double total = 0;
        boolean any = false;
        for (int j = 0; j < np; j++) {
            double s = 0;
            for (int i = j * pts; i < (j + 1) * pts; i++) {
                s += weights[i] * Math.exp(clrNodes[off + i] - max);
            }
            sums[j] = s;
            total += s;
            any |= logRange(clrNodes, off, j) > SHARP_RANGE;
        }
        if (!any) {
            return max;
        }
        // A sharp clr may peak between the nodes (at a domain end, a knot, or inside a panel) far
        // above their largest value, and exp would overflow: find its maximum over the sharp panels
        // to within 1 first (branch and bound on the Lebesgue bound), and shift by that.
        double[] scratch = new double[basis.scratchSize()];
        double[] best = {max, nodes[maxAt]};
        for (int j = 0; j < np; j++) {
            double range = logRange(clrNodes, off, j);
            if (range > SHARP_RANGE) {
                double top = Double.NEGATIVE_INFINITY;
                for (int i = j * pts; i < (j + 1) * pts; i++) {
                    top = Math.max(top, clrNodes[off + i]);
                }
                if (top + overshoot * range > best[0] + 1) {
                    peakSearch(panelLo[j], panelHi[j], bc, offset, scratch, best, PEAK_DEPTH);
                }
            }
        }
        double shift = best[0];
        if (peakAt != null) {
            peakAt[0] = best[1];
        }
        if (shift > max) {
            double scale = Math.exp(max - shift);
            total = 0;
            for (int j = 0; j < np; j++) {
                sums[j] *= scale;
                total += sums[j];
            }
        }
        AdaptiveIntegrand g = new AdaptiveIntegrand(space, grid, basis, bc, offset, shift, 0.0, 0, 0.0);
        for (int j = 0; j < np; j++) {
            double top = Double.NEGATIVE_INFINITY;
            for (int i = j * pts; i < (j + 1) * pts; i++) {
                top = Math.max(top, clrNodes[off + i]);
            }
            double range = logRange(clrNodes, off, j);
            // the clr is a polynomial of degree < pts on the panel: it exceeds its largest node
            // value by at most (Λ − 1)·range/2 (Λ the Lebesgue constant of the nodes)
            if (!(range > SHARP_RANGE && top + overshoot * range - shift > NEGLIGIBLE)) {
                continue;
            }
            // estimated relative error of the panel's rule: matters on its own (tails keep relative
            // accuracy) and as a share of the total (the normaliser)
            double err = ruleError(range);
            if (!(err > PANEL_REL || err * sums[j] > TOTAL_REL * total)) {
                continue;
            }
            g.startLeaves(leaves != null);
            sums[j] = range <= FIXED_RANGE ? g.subdivide(panelLo[j], panelHi[j], (int) Math.ceil(range / SUB_RANGE))
                    : g.integrate(panelLo[j], panelHi[j]);
            if (leaves != null) {
                leaves[j] = g.leaves();
            }
        }
        return shift;
    }

    /**
     * Raises best[0] to the largest clr value on [u, v] (inside one panel) to within 1, with its
     * point in best[1]: the clr at the panel rule's nodes mapped to [u, v] gives its largest node
     * value and, through the Lebesgue constant, a bound on the whole interval; an interval whose
     * bound is within 1 of the best value found is done, others are halved (the half with the
     * larger node values first, so that the best value rises early and prunes the other).
     */
    private void peakSearch(double u, double v, double[] bc, double offset, double[] scratch, double[] best,
            int depth) {
        double h = 0.5 * (v - u), c = 0.5 * (u + v);
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY, at = c;
        for (int i = 0; i < pts; i++) {
            double x = c + h * glx[i];
            double y = basis.combine(x, bc, scratch) - offset;
            lo = Math.min(lo, y);
            if (y > hi) {
                hi = y;
                at = x;
            }
        }
        if (hi > best[0]) {
            best[0] = hi;
            best[1] = at;
        }
        if (depth == 0 || !(hi + overshoot * (hi - lo) > best[0] + 1) || !(v - u > Math.ulp(c))) {
            return;
        }
        if (at < c) {
            peakSearch(u, c, bc, offset, scratch, best, depth - 1);
            peakSearch(c, v, bc, offset, scratch, best, depth - 1);
        } else {
            peakSearch(c, v, bc, offset, scratch, best, depth - 1);
            peakSearch(u, c, bc, offset, scratch, best, depth - 1);
        }
    }

    /**
     * Variation of the integrand's log across panel j's nodes: the larger of the clr's range and
     * the range of clr + log(reference weight) (either factor alone can make the rule inexact,
     * and their slopes may cancel in the sum).
     */
    private double logRange(double[] clrNodes, int off, int j) {
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        double lw = Double.POSITIVE_INFINITY, hw = Double.NEGATIVE_INFINITY;
        for (int i = j * pts; i < (j + 1) * pts; i++) {
            double v = clrNodes[off + i];
            if (v < lo) {
                lo = v;
            }
            if (v > hi) {
                hi = v;
            }
            if (!flatReference) {
                double w = v + logRefNodes[i];
                lw = Math.min(lw, w);
                hw = Math.max(hw, w);
            }
        }
        if (flatReference) {
            return hi - lo;
        }
        return Math.max(hi - lo, hw - lw);
    }

    /**
     * Relative error of an 8-point Gauss–Legendre rule for exp of a function that varies by
     * {@code range} across the rule's nodes, fitted (with margin) to exact integrals of
     * exp(linear): 10^−22.1 (1.05 range)^14.4, e.g. 4e-14 at 4, 2e-11 at 6, 1e-9 at 8.
     */
    private static double ruleError(double range) {
        return Math.pow(10, -22.1) * Math.pow(1.05 * range, 14.4);
    }

    /**
     * log ∫ exp(clr) dP from clr values at the nodes (and the coordinates, for sharp panels), by
     * log-sum-exp, as three numbers written to out[outOff..outOff+3): the shift (largest clr value),
     * log ∫ exp(clr − shift) dP (NaN for a density concentrated below the double resolution), and
     * the point of the largest clr value.
     */
    void logNormaliser(double[] clrNodes, int off, double[] c, int coff, double[] out, int outOff) {
        double[] bc = new double[dim];
        double offset = ob.rawCoefficients(c, coff, bc);
        double[] sums = new double[panelLo.length];
        double[] peak = new double[1];
        double shift = panelSums(clrNodes, off, bc, offset, sums, null, peak);
        double total = 0;
        for (double s : sums) {
            total += s;
        }
        out[outOff] = shift;
        // NaN marks a density concentrated below the double resolution (see concentrated)
        out[outOff + 1] = total > 0 ? Math.log(total) : Double.NaN;
        out[outOff + 2] = peak[0];
    }

    /**
     * Largest rounding error of a clr value accepted for pdf, cdf, quantile and moment
     * evaluation (the pdf is then known to about 1 %).
     */
    static final double MAX_CLR_ERROR = 0.01;

    /**
     * Requires that the clr of raw coefficients bc (and offset) can be evaluated to within
     * {@link #MAX_CLR_ERROR}: its rounding error is at most 8ε (w max_j |b_j| + |offset|), w the
     * number of raw functions that overlap at a point (B-splines and steps are at most 1 and sum
     * to at most 1, Legendre polynomials are at most 1 in absolute value on the domain).
     *
     * @throws DensaException if it cannot
     */
    private void requireResolvable(double[] bc, double offset) {
        double big = 0;
        for (int j = 0; j < dim; j++) {
            big = Math.max(big, Math.abs(bc[j]));
        }
        double error = AdaptiveIntegrand.NOISE * (localWidth * big + Math.abs(offset));
        if (!(error <= MAX_CLR_ERROR)) {
            throw new DensaException("the density's clr reaches about " + String.format("%.3g", localWidth * big
                    + Math.abs(offset)) + " in magnitude, so its rounding error in double precision is about "
                    + String.format("%.3g", error) + ", above the " + MAX_CLR_ERROR + " that pdf, cdf, quantile and"
                    + " moment evaluation accept: coordinates about " + String.format("%.3g", error / MAX_CLR_ERROR)
                    + " times smaller would be evaluated (algebra, norms and distances work at any size)",
                    new EvaluationDiagnostics("clr magnitude", Double.NaN, localWidth * big + Math.abs(offset)));
        }
    }

    /** The failure of pdf-type evaluations for a density concentrated below the double resolution. */
    static DensaException concentrated(double x) {
        return new DensaException("the density is concentrated within the double resolution at x = " + x
                + " (its clr falls by more than 745 within about 1e-17 of the domain there): its pdf is not"
                + " representable; cdf, tail probabilities, quantiles and moments treat it as a point mass at x"
                + " (coordinates of this size are beyond what double precision resolves)",
                new EvaluationDiagnostics("pdf of a point mass", x, Double.POSITIVE_INFINITY));
    }

    /**
     * ∫ (x − center)^power f(x) dx for power 1 (center 0: the mean) or 2, or ∫ cos(ω(x − center)) f dx
     * (power 3) and ∫ sin(ω(x − center)) f dx (power 4) with ω = 2π/(b − a), sharp panels summed over
     * their adaptive leaves.
     */
    double moment(Shape sh, double[] clrNodes, int power, double center) {
        int np = panelLo.length;
        double omega = 2 * Math.PI / (space.upper() - space.lower());
        AdaptiveIntegrand g = sh.leafEdges == null ? null
                : new AdaptiveIntegrand(space, grid, basis, sh.rawCoef, sh.offset, sh.shift, sh.logTotal, power, center);
        double s = 0;
        for (int j = 0; j < np; j++) {
            double[] e = sh.leafEdges == null ? null : sh.leafEdges[j];
            if (e != null) {
                for (int l = 0; l + 1 < e.length; l++) {
                    s += g.rule(e[l], e[l + 1]);
                }
                continue;
            }
            for (int i = j * pts; i < (j + 1) * pts; i++) {
                double d = nodes[i] - center;
                double f = weights[i] * Math.exp(sh.logRelative(clrNodes[i]));
                s += power == 1 ? f * d : power == 2 ? f * d * d : AdaptiveIntegrand.trig(power, f, d, omega);
            }
        }
        return s;
    }

    /**
     * The integrand ref(y) exp(clr(y) − shift) (y − center)^power of a {@link BayesSpace} and its
     * quadrature: the panel's Gauss–Legendre rule on equal sub-intervals or by adaptive bisection,
     * keeping the leaves for cumulative probabilities (see {@link PanelIntegration}). One instance
     * per evaluation; internal.
     */
    static final class AdaptiveIntegrand {
        /**
         * Relative tolerance of the adaptive panel integration; raised to the rounding noise of the
         * integrand, 8 ε |exponent terms|, when the clr is so large that its cancellation dominates.
         */
        private static final double ADAPT_REL = 1e-12;
        static final double NOISE = 8 * Math.ulp(1.0);
        private static final int ADAPT_DEPTH = 50;
        private static final int ADAPT_BUDGET = 100_000;
        /**
         * An adaptive interval is accepted only if the clr varies by at most this across its rule's
         * nodes (the 8-point rule's relative error for exp is then below about 1e-9, see PanelIntegration) ...
         */
        private static final double ACCEPT_RANGE = 8.0;
        /** ... or if it cannot exceed e^−100 of the shift anywhere (below every tail we resolve). */
        private static final double LEAF_NEGLIGIBLE = -100.0;

        private final BayesSpace space;
        private final Basis basis;
        private final int pts;
        private final double[] glx;
        private final double[] glw;
        private final double overshoot;
        private final double[] bc;
        private final double offset;
        private final double shift;
        /** Subtracted after the shift: the integrand is ref · exp((clr − shift) − logScale) · (y − center)^power. */
        private final double logScale;
        private final int power;
        private final double center;
        private final double omega;
        private final double[] scratch;
        private int budget = ADAPT_BUDGET;
        private double[] leafBuf;
        private int leafCount;

        AdaptiveIntegrand(BayesSpace space, QuadratureGrid grid, Basis basis, double[] bc, double offset, double shift,
                double logScale, int power, double center) {
            this.space = space;
            this.basis = basis;
            this.pts = grid.pts;
            this.glx = grid.glx;
            this.glw = grid.glw;
            this.overshoot = grid.overshoot;
            this.bc = bc;
            this.offset = offset;
            this.shift = shift;
            this.logScale = logScale;
            this.power = power;
            this.center = center;
            this.omega = 2 * Math.PI / (space.upper() - space.lower());
            this.scratch = new double[basis.scratchSize()];
        }

        /** Largest |clr term| seen by the last {@link #rule} call (for the noise level). */
        private double terms;
        /** Smallest and largest clr value at the nodes of the last {@link #rule} call. */
        private double ruleLo;
        private double ruleHi;

        double value(double y) {
            double comb = basis.combine(y, bc, scratch);
            terms = Math.max(terms, Math.abs(comb) + Math.abs(offset) + Math.abs(shift));
            double clr = comb - offset;
            ruleLo = Math.min(ruleLo, clr);
            ruleHi = Math.max(ruleHi, clr);
            double f = space.referenceDensity(y) * Math.exp((clr - shift) - logScale);
            double d = y - center;
            return power == 0 ? f : power == 1 ? f * d : power == 2 ? f * d * d : trig(power, f, d, omega);
        }

        /** f cos(ω d) for power 3, f sin(ω d) for power 4. */
        static double trig(int power, double f, double d, double omega) {
            return power == 3 ? f * Math.cos(omega * d) : f * Math.sin(omega * d);
        }

        /** The panel's Gauss–Legendre rule mapped to [u, v]. */
        double rule(double u, double v) {
            terms = 0;
            ruleLo = Double.POSITIVE_INFINITY;
            ruleHi = Double.NEGATIVE_INFINITY;
            double h = 0.5 * (v - u), c = 0.5 * (u + v);
            double s = 0;
            for (int i = 0; i < pts; i++) {
                s += glw[i] * value(c + h * glx[i]);
            }
            return h * s;
        }

        /**
         * Whether the last {@link #rule} can be trusted on its own: the clr varied little across its
         * nodes (or no more than its rounding noise), or even the largest value the clr can take
         * between them (the Lebesgue bound) is negligible next to the shift. Without this, an
         * interval whose nodes all underflow would be accepted although a peak lies between them.
         */
        private boolean ruleTrusted() {
            double range = ruleHi - ruleLo;
            return range <= ACCEPT_RANGE + NOISE * terms
                    || ruleHi + overshoot * range - shift < LEAF_NEGLIGIBLE;
        }

        /** Starts a new panel: resets the budget and, if asked, the leaf list. */
        void startLeaves(boolean collect) {
            budget = ADAPT_BUDGET;
            leafCount = 0;
            leafBuf = collect ? new double[64] : null;
        }

        /** The (lo, mass) pairs of the leaves of the last {@link #integrate}, in order. */
        double[] leaves() {
            return Arrays.copyOf(leafBuf, 2 * leafCount);
        }

        /** The rule on {@code count} equal sub-intervals of [u, v], each recorded as a leaf. */
        double subdivide(double u, double v, int count) {
            double sum = 0;
            for (int i = 0; i < count; i++) {
                double lo = u + (v - u) * i / count;
                double hi = i == count - 1 ? v : u + (v - u) * (i + 1) / count;
                double val = rule(lo, hi);
                leaf(lo, val);
                sum += val;
            }
            return sum;
        }

        /** Adaptive bisection until the two halves agree with the whole to ADAPT_REL. */
        double integrate(double u, double v) {
            return refine(u, v, rule(u, v), ADAPT_DEPTH);
        }

        private double refine(double u, double v, double whole, int depth) {
            double m = 0.5 * (u + v);
            double l = rule(u, m);
            double t = terms;
            boolean trusted = ruleTrusted();
            double range = ruleHi - ruleLo;
            double r = rule(m, v);
            trusted &= ruleTrusted();
            range = Math.max(range, ruleHi - ruleLo);
            budget -= 2;
            double both = l + r;
            // the nodes are rounded to the double spacing of x, which moves the integrand by about
            // |clr'| ulp(x) relative: on intervals a few spacings wide that is the accuracy limit
            double spacing = Math.ulp(Math.max(Math.abs(u), Math.abs(v)));
            double rel = Math.max(Math.max(ADAPT_REL, NOISE * Math.max(t, terms)), 8 * range * spacing / (m - u));
            // an interval a few double spacings wide cannot be halved usefully, trusted or not
            boolean atResolution = v - u <= 64 * spacing;
            if (depth == 0 || budget <= 0 || atResolution
                    || trusted && Math.abs(both - whole) <= rel * Math.abs(both)) {
                leaf(u, l);
                leaf(m, r);
                return both;
            }
            return refine(u, m, l, depth - 1) + refine(m, v, r, depth - 1);
        }

        private void leaf(double lo, double value) {
            if (leafBuf == null) {
                return;
            }
            if (2 * leafCount + 2 > leafBuf.length) {
                leafBuf = Arrays.copyOf(leafBuf, 2 * leafBuf.length);
            }
            leafBuf[2 * leafCount] = lo;
            leafBuf[2 * leafCount + 1] = value;
            leafCount++;
        }
    }
}
