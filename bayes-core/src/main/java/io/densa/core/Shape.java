package io.densa.core;

/**
 * Derived quantities of one density needed to evaluate it: log normaliser, panel masses with
 * their prefix and suffix sums, which panels need adaptive quadrature, raw-function
 * coefficients. Built once by {@link BayesSpace} and not modified afterwards; internal.
 */
final class Shape {
    /** log ∫ exp(clr) dP. */
    final double logZ;
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

    Shape(double logZ, double[] mass, double[] cum, double[] tail, double[][] leafEdges, double[][] leafCum,
            double[][] leafTail, double[] rawCoef, double offset) {
        this.logZ = logZ;
        this.mass = mass;
        this.cum = cum;
        this.tail = tail;
        this.leafEdges = leafEdges;
        this.leafCum = leafCum;
        this.leafTail = leafTail;
        this.rawCoef = rawCoef;
        this.offset = offset;
    }
}
