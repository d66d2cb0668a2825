package io.densa.core.internal;

import java.util.Arrays;
import jdk.incubator.vector.DoubleVector;
import jdk.incubator.vector.VectorMask;
import jdk.incubator.vector.VectorOperators;
import jdk.incubator.vector.VectorSpecies;

/**
 * The K × K algebra of {@link VectorLanes}: Cholesky factors, solves and the sandwich covariance,
 * one matrix per lane (entry x of lane l at {@code x · L + l}), each lane with the operations of
 * the one-unit code ({@link Cholesky#factor}, {@link Cholesky#solve}, {@link Cholesky#invertLower}
 * and {@code NewtonCovariance.sandwich}) in the same order.
 */
final class LaneAlgebra {
    private static final VectorSpecies<Double> S = DoubleVector.SPECIES_PREFERRED;
    private static final int L = S.length();

    private LaneAlgebra() {
    }

    /**
     * L Lᵀ x = b for every lane, in place: forward substitution row by row (each row's terms in
     * increasing order, as {@link Cholesky#forward}'s blocks of four do), then back substitution
     * as {@link Cholesky#backward}; each product rounded before its subtraction, as in Java's
     * scalar arithmetic.
     */
    static void solve(double[] a, int n, int s, double[] x) {
        for (int i = 0; i < n; i++) {
            int ri = i * s;
            DoubleVector v = DoubleVector.fromArray(S, x, i * L);
            for (int p = 0; p < i; p++) {
                v = v.sub(DoubleVector.fromArray(S, a, (ri + p) * L).mul(DoubleVector.fromArray(S, x, p * L)));
            }
            v.div(DoubleVector.fromArray(S, a, (ri + i) * L)).intoArray(x, i * L);
        }
        for (int i = n - 1; i >= 0; i--) {
            DoubleVector v = DoubleVector.fromArray(S, x, i * L);
            for (int p = i + 1; p < n; p++) {
                v = v.sub(DoubleVector.fromArray(S, a, (p * s + i) * L).mul(DoubleVector.fromArray(S, x, p * L)));
            }
            v.div(DoubleVector.fromArray(S, a, (i * s + i) * L)).intoArray(x, i * L);
        }
    }

    /** See {@link UnitLanes#finishDerivatives}. */
    static void finishDerivatives(int k, int k1, int[] bandLo, double[] grad, double[] hess, double[] mvec,
            double[] c, double[] beta, double[] prior, int[] priorRows, double[] pen, int[] penRows,
            double[] twoLambda, double[] factor, double[] rhs) {
        DoubleVector cv = DoubleVector.fromArray(S, c, 0);
        DoubleVector tl = DoubleVector.fromArray(S, twoLambda, 0);
        for (int i = 0; i < k; i++) {
            // the rank-one term (its factor c·m_i rounded first), then the prior's and the penalty's curvature
            DoubleVector mi = cv.mul(DoubleVector.fromArray(S, mvec, i * L));
            int row = i * k1, o = i * k, lo = bandLo[i];
            int qLo = prior == null ? 0 : priorRows[2 * i], qHi = prior == null ? 0 : priorRows[2 * i + 1];
            int pLo = penRows[2 * i], pHi = penRows[2 * i + 1];
            for (int j = 0; j <= i; j++) {
                DoubleVector h = j < lo ? DoubleVector.zero(S) : DoubleVector.fromArray(S, hess, (row + j) * L);
                h = h.sub(mi.mul(DoubleVector.fromArray(S, mvec, j * L)));
                if (j >= qLo && j < qHi) {
                    h = h.add(2.0 * prior[o + j]);
                }
                if (j >= pLo && j < pHi) {
                    h = h.add(tl.mul(pen[o + j]));
                }
                h.intoArray(factor, (row + j) * L);
            }
            // the gradient: + the linear term (0 for counts), − 2 (Qβ)_i, − 2λ (Pβ)_i, each sum in column order
            DoubleVector g = DoubleVector.fromArray(S, grad, i * L).add(0.0);
            if (prior != null) {
                DoubleVector r = DoubleVector.zero(S);
                for (int j = qLo; j < qHi; j++) {
                    r = r.add(DoubleVector.fromArray(S, beta, j * L).mul(prior[o + j]));
                }
                g = g.sub(r.mul(2.0));
            }
            DoubleVector r = DoubleVector.zero(S);
            for (int j = pLo; j < pHi; j++) {
                r = r.add(DoubleVector.fromArray(S, beta, j * L).mul(pen[o + j]));
            }
            g.sub(tl.mul(r)).intoArray(rhs, i * L);
        }
    }

    /** See {@link UnitLanes#start}: four coefficients at a time, each summed over the bins in order. */
    static void start(double[] map, double[] constant, int k, double[] logs, double[] beta) {
        final int d = logs.length / L;
        int i = 0;
        for (; i + 3 < k; i += 4) {
            int o0 = i * d, o1 = o0 + d, o2 = o1 + d, o3 = o2 + d;
            DoubleVector b0 = DoubleVector.broadcast(S, constant[i]), b1 = DoubleVector.broadcast(S, constant[i + 1]);
            DoubleVector b2 = DoubleVector.broadcast(S, constant[i + 2]);
            DoubleVector b3 = DoubleVector.broadcast(S, constant[i + 3]);
            for (int j = 0; j < d; j++) {
                DoubleVector lj = DoubleVector.fromArray(S, logs, j * L);
                b0 = b0.add(lj.mul(map[o0 + j]));
                b1 = b1.add(lj.mul(map[o1 + j]));
                b2 = b2.add(lj.mul(map[o2 + j]));
                b3 = b3.add(lj.mul(map[o3 + j]));
            }
            b0.intoArray(beta, i * L);
            b1.intoArray(beta, (i + 1) * L);
            b2.intoArray(beta, (i + 2) * L);
            b3.intoArray(beta, (i + 3) * L);
        }
        for (; i < k; i++) {
            DoubleVector b = DoubleVector.broadcast(S, constant[i]);
            for (int j = 0, o = i * d; j < d; j++) {
                b = b.add(DoubleVector.fromArray(S, logs, j * L).mul(map[o + j]));
            }
            b.intoArray(beta, i * L);
        }
        Arrays.fill(beta, k * L, (k + 1) * L, 0.0);
    }

    /** See {@link UnitLanes#coordinateNorm}: row by row, each row's sum over its columns in order. */
    static void coordinateNorm(double[] u, int k, double[] v, double[] out, int o) {
        DoubleVector m = DoubleVector.zero(S);
        for (int i = 0; i < k; i++) {
            DoubleVector s = DoubleVector.zero(S);
            for (int j = i, r = i * k; j < k; j++) {
                s = s.add(DoubleVector.fromArray(S, v, j * L).mul(u[r + j]));
            }
            m = m.max(s.abs());
        }
        m.intoArray(out, o);
    }

    /** See {@link UnitLanes#quadraticForm}. */
    static void quadraticForm(double[] m, int[] rows, int k, double[] b, double[] out, int o) {
        DoubleVector s = DoubleVector.zero(S);
        for (int i = 0; i < k; i++) {
            DoubleVector r = DoubleVector.zero(S);
            for (int j = rows[2 * i], hi = rows[2 * i + 1], r0 = i * k; j < hi; j++) {
                r = r.add(DoubleVector.fromArray(S, b, j * L).mul(m[r0 + j]));
            }
            s = s.add(DoubleVector.fromArray(S, b, i * L).mul(r));
        }
        s.intoArray(out, o);
    }

    /** See {@link UnitLanes#fisherInformation}. */
    static void fisherInformation(int k1, int[] bandLo, double[] hess, double[] mvec, double[] totals, double[] zs,
            double[] twoLambda, double[] pen, double[] prior, double[] fisher, double[] jm) {
        final int n = k1 - 1;
        final DoubleVector zero = DoubleVector.zero(S);
        DoubleVector z = DoubleVector.fromArray(S, zs, 0);
        DoubleVector c = DoubleVector.fromArray(S, totals, 0).div(z.mul(z));
        DoubleVector tl = DoubleVector.fromArray(S, twoLambda, 0);
        for (int i = 0; i < n; i++) {
            DoubleVector mi = c.mul(DoubleVector.fromArray(S, mvec, i * L));
            int lo = bandLo[i];
            for (int l = 0; l <= i; l++) {
                DoubleVector h = l < lo ? zero : DoubleVector.fromArray(S, hess, (i * k1 + l) * L);
                DoubleVector f = h.sub(mi.mul(DoubleVector.fromArray(S, mvec, l * L)));
                int a = i * n + l, b = l * n + i;
                f.intoArray(fisher, a * L);
                f.intoArray(fisher, b * L);
                f.add(tl.mul(pen[a])).add(prior == null ? 0.0 : 2 * prior[a]).add(0.0).intoArray(jm, a * L);
                f.add(tl.mul(pen[b])).add(prior == null ? 0.0 : 2 * prior[b]).add(0.0).intoArray(jm, b * L);
            }
        }
    }

    /** See {@link UnitLanes#meat}. */
    static void meat(int n, double[] meat, double[] fisher, double[] scale) {
        DoubleVector sc = DoubleVector.fromArray(S, scale, 0);
        VectorMask<Double> robust = sc.test(VectorOperators.IS_FINITE);
        for (int o = 0; o < n * n * L; o += L) {
            DoubleVector f = DoubleVector.fromArray(S, fisher, o);
            f.blend(DoubleVector.fromArray(S, meat, o).mul(sc), robust).intoArray(meat, o);
        }
    }

    static void cholesky(double[] a, int n, int s, double minRelativePivot, int[] failed) {
        Arrays.fill(failed, 0, L, -1);
        double[] pivot = new double[n * L];
        for (int i = 0; i < n; i++) {
            System.arraycopy(a, (i * s + i) * L, pivot, i * L, L);
        }
        for (int j = 0; j < n; j++) {
            int rj = j * s;
            DoubleVector ajj = DoubleVector.fromArray(S, a, (rj + j) * L);
            DoubleVector d = DoubleVector.fromArray(S, pivot, j * L);
            DoubleVector floor = minRelativePivot == 0 ? DoubleVector.zero(S) : ajj.abs().mul(minRelativePivot);
            VectorMask<Double> ok = d.compare(VectorOperators.GT, floor)
                    .and(d.compare(VectorOperators.NE, Double.POSITIVE_INFINITY));
            if (!ok.allTrue()) {
                for (int l = 0; l < L; l++) {
                    if (!ok.laneIsSet(l) && failed[l] < 0) {
                        failed[l] = j;
                    }
                }
            }
            d = d.sqrt();
            d.intoArray(a, (rj + j) * L);
            DoubleVector inv = DoubleVector.broadcast(S, 1.0).div(d);
            int i = j + 1;
            for (; i + 3 < n; i += 4) {
                int r0 = i * s, r1 = r0 + s, r2 = r1 + s, r3 = r2 + s;
                DoubleVector v0 = DoubleVector.fromArray(S, a, (r0 + j) * L);
                DoubleVector v1 = DoubleVector.fromArray(S, a, (r1 + j) * L);
                DoubleVector v2 = DoubleVector.fromArray(S, a, (r2 + j) * L);
                DoubleVector v3 = DoubleVector.fromArray(S, a, (r3 + j) * L);
                for (int p = 0; p < j; p++) {
                    DoubleVector b = DoubleVector.fromArray(S, a, (rj + p) * L);
                    v0 = v0.sub(DoubleVector.fromArray(S, a, (r0 + p) * L).mul(b));
                    v1 = v1.sub(DoubleVector.fromArray(S, a, (r1 + p) * L).mul(b));
                    v2 = v2.sub(DoubleVector.fromArray(S, a, (r2 + p) * L).mul(b));
                    v3 = v3.sub(DoubleVector.fromArray(S, a, (r3 + p) * L).mul(b));
                }
                DoubleVector l0 = v0.mul(inv), l1 = v1.mul(inv), l2 = v2.mul(inv), l3 = v3.mul(inv);
                l0.intoArray(a, (r0 + j) * L);
                l1.intoArray(a, (r1 + j) * L);
                l2.intoArray(a, (r2 + j) * L);
                l3.intoArray(a, (r3 + j) * L);
                DoubleVector.fromArray(S, pivot, i * L).sub(l0.mul(l0)).intoArray(pivot, i * L);
                DoubleVector.fromArray(S, pivot, (i + 1) * L).sub(l1.mul(l1)).intoArray(pivot, (i + 1) * L);
                DoubleVector.fromArray(S, pivot, (i + 2) * L).sub(l2.mul(l2)).intoArray(pivot, (i + 2) * L);
                DoubleVector.fromArray(S, pivot, (i + 3) * L).sub(l3.mul(l3)).intoArray(pivot, (i + 3) * L);
            }
            for (; i < n; i++) {
                int ri = i * s;
                DoubleVector v = DoubleVector.fromArray(S, a, (ri + j) * L);
                for (int p = 0; p < j; p++) {
                    v = v.sub(DoubleVector.fromArray(S, a, (ri + p) * L)
                            .mul(DoubleVector.fromArray(S, a, (rj + p) * L)));
                }
                DoubleVector l = v.mul(inv);
                l.intoArray(a, (ri + j) * L);
                DoubleVector.fromArray(S, pivot, i * L).sub(l.mul(l)).intoArray(pivot, i * L);
            }
        }
    }

    static void covarianceStart(int n, double[] j, double[] fisher, double[] linv, double[] t1, double[] edf,
            int[] failed) {
        cholesky(j, n, n, 0.0, failed);
        // L⁻¹ column by column (Cholesky.invertLower)
        Arrays.fill(linv, 0, n * n * L, 0.0);
        for (int c = 0; c < n; c++) {
            for (int i = c; i < n; i++) {
                DoubleVector s = DoubleVector.broadcast(S, i == c ? 1.0 : 0.0);
                for (int p = c; p < i; p++) {
                    s = s.sub(DoubleVector.fromArray(S, j, (i * n + p) * L)
                            .mul(DoubleVector.fromArray(S, linv, (p * n + c) * L)));
                }
                s.div(DoubleVector.fromArray(S, j, (i * n + i) * L)).intoArray(linv, (i * n + c) * L);
            }
        }
        whitenLeft(n, fisher, linv, t1);
        DoubleVector tr = DoubleVector.zero(S);
        for (int i = 0; i < n; i++) {
            DoubleVector s = DoubleVector.zero(S);
            for (int p = 0; p <= i; p++) {
                s = s.add(DoubleVector.fromArray(S, t1, (i * n + p) * L)
                        .mul(DoubleVector.fromArray(S, linv, (i * n + p) * L)));
            }
            tr = tr.add(s);
        }
        tr.intoArray(edf, 0);
    }

    static void covarianceFinish(int n, double[] linv, double[] meat, double[] u, double[] t1, double[] wm,
            double[] m, double[] t2, double[] cov) {
        whitenLeft(n, meat, linv, t1);
        symmetricProduct(n, t1, linv, false, wm); // w_ic = Σ_{p ≤ c} t1_ip linv_cp
        // m = U L⁻ᵀ (upper): m_ic = Σ_{i ≤ p ≤ c} u_ip linv_cp
        Arrays.fill(m, 0, n * n * L, 0.0);
        for (int i = 0; i < n; i++) {
            for (int c = i; c < n; c++) {
                DoubleVector s = DoubleVector.zero(S);
                for (int p = i; p <= c; p++) {
                    s = s.add(DoubleVector.fromArray(S, linv, (c * n + p) * L).mul(u[i * n + p]));
                }
                s.intoArray(m, (i * n + c) * L);
            }
        }
        rowProduct(n, m, wm, true, t2); // t2 = m W: t2_ic = Σ_{p ≥ i} m_ip w_pc
        symmetricProduct(n, t2, m, true, cov); // cov = t2 mᵀ: cov_ic = Σ_{p ≥ c} t2_ip m_cp
    }

    /**
     * out_ic = out_ci = Σ_p a_ip b_cp for c ≤ i (n × n per lane), each sum over p in increasing order:
     * p ≤ c, or p ≥ c when fromC; four rows at a time share b_cp.
     */
    private static void symmetricProduct(int n, double[] a, double[] b, boolean fromC, double[] out) {
        for (int c = 0; c < n; c++) {
            int lo = fromC ? c : 0, hi = fromC ? n : c + 1;
            int i = c;
            for (; i + 3 < n; i += 4) {
                DoubleVector s0 = DoubleVector.zero(S), s1 = s0, s2 = s0, s3 = s0;
                for (int p = lo; p < hi; p++) {
                    DoubleVector bc = DoubleVector.fromArray(S, b, (c * n + p) * L);
                    s0 = s0.add(DoubleVector.fromArray(S, a, (i * n + p) * L).mul(bc));
                    s1 = s1.add(DoubleVector.fromArray(S, a, ((i + 1) * n + p) * L).mul(bc));
                    s2 = s2.add(DoubleVector.fromArray(S, a, ((i + 2) * n + p) * L).mul(bc));
                    s3 = s3.add(DoubleVector.fromArray(S, a, ((i + 3) * n + p) * L).mul(bc));
                }
                s0.intoArray(out, (i * n + c) * L);
                s0.intoArray(out, (c * n + i) * L);
                s1.intoArray(out, ((i + 1) * n + c) * L);
                s1.intoArray(out, (c * n + i + 1) * L);
                s2.intoArray(out, ((i + 2) * n + c) * L);
                s2.intoArray(out, (c * n + i + 2) * L);
                s3.intoArray(out, ((i + 3) * n + c) * L);
                s3.intoArray(out, (c * n + i + 3) * L);
            }
            for (; i < n; i++) {
                DoubleVector sum = DoubleVector.zero(S);
                for (int p = lo; p < hi; p++) {
                    sum = sum.add(DoubleVector.fromArray(S, a, (i * n + p) * L)
                            .mul(DoubleVector.fromArray(S, b, (c * n + p) * L)));
                }
                sum.intoArray(out, (i * n + c) * L);
                sum.intoArray(out, (c * n + i) * L);
            }
        }
    }

    /** t1 = L⁻¹ a: t1_ic = Σ_{p ≤ i} linv_ip a_pc (NewtonCovariance.whitenLeft). */
    private static void whitenLeft(int n, double[] a, double[] linv, double[] t1) {
        rowProduct(n, linv, a, false, t1);
    }

    /**
     * out_ic = Σ_p a_ip b_pc (n × n per lane), each sum over p in increasing order: p ≤ i, or p ≥ i
     * when fromI; four columns at a time share a_ip.
     */
    private static void rowProduct(int n, double[] a, double[] b, boolean fromI, double[] out) {
        for (int i = 0; i < n; i++) {
            int lo = fromI ? i : 0, hi = fromI ? n : i + 1;
            int c = 0;
            for (; c + 3 < n; c += 4) {
                DoubleVector s0 = DoubleVector.zero(S), s1 = s0, s2 = s0, s3 = s0;
                for (int p = lo; p < hi; p++) {
                    DoubleVector ai = DoubleVector.fromArray(S, a, (i * n + p) * L);
                    int o = (p * n + c) * L;
                    s0 = s0.add(ai.mul(DoubleVector.fromArray(S, b, o)));
                    s1 = s1.add(ai.mul(DoubleVector.fromArray(S, b, o + L)));
                    s2 = s2.add(ai.mul(DoubleVector.fromArray(S, b, o + 2 * L)));
                    s3 = s3.add(ai.mul(DoubleVector.fromArray(S, b, o + 3 * L)));
                }
                int o = (i * n + c) * L;
                s0.intoArray(out, o);
                s1.intoArray(out, o + L);
                s2.intoArray(out, o + 2 * L);
                s3.intoArray(out, o + 3 * L);
            }
            for (; c < n; c++) {
                DoubleVector sum = DoubleVector.zero(S);
                for (int p = lo; p < hi; p++) {
                    sum = sum.add(DoubleVector.fromArray(S, a, (i * n + p) * L)
                            .mul(DoubleVector.fromArray(S, b, (p * n + c) * L)));
                }
                sum.intoArray(out, (i * n + c) * L);
            }
        }
    }
}
