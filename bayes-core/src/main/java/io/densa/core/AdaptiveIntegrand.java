package io.densa.core;

import java.util.Arrays;

/**
 * The integrand ref(y) exp(clr(y) − shift) (y − center)^power of a {@link BayesSpace} and its
 * quadrature: the panel's Gauss–Legendre rule on equal sub-intervals or by adaptive bisection,
 * keeping the leaves for cumulative probabilities (see {@link PanelIntegration}). One instance
 * per evaluation; internal.
 */
final class AdaptiveIntegrand {
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
        return power == 0 ? f : power == 1 ? f * d : f * d * d;
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
