package io.densa.core.internal;

/**
 * Gauss–Legendre nodes and weights on [−1, 1], computed by Newton's method on the
 * three-term recurrence of the Legendre polynomials (Golub &amp; Welsch 1969 give the
 * equivalent eigenvalue form; Abramowitz &amp; Stegun 1964, 25.4.29, the rule itself).
 * An n-point rule integrates polynomials of degree ≤ 2n − 1 exactly.
 */
public final class GaussLegendre {
    private static final int MAX = 64;
    private static final double[][] NODES = new double[MAX + 1][];
    private static final double[][] WEIGHTS = new double[MAX + 1][];

    static {
        for (int n = 1; n <= MAX; n++) {
            double[] x = new double[n];
            double[] w = new double[n];
            for (int i = 0; i < (n + 1) / 2; i++) {
                double z = Math.cos(Math.PI * (i + 0.75) / (n + 0.5));
                for (int it = 0; it < 100; it++) {
                    double[] pd = legendre(n, z);
                    double dz = pd[0] / pd[1];
                    z -= dz;
                    if (Math.abs(dz) < 1e-16) {
                        break;
                    }
                }
                // recompute derivative at the converged node
                double dp = legendre(n, z)[1];
                x[i] = -z;
                x[n - 1 - i] = z;
                w[i] = 2 / ((1 - z * z) * dp * dp);
                w[n - 1 - i] = w[i];
            }
            if (n % 2 == 1) {
                x[n / 2] = 0;
            }
            NODES[n] = x;
            WEIGHTS[n] = w;
        }
    }

    /** P_n(z) and P_n'(z) by the three-term recurrence. */
    private static double[] legendre(int n, double z) {
        double p0 = 1, p1 = 0;
        for (int j = 1; j <= n; j++) {
            double p2 = p1;
            p1 = p0;
            p0 = ((2.0 * j - 1) * z * p1 - (j - 1.0) * p2) / j;
        }
        return new double[] {p0, n * (z * p0 - p1) / (z * z - 1)};
    }

    private GaussLegendre() {
    }

    /** Nodes of the n-point rule on [−1, 1], ascending (a fresh copy). */
    public static double[] nodes(int n) {
        check(n);
        return NODES[n].clone();
    }

    /** Weights of the n-point rule on [−1, 1] (a fresh copy). */
    public static double[] weights(int n) {
        check(n);
        return WEIGHTS[n].clone();
    }

    /**
     * Lebesgue constant Λ = max_{x ∈ [−1, 1]} Σ_i |ℓ_i(x)| of interpolation at the n nodes
     * (ℓ_i the Lagrange polynomials), sampled at 2,001 points including the ends and raised by 10 %
     * for the points between samples: a polynomial p of degree &lt; n satisfies
     * |p(x) − C| ≤ Λ max_i |p(x_i) − C| on [−1, 1] for any constant C (the interpolation error
     * bound; e.g. Trefethen (2013), Approximation Theory and Approximation Practice, SIAM, the chapter on
     * Lebesgue constants — from memory; the bound itself is the triangle inequality on the Lagrange form).
     */
    public static double lebesgueConstant(int n) {
        check(n);
        double[] x = NODES[n];
        // barycentric weights w_i = 1 / Π_{j≠i} (x_i − x_j): ℓ_i(t) = (w_i / (t − x_i)) / Σ_j w_j / (t − x_j)
        double[] w = new double[n];
        for (int i = 0; i < n; i++) {
            double p = 1;
            for (int j = 0; j < n; j++) {
                if (j != i) {
                    p *= x[i] - x[j];
                }
            }
            w[i] = 1 / p;
        }
        double max = 1;
        int samples = 2000;
        for (int s = 0; s <= samples; s++) {
            double t = -1 + 2.0 * s / samples;
            double num = 0, den = 0;
            boolean atNode = false;
            for (int i = 0; i < n; i++) {
                double d = t - x[i];
                if (d == 0) {
                    atNode = true; // Σ |ℓ_i| = 1 at a node
                    break;
                }
                num += Math.abs(w[i] / d);
                den += w[i] / d;
            }
            if (!atNode) {
                max = Math.max(max, num / Math.abs(den));
            }
        }
        return 1.1 * max;
    }

    private static void check(int n) {
        if (!(n >= 1 && n <= MAX)) {
            throw new IllegalArgumentException("Gauss-Legendre rule size must be in [1, " + MAX + "], got " + n);
        }
    }
}
