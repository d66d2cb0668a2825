package io.densa.spatial.uncertainty;

import io.densa.core.internal.Kernels;

/**
 * One bound per location of the node rule's error estimates of all its draws (package-private;
 * 4-point panels only), which lets {@link DrawEngine} skip the per-draw estimates.
 */
final class CellBound {
    private final NodeRule rule;
    private final int r;
    /** r × m: the directions' node values per unit normal (the engine's bt). */
    private final double[] bt;
    /**
     * Per direction l and panel j, the Taylor coefficients β₁..β₃ of the direction's clr
     * (dirBeta[(l·panels + j)·3 + m − 1]) and its value at the panel centre (dirCentre[l·panels + j]).
     */
    private final double[] dirBeta;
    private final double[] dirCentre;

    CellBound(NodeRule rule, double[] bt, int r) {
        this.rule = rule;
        this.r = r;
        this.bt = bt;
        int np = rule.panels, m = rule.m;
        dirBeta = new double[r * np * 3];
        dirCentre = new double[r * np];
        for (int l = 0; l < r; l++) {
            for (int j = 0; j < np; j++) {
                int o = l * m + 4 * j;
                for (int mm = 0; mm < 3; mm++) {
                    double t = 0;
                    for (int i = 0; i < 4; i++) {
                        t += rule.taylor[mm * 4 + i] * bt[o + i];
                    }
                    dirBeta[(l * np + j) * 3 + mm] = t;
                }
                double c = 0;
                for (int i = 0; i < 4; i++) {
                    c += rule.centreWeights[i] * bt[o + i];
                }
                dirCentre[l * np + j] = c;
            }
        }
    }

    /** out[l] = max_{d &lt; nc} |z[l][d]| for the r rows (0 for nc = 0). */
    static void largestMagnitudes(double[][] z, int r, int nc, double[] out) {
        for (int l = 0; l < r; l++) {
            double big = 0;
            double[] zl = z[l];
            for (int d = 0; d < nc; d++) {
                big = Math.max(big, Math.abs(zl[d]));
            }
            out[l] = big;
        }
    }

    /** e_8 of exp(a t + b t² + c t³) for a, b, c ≥ 0: Σ_{i+2j+3k=8} a^i b^j c^k / (i! j! k!). */
    private static double e8(double a, double b, double c) {
        double aa = a * a, a4 = aa * aa, bb = b * b, cc = c * c;
        return a4 * a4 * (1.0 / 40320) + a4 * aa * b * (1.0 / 720) + a4 * bb * (1.0 / 48) + aa * bb * b * (1.0 / 12)
                + bb * bb * (1.0 / 24) + a4 * a * c * (1.0 / 120) + aa * a * b * c * (1.0 / 6) + a * bb * c * 0.5
                + aa * cc * 0.25 + b * cc * 0.5;
    }

    /**
     * 4-point panels: an upper bound, valid for every draw d of the location, of the draw's error
     * estimate Σ_j rp[j][d] of {@link PanelErrors#four} relative to the same shift. With s_{ld} = σ
     * z_{ld} and S_l = max_d |s_{ld}|, the draw's Taylor coefficients on panel j are β_m(ĉ) + Σ_l
     * s_{ld} β_m(l), so |β_m| ≤ B_m = |β_m(ĉ)| + Σ_l S_l |β_m(l)|; e_8 increases in each |β_m|. Its
     * centre value minus its largest node value is at most the same difference for the node i₀
     * where the plug-in is largest, c(ĉ) − y_{i₀}(ĉ) + Σ_l S_l |c(l) − y_{i₀}(l)|, and exp(min(40,
     * ·)) increases. So when the bound is at most the tolerance times the smallest total mass, no
     * draw's estimate exceeds the tolerance and the estimates are skipped: the draws evaluated
     * exactly, and every value, are the same as with the estimates. Costs O(panels · r) per
     * location instead of O(panels · draws).
     *
     * @param z    the scaled normals, one row per direction (columns 0..nc)
     * @param nc   columns
     * @param base node values of the plug-in
     * @param sm   work array of r values
     */
    double of(double[][] z, int nc, double[] base, double[] sm) {
        NodeRule nr = rule;
        int np = nr.panels, m = nr.m;
        largestMagnitudes(z, r, nc, sm);
        int top = 0;
        for (int i = 1; i < m; i++) {
            if (base[i] > base[top]) {
                top = i;
            }
        }
        double[] tw = nr.taylor;
        double[] cw = nr.centreWeights;
        double sum = 0;
        for (int j = 0; j < np; j++) {
            int o = 4 * j;
            double b1 = 0, b2 = 0, b3 = 0, cen = 0;
            for (int i = 0; i < 4; i++) {
                double v = base[o + i];
                b1 += tw[i] * v;
                b2 += tw[4 + i] * v;
                b3 += tw[8 + i] * v;
                cen += cw[i] * v;
            }
            b1 = Math.abs(b1);
            b2 = Math.abs(b2);
            b3 = Math.abs(b3);
            cen -= base[top];
            for (int l = 0; l < r; l++) {
                int bo = (l * np + j) * 3;
                double sl = sm[l];
                b1 += sl * Math.abs(dirBeta[bo]);
                b2 += sl * Math.abs(dirBeta[bo + 1]);
                b3 += sl * Math.abs(dirBeta[bo + 2]);
                cen += sl * Math.abs(dirCentre[l * np + j] - bt[l * m + top]);
            }
            double lift = Math.min(40.0, cen + 0.5 * b1 + 0.25 * b2 + 0.125 * b3);
            sum += nr.ruleConstant * nr.width[j] * e8(b1, b2, b3) * Kernels.expFast(lift);
        }
        return sum;
    }
}
