package io.densa.core.internal;

import io.densa.core.internal.UnitLanes.Layout;
import java.util.Arrays;
import jdk.incubator.vector.DoubleVector;
import jdk.incubator.vector.VectorMask;
import jdk.incubator.vector.VectorOperators;
import jdk.incubator.vector.VectorSpecies;

/**
 * The node passes of {@link VectorLanes} that the sandwich covariance reads once per unit: the
 * expected (Fisher) information and the empirical (model-robust) information, each lane with the
 * operations of the one-unit pass in the same order (see {@link VectorLanes}).
 */
final class CovarianceLanes {
    private static final VectorSpecies<Double> S = DoubleVector.SPECIES_PREFERRED;
    private static final int L = S.length();

    private CovarianceLanes() {
    }

    private static DoubleVector fromAcc(double[] acc, int v) {
        return DoubleVector.fromArray(S, acc, v * L);
    }

    static void expectedInformation(Layout lay, double[] totals, double[] ex, double[] mass, double[] zs,
            double[] hess, double[] mvec, double[] uj) {
        final int k1 = lay.k1();
        VectorLanes.zeroBand(lay, hess);
        Arrays.fill(mvec, 0, k1 * L, 0.0);
        final DoubleVector tot = DoubleVector.fromArray(S, totals, 0), z = DoubleVector.fromArray(S, zs, 0);
        double[] acc = new double[VectorLanes.ACC * L];
        double[] unused = new double[k1 * L]; // the gradient's sums (not computed: zero)
        final int bins = lay.bins();
        final int[] binLo = lay.binLo();
        final boolean[] oneSpan = lay.oneSpan();
        int fcur = -1;
        for (int j = 0; j < bins; ) {
            int lo = binLo[j];
            if (oneSpan[j]) {
                if (lo != fcur) {
                    if (fcur >= 0) {
                        VectorLanes.flush(fcur, k1, unused, hess, mvec, acc);
                    }
                    fcur = lo;
                    Arrays.fill(acc, 0.0);
                }
                int j1 = j + 1;
                while (j1 < bins && oneSpan[j1] && binLo[j1] == lo) {
                    j1++;
                }
                expectedSpanBins(lay, j, j1, mass, tot, z, ex, acc);
                j = j1;
                continue;
            }
            expectedGeneralBin(lay, j, mass, tot, z, ex, hess, mvec, uj);
            j++;
        }
        if (fcur >= 0) {
            VectorLanes.flush(fcur, k1, unused, hess, mvec, acc);
        }
    }

    /**
     * Bins j0..j1−1 inside the current span: moments and rank-one terms of the expected information.
     * Its own method on purpose: {@link VectorLanes#spanBins} with a flag for both passes measured 1.8× slower
     * (the JIT then boxed the vectors), and again 0.53× with the operator tables primed (session
     * 18; no failed intrinsic then: the vectors merged from the flag's two branches).
     */
    private static void expectedSpanBins(Layout lay, int j0, int j1, double[] mass, DoubleVector tot,
            DoubleVector z, double[] ex, double[] acc) {
        final double[] c0 = lay.column()[0], c1 = lay.column()[1], c2 = lay.column()[2], c3 = lay.column()[3];
        final int[] start = lay.binStart();
        DoubleVector h00 = fromAcc(acc, 0), h10 = fromAcc(acc, 1), h11 = fromAcc(acc, 2), h20 = fromAcc(acc, 3);
        DoubleVector h21 = fromAcc(acc, 4), h22 = fromAcc(acc, 5), h30 = fromAcc(acc, 6), h31 = fromAcc(acc, 7);
        DoubleVector h32 = fromAcc(acc, 8), h33 = fromAcc(acc, 9), s0 = fromAcc(acc, 14), s1 = fromAcc(acc, 15);
        DoubleVector s2 = fromAcc(acc, 16), s3 = fromAcc(acc, 17);
        final DoubleVector zero = DoubleVector.zero(S);
        for (int j = j0; j < j1; j++) {
            DoubleVector a = DoubleVector.fromArray(S, mass, j * L);
            VectorMask<Double> positive = a.compare(VectorOperators.GT, 0.0);
            DoubleVector u0 = zero, u1 = zero, u2 = zero, u3 = zero;
            for (int q = start[j]; q < start[j + 1]; q++) {
                DoubleVector e = DoubleVector.fromArray(S, ex, q * L);
                u0 = e.fma(DoubleVector.broadcast(S, c0[q]), u0);
                u1 = e.fma(DoubleVector.broadcast(S, c1[q]), u1);
                u2 = e.fma(DoubleVector.broadcast(S, c2[q]), u2);
                u3 = e.fma(DoubleVector.broadcast(S, c3[q]), u3);
            }
            s0 = s0.add(u0);
            s1 = s1.add(u1);
            s2 = s2.add(u2);
            s3 = s3.add(u3);
            DoubleVector coef = tot.div(z.mul(a));
            DoubleVector x0 = coef.mul(u0), x1 = coef.mul(u1), x2 = coef.mul(u2), x3 = coef.mul(u3);
            h00 = h00.blend(x0.fma(u0, h00), positive);
            h10 = h10.blend(x1.fma(u0, h10), positive);
            h11 = h11.blend(x1.fma(u1, h11), positive);
            h20 = h20.blend(x2.fma(u0, h20), positive);
            h21 = h21.blend(x2.fma(u1, h21), positive);
            h22 = h22.blend(x2.fma(u2, h22), positive);
            h30 = h30.blend(x3.fma(u0, h30), positive);
            h31 = h31.blend(x3.fma(u1, h31), positive);
            h32 = h32.blend(x3.fma(u2, h32), positive);
            h33 = h33.blend(x3.fma(u3, h33), positive);
        }
        h00.intoArray(acc, 0);
        h10.intoArray(acc, L);
        h11.intoArray(acc, 2 * L);
        h20.intoArray(acc, 3 * L);
        h21.intoArray(acc, 4 * L);
        h22.intoArray(acc, 5 * L);
        h30.intoArray(acc, 6 * L);
        h31.intoArray(acc, 7 * L);
        h32.intoArray(acc, 8 * L);
        h33.intoArray(acc, 9 * L);
        s0.intoArray(acc, 14 * L);
        s1.intoArray(acc, 15 * L);
        s2.intoArray(acc, 16 * L);
        s3.intoArray(acc, 17 * L);
    }

    /** A bin across knots for the expected information: its moments uj, added to mvec, and its rank-one term. */
    private static void expectedGeneralBin(Layout lay, int j, double[] mass, DoubleVector tot, DoubleVector z,
            double[] ex, double[] hess, double[] mvec, double[] uj) {
        final double[] c0 = lay.column()[0], c1 = lay.column()[1], c2 = lay.column()[2], c3 = lay.column()[3];
        final int k1 = lay.k1();
        int lo = lay.binLo()[j], hi = lay.binHi()[j];
        DoubleVector a = DoubleVector.fromArray(S, mass, j * L);
        VectorMask<Double> positive = a.compare(VectorOperators.GT, 0.0);
        DoubleVector coef = tot.div(z.mul(a));
        Arrays.fill(uj, lo * L, hi * L, 0.0);
        for (int q = lay.binStart()[j]; q < lay.binStart()[j + 1]; q++) {
            DoubleVector e = DoubleVector.fromArray(S, ex, q * L);
            int o = lay.first()[q] * L;
            e.fma(DoubleVector.broadcast(S, c0[q]), DoubleVector.fromArray(S, uj, o)).intoArray(uj, o);
            e.fma(DoubleVector.broadcast(S, c1[q]), DoubleVector.fromArray(S, uj, o + L)).intoArray(uj, o + L);
            e.fma(DoubleVector.broadcast(S, c2[q]), DoubleVector.fromArray(S, uj, o + 2 * L))
                    .intoArray(uj, o + 2 * L);
            e.fma(DoubleVector.broadcast(S, c3[q]), DoubleVector.fromArray(S, uj, o + 3 * L))
                    .intoArray(uj, o + 3 * L);
        }
        for (int i = lo; i < hi; i++) {
            DoubleVector.fromArray(S, mvec, i * L).add(DoubleVector.fromArray(S, uj, i * L)).intoArray(mvec, i * L);
        }
        for (int i = lo; i < hi; i++) {
            DoubleVector ui = coef.mul(DoubleVector.fromArray(S, uj, i * L));
            for (int l = lo; l <= i; l++) {
                int o = (i * k1 + l) * L;
                DoubleVector h = DoubleVector.fromArray(S, hess, o);
                h.blend(h.add(ui.mul(DoubleVector.fromArray(S, uj, l * L))), positive).intoArray(hess, o);
            }
        }
    }

    static void empiricalInformation(Layout lay, double[] counts, double[] totals, double[] ex, double[] mass,
            double[] mvec, double[] uj, double[] meat) {
        final int k = lay.k1() - 1;
        Arrays.fill(meat, 0, k * k * L, 0.0);
        Arrays.fill(mvec, 0, k * L, 0.0);
        double[] acc = new double[14 * L]; // the span's block h00 … h33 and moments s0 … s3
        final int bins = lay.bins();
        final int[] binLo = lay.binLo();
        final boolean[] oneSpan = lay.oneSpan();
        int fcur = -1;
        for (int j = 0; j < bins; ) {
            int lo = binLo[j];
            if (oneSpan[j] && lo + 4 <= k) {
                if (lo != fcur) {
                    if (fcur >= 0) {
                        addSpan(fcur, k, meat, mvec, acc);
                    }
                    fcur = lo;
                    Arrays.fill(acc, 0.0);
                }
                int j1 = j + 1;
                while (j1 < bins && oneSpan[j1] && binLo[j1] == lo) {
                    j1++;
                }
                empiricalSpanBins(lay, j, j1, counts, mass, ex, acc);
                j = j1;
            } else {
                empiricalGeneralBin(lay, j, k, counts, mass, ex, mvec, uj, meat);
                j++;
            }
        }
        if (fcur >= 0) {
            addSpan(fcur, k, meat, mvec, acc);
        }
        // − (1/N) t tᵀ on the lower triangle (EstimationSupport.subtractOuter), then the upper one mirrored
        DoubleVector c = DoubleVector.broadcast(S, 1.0).div(DoubleVector.fromArray(S, totals, 0));
        for (int i = 0; i < k; i++) {
            DoubleVector mi = c.mul(DoubleVector.fromArray(S, mvec, i * L));
            for (int l = 0; l <= i; l++) {
                int o = (i * k + l) * L;
                DoubleVector.fromArray(S, meat, o).sub(mi.mul(DoubleVector.fromArray(S, mvec, l * L)))
                        .intoArray(meat, o);
            }
        }
        for (int i = 0; i < k; i++) {
            for (int l = 0; l < i; l++) {
                System.arraycopy(meat, (i * k + l) * L, meat, (l * k + i) * L, L);
            }
        }
    }

    /**
     * Bins j0..j1−1 inside the current span for the empirical information: each occupied bin's
     * mean m_j of the four raw functions, n_j m_j added to the span's moments and n_j m_j m_jᵀ to its block.
     */
    private static void empiricalSpanBins(Layout lay, int j0, int j1, double[] counts, double[] mass, double[] ex,
            double[] acc) {
        final double[] c0 = lay.column()[0], c1 = lay.column()[1], c2 = lay.column()[2], c3 = lay.column()[3];
        final int[] start = lay.binStart();
        DoubleVector h00 = fromAcc(acc, 0), h10 = fromAcc(acc, 1), h11 = fromAcc(acc, 2), h20 = fromAcc(acc, 3);
        DoubleVector h21 = fromAcc(acc, 4), h22 = fromAcc(acc, 5), h30 = fromAcc(acc, 6), h31 = fromAcc(acc, 7);
        DoubleVector h32 = fromAcc(acc, 8), h33 = fromAcc(acc, 9), s0 = fromAcc(acc, 10), s1 = fromAcc(acc, 11);
        DoubleVector s2 = fromAcc(acc, 12), s3 = fromAcc(acc, 13);
        final DoubleVector zero = DoubleVector.zero(S), one = DoubleVector.broadcast(S, 1.0);
        for (int j = j0; j < j1; j++) {
            DoubleVector nj = DoubleVector.fromArray(S, counts, j * L);
            VectorMask<Double> occupied = nj.compare(VectorOperators.GT, 0.0);
            DoubleVector u0 = zero, u1 = zero, u2 = zero, u3 = zero;
            for (int q = start[j]; q < start[j + 1]; q++) {
                DoubleVector e = DoubleVector.fromArray(S, ex, q * L);
                u0 = u0.add(e.mul(DoubleVector.broadcast(S, c0[q])));
                u1 = u1.add(e.mul(DoubleVector.broadcast(S, c1[q])));
                u2 = u2.add(e.mul(DoubleVector.broadcast(S, c2[q])));
                u3 = u3.add(e.mul(DoubleVector.broadcast(S, c3[q])));
            }
            DoubleVector inv = one.div(DoubleVector.fromArray(S, mass, j * L));
            u0 = u0.mul(inv);
            u1 = u1.mul(inv);
            u2 = u2.mul(inv);
            u3 = u3.mul(inv);
            DoubleVector x0 = nj.mul(u0), x1 = nj.mul(u1), x2 = nj.mul(u2), x3 = nj.mul(u3);
            s0 = s0.blend(s0.add(x0), occupied);
            s1 = s1.blend(s1.add(x1), occupied);
            s2 = s2.blend(s2.add(x2), occupied);
            s3 = s3.blend(s3.add(x3), occupied);
            h00 = h00.blend(x0.fma(u0, h00), occupied);
            h10 = h10.blend(x1.fma(u0, h10), occupied);
            h11 = h11.blend(x1.fma(u1, h11), occupied);
            h20 = h20.blend(x2.fma(u0, h20), occupied);
            h21 = h21.blend(x2.fma(u1, h21), occupied);
            h22 = h22.blend(x2.fma(u2, h22), occupied);
            h30 = h30.blend(x3.fma(u0, h30), occupied);
            h31 = h31.blend(x3.fma(u1, h31), occupied);
            h32 = h32.blend(x3.fma(u2, h32), occupied);
            h33 = h33.blend(x3.fma(u3, h33), occupied);
        }
        h00.intoArray(acc, 0);
        h10.intoArray(acc, L);
        h11.intoArray(acc, 2 * L);
        h20.intoArray(acc, 3 * L);
        h21.intoArray(acc, 4 * L);
        h22.intoArray(acc, 5 * L);
        h30.intoArray(acc, 6 * L);
        h31.intoArray(acc, 7 * L);
        h32.intoArray(acc, 8 * L);
        h33.intoArray(acc, 9 * L);
        s0.intoArray(acc, 10 * L);
        s1.intoArray(acc, 11 * L);
        s2.intoArray(acc, 12 * L);
        s3.intoArray(acc, 13 * L);
    }

    /** A bin across knots (or touching the last raw function) for the empirical information, into mvec and meat. */
    private static void empiricalGeneralBin(Layout lay, int j, int k, double[] counts, double[] mass, double[] ex,
            double[] mvec, double[] uj, double[] meat) {
        DoubleVector nj = DoubleVector.fromArray(S, counts, j * L);
        VectorMask<Double> occupied = nj.compare(VectorOperators.GT, 0.0);
        if (!occupied.anyTrue()) {
            return;
        }
        final double[][] col = lay.column();
        int lo = lay.binLo()[j], hi = Math.min(lay.binHi()[j], k);
        Arrays.fill(uj, lo * L, hi * L, 0.0);
        for (int q = lay.binStart()[j]; q < lay.binStart()[j + 1]; q++) {
            DoubleVector e = DoubleVector.fromArray(S, ex, q * L);
            int f = lay.first()[q];
            for (int i = 0; i < 4 && f + i < k; i++) {
                int o = (f + i) * L;
                DoubleVector.fromArray(S, uj, o).add(e.mul(col[i][q])).intoArray(uj, o);
            }
        }
        DoubleVector inv = DoubleVector.broadcast(S, 1.0).div(DoubleVector.fromArray(S, mass, j * L));
        for (int i = lo; i < hi; i++) {
            DoubleVector u = DoubleVector.fromArray(S, uj, i * L).mul(inv);
            u.intoArray(uj, i * L);
            DoubleVector m = DoubleVector.fromArray(S, mvec, i * L);
            m.blend(m.add(nj.mul(u)), occupied).intoArray(mvec, i * L);
        }
        for (int i = lo; i < hi; i++) {
            DoubleVector ui = nj.mul(DoubleVector.fromArray(S, uj, i * L));
            for (int l = lo; l <= i; l++) {
                int o = (i * k + l) * L;
                DoubleVector h = DoubleVector.fromArray(S, meat, o);
                h.blend(h.add(ui.mul(DoubleVector.fromArray(S, uj, l * L))), occupied).intoArray(meat, o);
            }
        }
    }

    /** The span's moments and block added to mvec and meat (K × K) from index f, as {@code BinLayout.addSpan}. */
    private static void addSpan(int f, int k, double[] meat, double[] mvec, double[] acc) {
        for (int i = 0; i < 4; i++) {
            int o = (f + i) * L;
            DoubleVector.fromArray(S, mvec, o).add(DoubleVector.fromArray(S, acc, (10 + i) * L)).intoArray(mvec, o);
        }
        int r0 = f * k + f, r1 = r0 + k, r2 = r1 + k, r3 = r2 + k;
        int[] block = {r0, r1, r1 + 1, r2, r2 + 1, r2 + 2, r3, r3 + 1, r3 + 2, r3 + 3};
        for (int v = 0; v < 10; v++) {
            int o = block[v] * L;
            DoubleVector.fromArray(S, meat, o).add(DoubleVector.fromArray(S, acc, v * L)).intoArray(meat, o);
        }
    }
}
