package io.densa.spatial.uncertainty;

import io.densa.core.internal.Kernels;

/**
 * The node rule's per-draw error estimates of every panel (package-private; one per thread, with
 * its work arrays): h C e_{2q}(|β|) exp(c_max − shift), see {@link NodeRule}, vectorised over the
 * draws of a block (rows of node values indexed from 0, as in {@link DrawEngine}).
 */
final class PanelErrors {
    private final NodeRule rule;
    private final double[] beta;
    private final double[] series;
    private final double[] hi;
    private final double[][] panelTop;

    PanelErrors(NodeRule rule, int width) {
        this.rule = rule;
        beta = new double[Math.max(1, rule.q - 1) * width];
        series = new double[(2 * rule.q + 1) * width];
        hi = new double[width];
        panelTop = new double[rule.panels][width];
    }

    /**
     * 4-point panels: the error estimate of {@link #general} with e_8 in closed form into rp;
     * each loop is short and unit-stride over the draws so that the JIT vectorises it.
     */
    void four(double[][] y, double[] mx, double[][] rp, int nc) {
        NodeRule nr = rule;
        int np = nr.panels;
        double[] tw = nr.taylor;
        double[] cw = nr.centreWeights;
        double m0 = cw[0], m1 = cw[1], m2 = cw[2], m3 = cw[3];
        double a0 = tw[0], a1 = tw[1], a2 = tw[2], a3 = tw[3];
        double b0 = tw[4], b1 = tw[5], b2 = tw[6], b3 = tw[7];
        double c0 = tw[8], c1 = tw[9], c2 = tw[10], c3 = tw[11];
        double[] ta = beta, tb = series, tc = hi;
        for (int j = 0; j < np; j++) {
            double[] y0 = y[4 * j], y1 = y[4 * j + 1], y2 = y[4 * j + 2], y3 = y[4 * j + 3], rj = rp[j], tt = panelTop[j];
            double cj = nr.ruleConstant * nr.width[j];
            // |β₁|, |β₂|, |β₃| and the largest clr value (nodes and ends), in separate short loops
            for (int d = 0; d < nc; d++) {
                ta[d] = Math.abs(a0 * y0[d] + a1 * y1[d] + a2 * y2[d] + a3 * y3[d]);
            }
            for (int d = 0; d < nc; d++) {
                tb[d] = Math.abs(b0 * y0[d] + b1 * y1[d] + b2 * y2[d] + b3 * y3[d]);
            }
            for (int d = 0; d < nc; d++) {
                tc[d] = Math.abs(c0 * y0[d] + c1 * y1[d] + c2 * y2[d] + c3 * y3[d]);
            }
            // the largest clr value on the panel is at most c(½) + |β₁|/2 + |β₂|/4 + |β₃|/8 (exact for a cubic)
            for (int d = 0; d < nc; d++) {
                tt[d] = Math.min(40.0, m0 * y0[d] + m1 * y1[d] + m2 * y2[d] + m3 * y3[d] + 0.5 * ta[d] + 0.25 * tb[d]
                        + 0.125 * tc[d] - mx[d]);
            }
            // e_8 of exp(a t + b t² + c t³): Σ_{i+2j+3k=8} a^i b^j c^k / (i! j! k!)
            for (int d = 0; d < nc; d++) {
                double a = ta[d], b = tb[d], c = tc[d];
                double aa = a * a, a4 = aa * aa, bb = b * b, cc = c * c;
                rj[d] = cj * (a4 * a4 * (1.0 / 40320) + a4 * aa * b * (1.0 / 720) + a4 * bb * (1.0 / 48)
                        + aa * bb * b * (1.0 / 12) + bb * bb * (1.0 / 24) + a4 * a * c * (1.0 / 120)
                        + aa * a * b * c * (1.0 / 6) + a * bb * c * 0.5 + aa * cc * 0.25 + b * cc * 0.5);
            }
            for (int d = 0; d < nc; d++) {
                rj[d] *= Kernels.expFast(tt[d]);
            }
        }
    }

    /**
     * Error estimates of every panel and draw into rp[j][d]. A panel whose clr stays more than
     * 60 below every draw's largest node value (nodes and ends) is skipped: its estimate carries
     * the factor e^−60 ≈ 10⁻²⁶.
     */
    void general(double[][] y, double[] mx, double[][] rp, int nc) {
        NodeRule nr = rule;
        int q = nr.q, np = nr.panels;
        double[] ew = nr.endWeights;
        double[] tw = nr.taylor;
        double[] beta = this.beta;
        double[] ser = series;
        double[] hi = this.hi;
        int nb = q - 1;
        int two = 2 * q;
        for (int j = 0; j < np; j++) {
            double[] rj = rp[j];
            System.arraycopy(y[j * q], 0, hi, 0, nc);
            java.util.Arrays.fill(ser, 0, 2 * nc, 0.0);
            for (int i = 0; i < q; i++) {
                double[] yi = y[j * q + i];
                double w0 = ew[i], w1 = ew[q + i];
                for (int d = 0; d < nc; d++) {
                    double v = yi[d];
                    hi[d] = Math.max(hi[d], v);
                    ser[d] += w0 * v;
                    ser[nc + d] += w1 * v;
                }
            }
            double top = Double.NEGATIVE_INFINITY;
            for (int d = 0; d < nc; d++) {
                hi[d] = Math.max(hi[d], Math.max(ser[d], ser[nc + d])) - mx[d];
                top = Math.max(top, hi[d]);
            }
            if (!(top > -60)) {
                continue;
            }
            java.util.Arrays.fill(beta, 0);
            for (int i = 0; i < q; i++) {
                double[] yi = y[j * q + i];
                for (int mm = 0; mm < nb; mm++) {
                    double t = tw[mm * q + i];
                    int bo = mm * nc;
                    for (int d = 0; d < nc; d++) {
                        beta[bo + d] += t * yi[d];
                    }
                }
            }
            double cj = nr.ruleConstant * nr.width[j];
            if (q == 4) {
                // e_8 of exp(a t + b t² + c t³) in closed form: Σ_{i+2j+3k=8} a^i b^j c^k / (i! j! k!)
                for (int d = 0; d < nc; d++) {
                    double a = Math.abs(beta[d]), b = Math.abs(beta[nc + d]), c = Math.abs(beta[2 * nc + d]);
                    double a2 = a * a, a3 = a2 * a, a4 = a2 * a2, b2 = b * b, c2 = c * c;
                    double e8 = a4 * a4 / 40320 + a4 * a2 * b / 720 + a4 * b2 / 48 + a2 * b2 * b / 12 + b2 * b2 / 24
                            + a4 * a * c / 120 + a3 * b * c / 6 + a * b2 * c / 2 + a2 * c2 / 4 + b * c2 / 2;
                    rj[d] = cj * e8 * Kernels.expFast(Math.min(40.0, hi[d]));
                }
                continue;
            }
            for (int i = 0; i < beta.length; i++) {
                beta[i] = Math.abs(beta[i]);
            }
            // power series of exp(Σ_m |β_m| t^m): n e_n = Σ_m m |β_m| e_{n−m}, e_0 = 1, rows of ser
            java.util.Arrays.fill(ser, 0, nc, 1.0);
            for (int kk = 1; kk <= two; kk++) {
                int eo = kk * nc;
                java.util.Arrays.fill(ser, eo, eo + nc, 0.0);
                for (int mm = 1; mm <= nb && mm <= kk; mm++) {
                    int bo = (mm - 1) * nc, po2 = (kk - mm) * nc;
                    double f = (double) mm / kk;
                    for (int d = 0; d < nc; d++) {
                        ser[eo + d] += f * beta[bo + d] * ser[po2 + d];
                    }
                }
            }
            int eo = two * nc;
            for (int d = 0; d < nc; d++) {
                rj[d] = cj * ser[eo + d] * Kernels.expFast(Math.min(40.0, hi[d]));
            }
        }
    }
}
