package io.densa.spatial.uncertainty;

import io.densa.core.internal.Kernels;

/**
 * The quantile search of {@link NodeRule} for the draws of a block at once, with its work arrays
 * (package-private; one per thread).
 */
final class QuantileSearch {
    private final NodeRule rule;

    private final double[][] gn;
    private final double[][] yn;
    private final double[][] coef;
    private final double[] u;
    private final double[] need;
    private final double[] mj;
    private final double[] h;
    private final double[] start;
    private final double[] c;
    private final double[] v;
    private final double[] part;
    private final boolean[] empty;

    /** Unguarded Newton steps on the interpolant before the tolerance is checked. */
    static final int NEWTON_STEPS = 4;
    /** Largest last Newton step (in the panel fraction) accepted without the guarded search. */
    static final double TOLERANCE = NodeRule.ROOT_TOLERANCE;

    /**
     * q × q: the Bernstein coefficients (degree q − 1 on the panel) of the polynomial that
     * interpolates the node exponentials, bern[i q + j] the weight of node j in coefficient i.
     */
    private final double[] bern;
    /** Densities searched again by the guarded search, summed over calls (for the tests). */
    long fallbacks;
    private final double[] least;
    private final double[] tmp;
    private final double[] root;

    QuantileSearch(NodeRule rule, int n) {
        this.rule = rule;
        int q = rule.q;
        bern = bernsteinWeights(rule.power, q);
        least = new double[n];
        tmp = new double[n];
        root = new double[q];
        gn = new double[q][n];
        yn = new double[q][n];
        coef = new double[q][n];
        u = new double[n];
        need = new double[n];
        mj = new double[n];
        h = new double[n];
        start = new double[n];
        c = new double[n];
        v = new double[n];
        part = new double[n];
        empty = new boolean[n];
    }

    /**
     * {@link NodeRule#quantile} of probability p for the n densities of a block (density d at column d
     * of every row: panel masses mass[j][d], cumulative masses prefix[j][d] (j = 0..panels, the last
     * row the totals), node exponentials g and node values y in row j·q + i, shifts shift[d]) into
     * out[0..n). The same panel, interpolant and final exact Newton step as
     * {@link NodeRule#quantile}; the root of the interpolant is found by {@link #NEWTON_STEPS}
     * unguarded Newton steps from an inverse quadratic start, every loop running over all densities (unit
     * stride, so that the JIT vectorises them and the densities' dependency chains overlap). They are
     * kept only where the root is unique (all Bernstein coefficients of the interpolant of the node
     * exponentials positive, so that the interpolant is positive on the panel and G increasing) and
     * the last step is within {@link #TOLERANCE}; any other density is searched again with the
     * guarded steps of {@link NodeRule#quantile}. Both searches stop within the tolerance of the same
     * root, and the exact step squares what is left, so the two agree to rounding (CellBoundTest).
     */
    void quantiles(double p, double[][] mass, double[][] prefix, double[][] g, double[][] y, double[] shift, int n,
            double[] out) {
        // in four methods, each small enough to compile quickly (and to recompile alone when a rare
        // branch is first taken)
        gather(p, mass, prefix, g, y, n);
        interpolant(n);
        newton(n);
        exactStep(shift, n, out);
    }

    /** Each density's panel, the mass it needs there, and its node exponentials and values. */
    private void gather(double p, double[][] mass, double[][] prefix, double[][] g, double[][] y, int n) {
        int panels = rule.panels, q = rule.q;
        double[] width = rule.width, lo = rule.lo;
        double[][] gn = this.gn, yn = this.yn;
        double[] need = this.need, mjs = this.mj, hs = this.h, st = this.start;
        boolean[] empty = this.empty;
        double[] totals = prefix[panels];
        int jp = 0;
        for (int d = 0; d < n; d++) {
            double target = p * totals[d];
            // the panel: the first j whose cumulative mass prefix[j + 1] reaches the target (the prefix
            // sums add the masses in panel order, the same values as a running sum), searched up or
            // down from the previous draw's panel (the cumulative masses never decrease)
            int j = jp;
            while (j < panels - 1 && prefix[j + 1][d] < target) {
                j++;
            }
            while (j > 0 && prefix[j][d] >= target) {
                j--;
            }
            jp = j;
            double cum = prefix[j][d];
            double mj = mass[j][d];
            need[d] = Math.min(mj, Math.max(0, target - cum));
            mjs[d] = mj;
            hs[d] = width[j];
            st[d] = lo[j];
            empty[d] = !(mj > 0);
            int base = j * q;
            for (int i = 0; i < q; i++) {
                gn[i][d] = g[base + i][d];
                yn[i][d] = y[base + i][d];
            }
        }
    }

    /** The smallest Bernstein coefficient and the power coefficients of the interpolant. */
    private void interpolant(int n) {
        int q = rule.q;
        double[] anti = rule.anti;
        double[][] gn = this.gn, a = this.coef;
        double[] hs = this.h;
        // the smallest Bernstein coefficient of the interpolant of g: when positive, the interpolant is
        // positive on the panel, G increases and its root is unique
        for (int i = 0; i < q; i++) {
            combine(bern, i * q, 1, gn, q, n, tmp);
            if (i == 0) {
                System.arraycopy(tmp, 0, least, 0, n);
            } else {
                for (int d = 0; d < n; d++) {
                    least[d] = Math.min(least[d], tmp[d]);
                }
            }
        }
        // interpolant of g on the panel: G(u) = h Σ_i g_i ∫_0^u ℓ_i = h Σ_k a_k u^{k+1}
        for (int k = 0; k < q; k++) {
            double[] ak = a[k];
            combine(anti, k, q, gn, q, n, ak);
            for (int d = 0; d < n; d++) {
                ak[d] = hs[d] * ak[d];
            }
        }
    }

    /** The root of the interpolant: the unguarded Newton steps, the guarded search where needed. */
    private void newton(int n) {
        QuantileSearch w = this;
        int q = rule.q;
        double[][] a = w.coef;
        double[] u = w.u, need = w.need, mjs = w.mj;
        boolean[] empty = w.empty;
        // Newton on the interpolant, a fixed number of unguarded steps on all
        // densities at once (each loop unit-stride over them); a density whose last step is not below
        // the tolerance (or not finite) is searched again with the guarded search of NodeRule
        double[] val = w.c, der = w.v, step = w.part;
        // start: inverse quadratic interpolation through (0, 0), (G(½), ½) and (m_j, 1), kept in [0, 1]
        System.arraycopy(a[q - 1], 0, val, 0, n);
        for (int k = q - 2; k >= 0; k--) {
            double[] ak = a[k];
            for (int d = 0; d < n; d++) {
                val[d] = val[d] * 0.5 + ak[d];
            }
        }
        for (int d = 0; d < n; d++) {
            double gh = 0.5 * val[d], m = mjs[d], t = need[d];
            double guess = t * (0.5 * (t - m) / (gh * (gh - m)) + (t - gh) / (m * (m - gh)));
            u[d] = Math.max(0.0, Math.min(1.0, guess));
        }
        for (int it = 0; it < NEWTON_STEPS; it++) {
            // Horner for G(u)/u = Σ a_k u^k and its derivative's Σ (k + 1) a_k u^k, both in each pass
            double[] top = a[q - 1];
            double kq = q;
            for (int d = 0; d < n; d++) {
                der[d] = kq * top[d];
                val[d] = top[d];
            }
            for (int k = q - 2; k >= 0; k--) {
                double[] ak = a[k];
                double kk = k + 1;
                for (int d = 0; d < n; d++) {
                    double ud = u[d], c = ak[d];
                    der[d] = der[d] * ud + kk * c;
                    val[d] = val[d] * ud + c;
                }
            }
            for (int d = 0; d < n; d++) {
                double ud = u[d];
                double nu = ud - (val[d] * ud - need[d]) / der[d];
                nu = Math.max(0.0, Math.min(1.0, nu));
                step[d] = Math.abs(nu - ud);
                u[d] = nu;
            }
        }
        for (int d = 0; d < n; d++) {
            if (!empty[d] && !(step[d] <= TOLERANCE && least[d] > 0)) {
                u[d] = guarded(d, a, need[d], mjs[d]);
                fallbacks++;
            }
        }
    }

    /** One Newton step on the exact partial integral (see NodeRule.quantile), the quantiles into out. */
    private void exactStep(double[] shift, int n, double[] out) {
        QuantileSearch w = this;
        int q = rule.q;
        double[] power = rule.power, un = rule.un, uw = rule.uw;
        double[][] yn = w.yn, gam = w.coef;
        double[] u = w.u, need = w.need, hs = w.h, st = w.start;
        boolean[] empty = w.empty;
        double[] c = w.c, v = w.v, part = w.part;
        for (int k = 0; k < q; k++) {
            combine(power, k * q, 1, yn, q, n, gam[k]);
        }
        java.util.Arrays.fill(part, 0, n, 0.0);
        double[] top = gam[q - 1];
        for (int i = 0; i < q; i++) {
            double ui = un[i];
            // Horner from the highest coefficient
            for (int d = 0; d < n; d++) {
                v[d] = u[d] * ui;
                c[d] = top[d];
            }
            for (int k = q - 2; k >= 0; k--) {
                double[] gk = gam[k];
                for (int d = 0; d < n; d++) {
                    c[d] = c[d] * v[d] + gk[d];
                }
            }
            double wi = uw[i];
            for (int d = 0; d < n; d++) {
                part[d] += wi * Kernels.expFast(c[d] - shift[d]);
            }
        }
        System.arraycopy(top, 0, c, 0, n);
        for (int k = q - 2; k >= 0; k--) {
            double[] gk = gam[k];
            for (int d = 0; d < n; d++) {
                c[d] = c[d] * u[d] + gk[d];
            }
        }
        for (int d = 0; d < n; d++) {
            c[d] = Kernels.expFast(c[d] - shift[d]);
        }
        for (int d = 0; d < n; d++) {
            double h = hs[d], ud = u[d];
            double f = part[d] * h * ud - need[d];
            double dens = h * c[d];
            double nu = dens > 0 ? ud - f / dens : Double.NaN;
            if (nu >= 0 && nu <= 1) {
                ud = nu;
            }
            out[d] = empty[d] ? st[d] + 0.5 * h : st[d] + ud * h;
        }
    }

    /**
     * out[0..n) = Σ_{i&lt;q} w[off + i·stride] rows[i][0..n), summed in order of i from 0 (a row of a
     * q × q weight matrix applied to the q node rows of the densities).
     */
    private static void combine(double[] w, int off, int stride, double[][] rows, int q, int n, double[] out) {
        double t0 = w[off];
        double[] r0 = rows[0];
        for (int d = 0; d < n; d++) {
            out[d] = t0 * r0[d];
        }
        for (int i = 1; i < q; i++) {
            double t = w[off + i * stride];
            double[] ri = rows[i];
            for (int d = 0; d < n; d++) {
                out[d] += t * ri[d];
            }
        }
    }

    /**
     * Weights from node values to the Bernstein coefficients of their interpolating polynomial of
     * degree n = q − 1 on [0, 1]: with power coefficients c_m (rows of {@code power}), b_i = Σ_{m ≤ i}
     * C(i, m)/C(n, m) c_m (Farouki &amp; Rajan (1988), Algorithms for polynomials in Bernstein form,
     * Comput. Aided Geom. Des. 5 — from memory; CellBoundTest checks that the coefficients reproduce the
     * interpolant).
     */
    static double[] bernsteinWeights(double[] power, int q) {
        int n = q - 1;
        double[] out = new double[q * q];
        for (int i = 0; i < q; i++) {
            for (int m = 0; m <= i; m++) {
                double f = binomial(i, m) / binomial(n, m);
                for (int j = 0; j < q; j++) {
                    out[i * q + j] += f * power[m * q + j];
                }
            }
        }
        return out;
    }

    private static double binomial(int a, int b) {
        double r = 1;
        for (int i = 1; i <= b; i++) {
            r = r * (a - b + i) / i;
        }
        return r;
    }

    /** The guarded search of {@link NodeRule#interpolantRoot} for density d. */
    private double guarded(int d, double[][] a, double need, double mj) {
        double[] one = root;
        for (int k = 0; k < rule.q; k++) {
            one[k] = a[k][d];
        }
        return rule.interpolantRoot(one, need, mj);
    }
}
