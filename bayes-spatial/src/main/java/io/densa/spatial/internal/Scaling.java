package io.densa.spatial.internal;

/**
 * Norms and scale factors that neither overflow nor underflow for finite input anywhere in the
 * double range. Internal: not exported; may change without notice.
 */
public final class Scaling {
    private Scaling() {
    }

    /**
     * √(dx² + dy²) without overflow or underflow: the plain formula, whose result is bit-identical to
     * the square root of the sum of squares, whenever that sum lies in [2⁻⁹⁶⁰, 2⁹⁶⁰]; otherwise the
     * two components are first scaled by the power of two of the larger one (exact), like
     * {@link Math#hypot} but without its cost on the common path. +∞ only when the true norm exceeds
     * the double range (or a component is already infinite).
     */
    public static double planarNorm(double dx, double dy) {
        double s = dx * dx + dy * dy;
        if (plainSquareInRange(s)) {
            return Math.sqrt(s);
        }
        return scaledNorm(dx, dy);
    }

    /**
     * Whether dx² + dy² = s, computed plainly, is within [2⁻⁹⁶⁰, 2⁹⁶⁰], where {@link #planarNorm}
     * takes √s (false for NaN); for loops that take √s of many sums first and then repair the rest.
     */
    public static boolean plainSquareInRange(double s) {
        return s <= 0x1p960 && s >= 0x1p-960;
    }

    private static double scaledNorm(double dx, double dy) {
        double m = Math.max(Math.abs(dx), Math.abs(dy));
        if (m == 0 || !(m <= Double.MAX_VALUE)) {
            return m; // 0, +inf or NaN
        }
        int e = Math.getExponent(m);
        double a = Math.scalb(dx, -e), b = Math.scalb(dy, -e);
        return Math.scalb(Math.sqrt(a * a + b * b), e);
    }

    /**
     * The power of two 2^e nearest below max |x_i| (1 if every value is 0): dividing by it is exact
     * and brings the largest value into [1, 2), so that sums of squares neither overflow (values
     * near 1e300) nor underflow (values near 1e-300).
     */
    public static double powerOfTwoScale(double[] x) {
        double max = 0;
        for (double v : x) {
            max = Math.max(max, Math.abs(v));
        }
        return max > 0 ? Math.scalb(1.0, Math.getExponent(max)) : 1.0;
    }
}
