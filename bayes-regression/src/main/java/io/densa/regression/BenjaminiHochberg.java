package io.densa.regression;

import java.util.Arrays;
import java.util.Objects;

/**
 * The Benjamini–Hochberg step-up procedure controlling the false discovery rate (Benjamini &amp;
 * Hochberg (1995), J. R. Stat. Soc. B 57(1)): with ordered p-values p_(1) ≤ … ≤ p_(m), reject
 * the hypotheses of p_(1), …, p_(k) for the largest k with p_(k) ≤ (k/m) q. Under independent
 * (or positively dependent) true nulls the FDR is at most (m₀/m) q.
 */
public final class BenjaminiHochberg {
    private BenjaminiHochberg() {
    }

    private static void check(double[] p) {
        Objects.requireNonNull(p, "p-values");
        for (int i = 0; i < p.length; i++) {
            if (!(p[i] >= 0 && p[i] <= 1)) {
                throw new IllegalArgumentException("p-value " + i + " is " + p[i] + "; p-values must be in [0, 1]");
            }
        }
    }

    /**
     * Adjusted p-values (q-values) p̃_(i) = min_{j ≥ i} min(1, m p_(j) / j), in the input order;
     * hypothesis i is rejected at level q exactly when p̃_i ≤ q.
     *
     * @param p p-values in [0, 1] (not modified)
     */
    public static double[] adjust(double[] p) {
        check(p);
        int m = p.length;
        Integer[] order = new Integer[m];
        for (int i = 0; i < m; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (a, b) -> Double.compare(p[a], p[b]));
        double[] out = new double[m];
        double run = 1.0;
        for (int r = m - 1; r >= 0; r--) {
            int i = order[r];
            run = Math.min(run, Math.min(1.0, m * p[i] / (r + 1)));
            out[i] = run;
        }
        return out;
    }

    /**
     * Rejections of the step-up procedure at FDR level q.
     *
     * @param p p-values in [0, 1] (not modified)
     * @param q level in (0, 1)
     * @return true for rejected hypotheses, in the input order
     */
    public static boolean[] reject(double[] p, double q) {
        if (!(q > 0 && q < 1)) {
            throw new IllegalArgumentException("FDR level must be in (0, 1), got " + q);
        }
        check(p);
        int m = p.length;
        double[] s = p.clone();
        Arrays.sort(s);
        double threshold = -1;
        for (int k = m; k >= 1; k--) {
            if (s[k - 1] <= (double) k / m * q) {
                threshold = s[k - 1];
                break;
            }
        }
        boolean[] out = new boolean[m];
        for (int i = 0; i < m; i++) {
            out[i] = p[i] <= threshold;
        }
        return out;
    }
}
