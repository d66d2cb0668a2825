package io.densa.core.internal;

import java.util.function.DoubleUnaryOperator;

/**
 * Golden-section refinement of a minimum found on a grid, written once for the smoothing-parameter
 * searches of the estimators (Kiefer (1953), Sequential minimax search for a maximum, Proc. Amer.
 * Math. Soc. 4(3); from memory). Internal.
 */
public final class GoldenSection {
    private GoldenSection() {
    }

    /**
     * Shrinks [lo, hi] by the golden ratio {@code steps} times from its two interior points
     * hi − r(hi − lo) and lo + r(hi − lo), r = (√5 − 1)/2, keeping the side of the smaller value,
     * and returns the best of {@code bestX} (with value {@code bestF}, the grid's best point) and
     * the two last interior points. f is evaluated at the first interior point, then the second,
     * then once per step.
     *
     * @param f     the function to minimise (may keep state between calls: the order of the calls
     *              is fixed as above)
     * @param steps number of shrinking steps, ≥ 0
     * @return the point with the smallest value found (bestX on ties)
     */
    public static double minimise(DoubleUnaryOperator f, double lo, double hi, int steps, double bestX,
            double bestF) {
        double ratio = 0.5 * (Math.sqrt(5) - 1);
        double x1 = hi - ratio * (hi - lo), x2 = lo + ratio * (hi - lo);
        double f1 = f.applyAsDouble(x1);
        double f2 = f.applyAsDouble(x2);
        for (int it = 0; it < steps; it++) {
            if (f1 <= f2) {
                hi = x2;
                x2 = x1;
                f2 = f1;
                x1 = hi - ratio * (hi - lo);
                f1 = f.applyAsDouble(x1);
            } else {
                lo = x1;
                x1 = x2;
                f1 = f2;
                x2 = lo + ratio * (hi - lo);
                f2 = f.applyAsDouble(x2);
            }
        }
        double g = bestX;
        double c = bestF;
        if (f1 < c) {
            g = x1;
            c = f1;
        }
        if (f2 < c) {
            g = x2;
        }
        return g;
    }
}
