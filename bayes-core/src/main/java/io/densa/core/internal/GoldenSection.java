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
        Steps s = new Steps(lo, hi, steps, bestX, bestF);
        while (!s.done()) {
            s.accept(f.applyAsDouble(s.point()));
        }
        return s.result();
    }

    /**
     * {@link #minimise} as steps, for a caller that computes f elsewhere (several searches sharing
     * their evaluations): while not {@link #done}, f at {@link #point} goes to {@link #accept};
     * then {@link #result}. The same points in the same order, the same result.
     */
    public static final class Steps {
        private static final double RATIO = 0.5 * (Math.sqrt(5) - 1);
        private final int steps;
        private final double bestX, bestF;
        private double lo, hi, x1, x2, f1, f2;
        /** Values received (0, 1: the two interior points; then one per step) and shrinking steps done. */
        private int received, it;
        /** Whether the pending point is x1 (else x2) once both interior values are known. */
        private boolean left;

        /** As {@link #minimise}'s arguments. */
        public Steps(double lo, double hi, int steps, double bestX, double bestF) {
            this.lo = lo;
            this.hi = hi;
            this.steps = steps;
            this.bestX = bestX;
            this.bestF = bestF;
            x1 = hi - RATIO * (hi - lo);
            x2 = lo + RATIO * (hi - lo);
        }

        /** Whether every point has its value. */
        public boolean done() {
            return received >= 2 && it >= steps;
        }

        /** The point whose value is wanted next (while not {@link #done}). */
        public double point() {
            return received == 0 ? x1 : received == 1 ? x2 : left ? x1 : x2;
        }

        /** f at {@link #point}. */
        public void accept(double f) {
            if (received == 0) {
                f1 = f;
            } else if (received == 1) {
                f2 = f;
            } else {
                if (left) {
                    f1 = f;
                } else {
                    f2 = f;
                }
                it++;
            }
            received++;
            if (received >= 2 && it < steps) { // shrink towards the smaller value; its new interior point is next
                left = f1 <= f2;
                if (left) {
                    hi = x2;
                    x2 = x1;
                    f2 = f1;
                    x1 = hi - RATIO * (hi - lo);
                } else {
                    lo = x1;
                    x1 = x2;
                    f1 = f2;
                    x2 = lo + RATIO * (hi - lo);
                }
            }
        }

        /** The point with the smallest value found (bestX on ties); once {@link #done}. */
        public double result() {
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
}
