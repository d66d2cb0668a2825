package io.densa.core;

/**
 * Derived quantities of one density needed to evaluate it: log normaliser, cumulative panel
 * masses, raw-function coefficients. Immutable once built; internal.
 */
final class Shape {
    final double logZ;
    final double[] cum;
    final double[] rawCoef;
    final double offset;
    final double mean;

    Shape(double logZ, double[] cum, double[] rawCoef, double offset, double mean) {
        this.logZ = logZ;
        this.cum = cum;
        this.rawCoef = rawCoef;
        this.offset = offset;
        this.mean = mean;
    }
}
