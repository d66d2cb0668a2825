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
    private final double[] left;
    private final double[] right;
    private final double[] need;
    private final double[] mj;
    private final double[] h;
    private final double[] start;
    private final double[] c;
    private final double[] v;
    private final double[] part;
    private final boolean[] active;
    private final boolean[] empty;

    QuantileSearch(NodeRule rule, int n) {
        this.rule = rule;
        int q = rule.q;
        gn = new double[q][n];
        yn = new double[q][n];
        coef = new double[q][n];
        u = new double[n];
        left = new double[n];
        right = new double[n];
        need = new double[n];
        mj = new double[n];
        h = new double[n];
        start = new double[n];
        c = new double[n];
        v = new double[n];
        part = new double[n];
        active = new boolean[n];
        empty = new boolean[n];
    }

    /**
     * {@link NodeRule#quantile} of probability p for the n densities of a node-major block (density d at
     * column d, stride n: panel masses mass[j·n + d], totals z[d], node exponentials g and node
     * values y at (j·q + i)·n + d, shifts shift[d]) into out[0..n). The same operations as
     * {@link NodeRule#quantile}, density by density, so the results are identical; the steps are
     * interleaved over the densities (each loop runs over all of them) so that their dependency
     * chains overlap instead of running one after the other.
     */
    void quantiles(double p, double[] mass, double[] z, double[] g, double[] y, double[] shift, int n, double[] out) {
        QuantileSearch w = this;
        int panels = rule.panels, q = rule.q;
        double[] width = rule.width, lo = rule.lo, anti = rule.anti, power = rule.power, un = rule.un, uw = rule.uw;
        double[][] gn = w.gn, yn = w.yn, a = w.coef;
        double[] u = w.u, left = w.left, right = w.right, need = w.need, mjs = w.mj,
                hs = w.h, st = w.start;
        boolean[] active = w.active, empty = w.empty;
        for (int d = 0; d < n; d++) {
            double target = p * z[d];
            double cum = 0;
            int j = 0;
            while (j < panels - 1 && cum + mass[j * n + d] < target) {
                cum += mass[j * n + d];
                j++;
            }
            double mj = mass[j * n + d];
            need[d] = Math.min(mj, Math.max(0, target - cum));
            mjs[d] = mj;
            hs[d] = width[j];
            st[d] = lo[j];
            empty[d] = !(mj > 0);
            int base = j * q * n + d;
            for (int i = 0; i < q; i++) {
                gn[i][d] = g[base + i * n];
                yn[i][d] = y[base + i * n];
            }
        }
        // interpolant of g on the panel: G(u) = h Σ_i g_i ∫_0^u ℓ_i = h Σ_k a_k u^{k+1}
        for (int k = 0; k < q; k++) {
            double[] ak = a[k];
            java.util.Arrays.fill(ak, 0, n, 0.0);
            for (int i = 0; i < q; i++) {
                double t = anti[i * q + k];
                double[] gi = gn[i];
                for (int d = 0; d < n; d++) {
                    ak[d] += gi[d] * t;
                }
            }
            for (int d = 0; d < n; d++) {
                ak[d] = hs[d] * ak[d];
            }
        }
        int live = 0;
        for (int d = 0; d < n; d++) {
            u[d] = need[d] / mjs[d];
            left[d] = 0;
            right[d] = 1;
            active[d] = !empty[d];
            live += active[d] ? 1 : 0;
        }
        for (int it = 0; it < 12 && live > 0; it++) {
            live = 0;
            for (int d = 0; d < n; d++) {
                if (!active[d]) {
                    continue;
                }
                double ud = u[d];
                double val = 0, der = 0;
                for (int k = q - 1; k >= 0; k--) {
                    double ak = a[k][d];
                    val = val * ud + ak;
                    der = der * ud + (k + 1) * ak;
                }
                val *= ud;
                double f = val - need[d];
                if (f > 0) {
                    right[d] = ud;
                } else {
                    left[d] = ud;
                }
                double nu = der > 0 ? ud - f / der : Double.NaN;
                nu = nu > left[d] && nu < right[d] ? nu : 0.5 * (left[d] + right[d]);
                boolean done = Math.abs(nu - ud) <= 1e-7;
                u[d] = nu;
                if (done || right[d] - left[d] <= 1e-7) {
                    active[d] = false;
                } else {
                    live++;
                }
            }
        }
        // one Newton step on the exact partial integral (see NodeRule.quantile)
        double[][] gam = a;
        double[] c = w.c, v = w.v, part = w.part;
        for (int k = 0; k < q; k++) {
            double[] gk = gam[k];
            java.util.Arrays.fill(gk, 0, n, 0.0);
            for (int i = 0; i < q; i++) {
                double t = power[k * q + i];
                double[] yi = yn[i];
                for (int d = 0; d < n; d++) {
                    gk[d] += t * yi[d];
                }
            }
        }
        java.util.Arrays.fill(part, 0, n, 0.0);
        for (int i = 0; i < q; i++) {
            double ui = un[i];
            for (int d = 0; d < n; d++) {
                v[d] = u[d] * ui;
                c[d] = 0;
            }
            for (int k = q - 1; k >= 0; k--) {
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
        for (int d = 0; d < n; d++) {
            c[d] = 0;
        }
        for (int k = q - 1; k >= 0; k--) {
            double[] gk = gam[k];
            for (int d = 0; d < n; d++) {
                c[d] = c[d] * u[d] + gk[d];
            }
        }
        for (int d = 0; d < n; d++) {
            double h = hs[d], ud = u[d];
            double f = part[d] * h * ud - need[d];
            double dens = h * Kernels.expFast(c[d] - shift[d]);
            double nu = dens > 0 ? ud - f / dens : Double.NaN;
            if (nu >= 0 && nu <= 1) {
                ud = nu;
            }
            out[d] = empty[d] ? st[d] + 0.5 * h : st[d] + ud * h;
        }
    }
}
