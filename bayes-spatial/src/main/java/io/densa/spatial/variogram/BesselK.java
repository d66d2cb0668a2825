package io.densa.spatial.variogram;

/**
 * Modified Bessel function of the second kind K_ν(x) for real order ν and x &gt; 0 (Commons
 * Math 3 has no modified Bessel functions).
 *
 * <p>General orders use the integral representation K_ν(x) = ∫_0^∞ exp(−x cosh t) cosh(νt) dt
 * (Abramowitz &amp; Stegun (1964), Handbook of Mathematical Functions, 9.6.24 — from memory),
 * evaluated by the trapezoidal rule, which converges geometrically for this analytic, doubly
 * exponentially decaying integrand (Trefethen &amp; Weideman (2014), The exponentially convergent
 * trapezoidal rule, SIAM Review 56(3) — from memory). The step is min(0.1, 0.5/√x) so that
 * the Gaussian-like peak of width 1/√x at large x is resolved. Half-integer orders below 20 use
 * the closed form K_{1/2}(x) = √(π/(2x)) e^{−x} and the upward recurrence
 * K_{ν+1}(x) = K_{ν−1}(x) + (2ν/x) K_ν(x) (A&amp;S 9.6.26, stable upward for K).
 */
final class BesselK {
    private BesselK() {
    }

    /** K_ν(x); x must be positive. */
    static double k(double nu, double x) {
        double v = Math.abs(nu);
        if (!(x > 0)) {
            throw new IllegalArgumentException("Bessel K argument must be > 0, got " + x);
        }
        double frac = v - Math.floor(v);
        if (frac == 0.5 && v < 20) {
            return halfInteger(v, x);
        }
        return integral(v, x);
    }

    static double halfInteger(double v, double x) {
        double km = Math.sqrt(Math.PI / (2 * x)) * Math.exp(-x); // K_{1/2}
        if (v == 0.5) {
            return km;
        }
        double kc = km * (1 + 1 / x); // K_{3/2}
        double order = 1.5;
        while (order < v) {
            double next = km + (2 * order / x) * kc;
            km = kc;
            kc = next;
            order += 1;
        }
        return kc;
    }

    /** The trapezoidal evaluation of the integral representation, for any order. */
    static double integral(double v, double x) {
        double h = Math.min(0.1, 0.5 / Math.sqrt(x));
        double peak = v > 0 ? asinh(v / x) : 0;
        // integrand scaled by e^{x}: exp(−x(cosh t − 1)) cosh(νt)
        double sum = 0.5 * 1.0;
        for (int i = 1; i < 100_000; i++) {
            double t = i * h;
            double e = -x * (Math.cosh(t) - 1) + v * t;
            double term = 0.5 * Math.exp(e) * (1 + Math.exp(-2 * v * t));
            sum += term;
            if (t > peak && term < 1e-18 * sum) {
                break;
            }
        }
        return h * sum * Math.exp(-x);
    }

    private static double asinh(double z) {
        return Math.log(z + Math.sqrt(z * z + 1));
    }
}
