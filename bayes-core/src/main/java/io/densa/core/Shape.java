package io.densa.core;

/**
 * Derived quantities of one density needed to evaluate it: log normaliser, panel masses with
 * their prefix and suffix sums, which panels need adaptive quadrature, raw-function
 * coefficients. Built once by {@link BayesSpace} and not modified afterwards; internal.
 */
final class Shape {
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
