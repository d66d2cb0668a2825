package io.densa.core.internal;

import static io.densa.core.internal.VectorPath.INV_FACTORIAL;
import static io.densa.core.internal.VectorPath.LN2_HI;
import static io.densa.core.internal.VectorPath.LN2_LO;
import static io.densa.core.internal.VectorPath.LOG2E;
import static io.densa.core.internal.VectorPath.ROUND;
import static io.densa.core.internal.VectorPath.ROUND_BITS;

import java.util.Arrays;
import jdk.incubator.vector.DoubleVector;
import jdk.incubator.vector.LongVector;
import jdk.incubator.vector.VectorMask;
import jdk.incubator.vector.VectorOperators;
import jdk.incubator.vector.VectorSpecies;

/**
 * {@link UnitLanes} with the incubating SIMD vectors (loaded by {@link VectorPath} only). Each
 * statement below is the statement of the one-unit loop with every scalar replaced by the vector
 * of the lanes' values: the same operations in the same order, fused where the one-unit loop uses
 * {@link Math#fma} and unfused where it multiplies and adds; a branch on a unit's value becomes a
 * blend that keeps the old value in the lanes that do not take it.
 */
final class VectorLanes extends UnitLanes {
    private static final VectorSpecies<Double> S = DoubleVector.SPECIES_PREFERRED;
    private static final int L = S.length();
    private static final double RANGE = 708.0;

    @Override
    public int lanes() {
        return L;
    }

    @Override
    public void evaluate(Layout lay, double[] beta, double[] counts, double[] eta, double[] ex, double[] mass,
            double[] res) {
        etaAndMax(lay, beta, eta, res);
        exponentials(lay, eta, res, ex);
        massesAndLogLikelihood(lay, counts, ex, mass, eta, res); // η no longer needed: its array takes the log masses
    }

    /** η at every node (the one-unit pass's sums run by run) and its maximum, into res[L..2L). */
    private static void etaAndMax(Layout lay, double[] beta, double[] eta, double[] res) {
        final double[] c0 = lay.column()[0], c1 = lay.column()[1], c2 = lay.column()[2], c3 = lay.column()[3];
        final int[] runs = lay.runStart();
        final int[] first = lay.first();
        final DoubleVector zero = DoubleVector.zero(S);
        DoubleVector max = DoubleVector.broadcast(S, Double.NEGATIVE_INFINITY);
        for (int r = 0; r + 1 < runs.length; r++) {
            int q0 = runs[r], q1 = runs[r + 1], f = first[q0];
            DoubleVector b0 = DoubleVector.fromArray(S, beta, f * L);
            DoubleVector b1 = DoubleVector.fromArray(S, beta, (f + 1) * L);
            DoubleVector b2 = DoubleVector.fromArray(S, beta, (f + 2) * L);
            DoubleVector b3 = DoubleVector.fromArray(S, beta, (f + 3) * L);
            for (int q = q0; q < q1; q++) {
                DoubleVector s = zero.add(b0.mul(DoubleVector.broadcast(S, c0[q])))
                        .add(b1.mul(DoubleVector.broadcast(S, c1[q]))).add(b2.mul(DoubleVector.broadcast(S, c2[q])))
                        .add(b3.mul(DoubleVector.broadcast(S, c3[q])));
                s.intoArray(eta, q * L);
            }
        }
        for (int q = 0; q < lay.nodes(); q++) {
            max = max.max(DoubleVector.fromArray(S, eta, q * L));
        }
        max.intoArray(res, L);
        // the one-unit pass keeps the first of equal values and passes over NaN (s > max); MAX
        // differs only for ±0 and NaN: those lanes again by that rule
        VectorMask<Double> exact = max.compare(VectorOperators.NE, 0.0).and(max.compare(VectorOperators.EQ, max));
        if (!exact.allTrue()) {
            for (int l = 0; l < L; l++) {
                if (!exact.laneIsSet(l)) {
                    double m = Double.NEGATIVE_INFINITY;
                    for (int q = 0; q < lay.nodes(); q++) {
                        double v = eta[q * L + l];
                        m = v > m ? v : m;
                    }
                    res[L + l] = m;
                }
            }
        }
    }

    /** e_q = w_q exp(η_q − max η), exactly as {@link VectorPath#weightedExp} for each lane. */
    private static void exponentials(Layout lay, double[] eta, double[] res, double[] ex) {
        final double[] w = lay.weight();
        final DoubleVector max = DoubleVector.fromArray(S, res, L);
        final int nodes = lay.nodes();
        int q = 0;
        for (; q + 3 < nodes; q += 4) { // four nodes at a time: their exponentials interleaved
            if (!exp4(eta, q * L, res, L, w, q, ex)) {
                for (int p = q; p < q + 4; p++) {
                    outside(p, w, eta, res, ex);
                }
            }
        }
        for (; q < nodes; q++) {
            DoubleVector v = DoubleVector.fromArray(S, eta, q * L).sub(max);
            VectorPath.exp(v).mul(w[q]).intoArray(ex, q * L);
            if (!v.abs().compare(VectorOperators.LE, RANGE).allTrue()) {
                outside(q, w, eta, res, ex);
            }
        }
    }

    /**
     * w[q + i]·exp(x_{q+i} − shift) into out[o + iL..o + (i+1)L) for i = 0..3, x_{q+i} at
     * x[o + iL..) and the shift at shift[so..so+L): the operations of {@link VectorPath#exp(DoubleVector)} and
     * the weight's product for each, the four chains interleaved (the same bits; each chain of
     * dependent multiply-adds hides the others' latency: 1.15× on the lanes' evaluation against one
     * at a time, 1.06× against two). Arrays in and out, so that a call the JIT does not inline
     * passes no vectors. Returns false when a shifted value lies outside [−708, 708] or is NaN (its
     * lanes then hold no meaningful value).
     */
    private static boolean exp4(double[] x, int o, double[] shift, int so, double[] w, int q, double[] out) {
        double[] c = INV_FACTORIAL;
        DoubleVector s = DoubleVector.fromArray(S, shift, so);
        DoubleVector a = DoubleVector.fromArray(S, x, o).sub(s), b = DoubleVector.fromArray(S, x, o + L).sub(s);
        DoubleVector a2 = DoubleVector.fromArray(S, x, o + 2 * L).sub(s);
        DoubleVector b2 = DoubleVector.fromArray(S, x, o + 3 * L).sub(s);
        DoubleVector ta = a.lanewise(VectorOperators.FMA, LOG2E, ROUND);
        DoubleVector tb = b.lanewise(VectorOperators.FMA, LOG2E, ROUND);
        DoubleVector ta2 = a2.lanewise(VectorOperators.FMA, LOG2E, ROUND);
        DoubleVector tb2 = b2.lanewise(VectorOperators.FMA, LOG2E, ROUND);
        DoubleVector ka = ta.sub(ROUND), kb = tb.sub(ROUND), ka2 = ta2.sub(ROUND), kb2 = tb2.sub(ROUND);
        DoubleVector ra = ka.lanewise(VectorOperators.FMA, -LN2_HI, a);
        DoubleVector rb = kb.lanewise(VectorOperators.FMA, -LN2_HI, b);
        DoubleVector ra2 = ka2.lanewise(VectorOperators.FMA, -LN2_HI, a2);
        DoubleVector rb2 = kb2.lanewise(VectorOperators.FMA, -LN2_HI, b2);
        ra = ka.lanewise(VectorOperators.FMA, -LN2_LO, ra);
        rb = kb.lanewise(VectorOperators.FMA, -LN2_LO, rb);
        ra2 = ka2.lanewise(VectorOperators.FMA, -LN2_LO, ra2);
        rb2 = kb2.lanewise(VectorOperators.FMA, -LN2_LO, rb2);
        DoubleVector pa = DoubleVector.broadcast(S, c[13]), pb = pa, pa2 = pa, pb2 = pa;
        for (int i = 12; i >= 0; i--) {
            DoubleVector ci = DoubleVector.broadcast(S, c[i]);
            pa = pa.lanewise(VectorOperators.FMA, ra, ci);
            pb = pb.lanewise(VectorOperators.FMA, rb, ci);
            pa2 = pa2.lanewise(VectorOperators.FMA, ra2, ci);
            pb2 = pb2.lanewise(VectorOperators.FMA, rb2, ci);
        }
        DoubleVector sa = (DoubleVector) ((LongVector) ta.reinterpretAsLongs()).sub(ROUND_BITS - 1023L)
                .lanewise(VectorOperators.LSHL, 52).reinterpretAsDoubles();
        DoubleVector sb = (DoubleVector) ((LongVector) tb.reinterpretAsLongs()).sub(ROUND_BITS - 1023L)
                .lanewise(VectorOperators.LSHL, 52).reinterpretAsDoubles();
        DoubleVector sa2 = (DoubleVector) ((LongVector) ta2.reinterpretAsLongs()).sub(ROUND_BITS - 1023L)
                .lanewise(VectorOperators.LSHL, 52).reinterpretAsDoubles();
        DoubleVector sb2 = (DoubleVector) ((LongVector) tb2.reinterpretAsLongs()).sub(ROUND_BITS - 1023L)
                .lanewise(VectorOperators.LSHL, 52).reinterpretAsDoubles();
        pa.mul(sa).mul(w[q]).intoArray(out, o);
        pb.mul(sb).mul(w[q + 1]).intoArray(out, o + L);
        pa2.mul(sa2).mul(w[q + 2]).intoArray(out, o + 2 * L);
        pb2.mul(sb2).mul(w[q + 3]).intoArray(out, o + 3 * L);
        return a.abs().compare(VectorOperators.LE, RANGE).and(b.abs().compare(VectorOperators.LE, RANGE))
                .and(a2.abs().compare(VectorOperators.LE, RANGE))
                .and(b2.abs().compare(VectorOperators.LE, RANGE)).allTrue();
    }

    /** Node q's lanes whose shifted η lies outside [−708, 708] or is NaN: {@link Math#exp}, as the one-unit pass. */
    private static void outside(int q, double[] w, double[] eta, double[] res, double[] ex) {
        for (int l = 0; l < L; l++) {
            if (!(Math.abs(eta[q * L + l] - res[L + l]) <= RANGE)) {
                ex[q * L + l] = w[q] * Math.exp(1.0 * eta[q * L + l] - res[L + l]);
            }
        }
    }

    /** The bin masses, Z into res[0..L) and ℓ into res[2L..3L). */
    private static void massesAndLogLikelihood(Layout lay, double[] counts, double[] ex, double[] mass,
            double[] logMass, double[] res) {
        final int[] start = lay.binStart();
        final int bins = lay.bins();
        final DoubleVector zero = DoubleVector.zero(S);
        DoubleVector z = zero;
        for (int j = 0; j < bins; j++) {
            DoubleVector s = zero;
            for (int q = start[j]; q < start[j + 1]; q++) {
                s = s.add(DoubleVector.fromArray(S, ex, q * L));
            }
            s.intoArray(mass, j * L);
            z = z.add(s);
        }
        z.intoArray(res, 0);
        double[] logZ = new double[L];
        for (int l = 0; l < L; l++) {
            logZ[l] = Math.log(res[l]);
        }
        DoubleVector lz = DoubleVector.fromArray(S, logZ, 0);
        for (int j = 0; j < bins; j++) {
            logs(mass, j * L, logMass);
        }
        DoubleVector ll = zero;
        for (int j = 0; j < bins; j++) {
            int o = j * L;
            DoubleVector n = DoubleVector.fromArray(S, counts, o);
            VectorMask<Double> occupied = n.compare(VectorOperators.GT, 0.0);
            DoubleVector term = n.mul(DoubleVector.fromArray(S, logMass, o).sub(lz));
            ll = ll.blend(ll.add(term), occupied);
        }
        ll.intoArray(res, 2 * L);
    }

    /** ln of the L values at a[o..o+L) into out[o..o+L), exactly as {@link VectorPath#logs} for each. */
    private static void logs(double[] a, int o, double[] out) {
        DoubleVector x = DoubleVector.fromArray(S, a, o);
        VectorPath.log(x).intoArray(out, o);
        VectorMask<Double> normal = x.compare(VectorOperators.GE, Double.MIN_NORMAL)
                .and(x.compare(VectorOperators.LE, Double.MAX_VALUE));
        if (!normal.allTrue()) {
            for (int l = 0; l < L; l++) {
                out[o + l] = VectorPath.log(a[o + l]);
            }
        }
    }

    @Override
    public void derivatives(Layout lay, double[] counts, double[] totals, double[] ex, double[] mass, double[] zs,
            double[] grad, double[] hess, double[] mvec, double[] uj) {
        final int k1 = lay.k1();
        Arrays.fill(grad, 0, k1 * L, 0.0);
        zeroBand(lay, hess);
        Arrays.fill(mvec, 0, k1 * L, 0.0);
        // the current knot span's sums (the one-unit pass keeps them in registers): its 4 × 4 block
        // (10 entries), four gradient entries and four moments, ACC vectors side by side
        double[] acc = new double[ACC * L];
        double[] coefs = new double[2 * L];
        DoubleVector nz = DoubleVector.fromArray(S, totals, 0).div(DoubleVector.fromArray(S, zs, 0));
        int fcur = -1;
        final int bins = lay.bins();
        final int[] binLo = lay.binLo();
        final boolean[] oneSpan = lay.oneSpan();
        for (int j = 0; j < bins; ) {
            int lo = binLo[j];
            if (oneSpan[j]) {
                if (lo != fcur) {
                    if (fcur >= 0) {
                        flush(fcur, k1, grad, hess, mvec, acc);
                    }
                    fcur = lo;
                    Arrays.fill(acc, 0.0);
                }
                int j1 = j + 1;
                while (j1 < bins && oneSpan[j1] && binLo[j1] == lo) {
                    j1++;
                }
                spanBins(lay, j, j1, counts, mass, nz, ex, acc);
                j = j1;
            } else {
                DoubleVector a = DoubleVector.fromArray(S, mass, j * L);
                DoubleVector nj = DoubleVector.fromArray(S, counts, j * L);
                VectorMask<Double> occupied = nj.compare(VectorOperators.GT, 0.0);
                DoubleVector.zero(S).blend(nj.div(a), occupied).sub(nz).intoArray(coefs, 0);
                nj.div(a.mul(a)).intoArray(coefs, L);
                fcur = generalBin(lay, j, fcur, ex, coefs, occupied.anyTrue() ? nj : null, grad, hess, mvec, uj, acc);
                j++;
            }
        }
        if (fcur >= 0) {
            flush(fcur, k1, grad, hess, mvec, acc);
        }
    }

    @Override
    public void expectedInformation(Layout lay, double[] totals, double[] ex, double[] mass, double[] zs,
            double[] hess, double[] mvec, double[] uj) {
        CovarianceLanes.expectedInformation(lay, totals, ex, mass, zs, hess, mvec, uj);
    }

    @Override
    public void empiricalInformation(Layout lay, double[] counts, double[] totals, double[] ex, double[] mass,
            double[] mvec, double[] uj, double[] meat) {
        CovarianceLanes.empiricalInformation(lay, counts, totals, ex, mass, mvec, uj, meat);
    }

    /** Zeroes the band of every lane's information (the entries a pass writes and its caller reads). */
    static void zeroBand(Layout lay, double[] hess) {
        final int k1 = lay.k1();
        final int[] bandLo = lay.bandLo();
        for (int i = 0; i < k1; i++) {
            Arrays.fill(hess, (i * k1 + bandLo[i]) * L, (i * k1 + i + 1) * L, 0.0);
        }
    }

    /** Vectors of the span's running sums: h00, h10, h11, h20, h21, h22, h30, h31, h32, h33, g0..g3, s0..s3. */
    static final int ACC = 18;

    /**
     * Bins j0..j1−1, inside the current span: their nodes' terms and rank-one terms added to the
     * span's sums (read from acc, kept in registers, written back).
     */
    private static void spanBins(Layout lay, int j0, int j1, double[] counts, double[] mass, DoubleVector nz,
            double[] ex, double[] acc) {
        final double[] c0 = lay.column()[0], c1 = lay.column()[1], c2 = lay.column()[2], c3 = lay.column()[3];
        final int[] start = lay.binStart();
        DoubleVector h00 = fromAcc(acc, 0), h10 = fromAcc(acc, 1), h11 = fromAcc(acc, 2), h20 = fromAcc(acc, 3);
        DoubleVector h21 = fromAcc(acc, 4), h22 = fromAcc(acc, 5), h30 = fromAcc(acc, 6), h31 = fromAcc(acc, 7);
        DoubleVector h32 = fromAcc(acc, 8), h33 = fromAcc(acc, 9), g0 = fromAcc(acc, 10), g1 = fromAcc(acc, 11);
        DoubleVector g2 = fromAcc(acc, 12), g3 = fromAcc(acc, 13), s0 = fromAcc(acc, 14), s1 = fromAcc(acc, 15);
        DoubleVector s2 = fromAcc(acc, 16), s3 = fromAcc(acc, 17);
        final DoubleVector zero = DoubleVector.zero(S);
        for (int j = j0; j < j1; j++) {
            DoubleVector a = DoubleVector.fromArray(S, mass, j * L);
            DoubleVector nj = DoubleVector.fromArray(S, counts, j * L);
            VectorMask<Double> occupied = nj.compare(VectorOperators.GT, 0.0);
            DoubleVector coefR = zero.blend(nj.div(a), occupied).sub(nz);
            DoubleVector u0 = zero, u1 = zero, u2 = zero, u3 = zero;
            for (int q = start[j]; q < start[j + 1]; q++) {
                DoubleVector e = DoubleVector.fromArray(S, ex, q * L);
                DoubleVector v0 = DoubleVector.broadcast(S, c0[q]), v1 = DoubleVector.broadcast(S, c1[q]);
                DoubleVector v2 = DoubleVector.broadcast(S, c2[q]), v3 = DoubleVector.broadcast(S, c3[q]);
                u0 = e.fma(v0, u0);
                u1 = e.fma(v1, u1);
                u2 = e.fma(v2, u2);
                u3 = e.fma(v3, u3);
                DoubleVector r = e.neg().mul(coefR);
                DoubleVector m0 = r.mul(v0), m1 = r.mul(v1), m2 = r.mul(v2), m3 = r.mul(v3);
                h00 = m0.fma(v0, h00);
                h10 = m1.fma(v0, h10);
                h11 = m1.fma(v1, h11);
                h20 = m2.fma(v0, h20);
                h21 = m2.fma(v1, h21);
                h22 = m2.fma(v2, h22);
                h30 = m3.fma(v0, h30);
                h31 = m3.fma(v1, h31);
                h32 = m3.fma(v2, h32);
                h33 = m3.fma(v3, h33);
            }
            g0 = coefR.fma(u0, g0);
            g1 = coefR.fma(u1, g1);
            g2 = coefR.fma(u2, g2);
            g3 = coefR.fma(u3, g3);
            s0 = s0.add(u0);
            s1 = s1.add(u1);
            s2 = s2.add(u2);
            s3 = s3.add(u3);
            DoubleVector coef = nj.div(a.mul(a));
            DoubleVector x0 = coef.mul(u0), x1 = coef.mul(u1), x2 = coef.mul(u2), x3 = coef.mul(u3);
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
        g0.intoArray(acc, 10 * L);
        g1.intoArray(acc, 11 * L);
        g2.intoArray(acc, 12 * L);
        g3.intoArray(acc, 13 * L);
        s0.intoArray(acc, 14 * L);
        s1.intoArray(acc, 15 * L);
        s2.intoArray(acc, 16 * L);
        s3.intoArray(acc, 17 * L);
    }

    private static DoubleVector fromAcc(double[] acc, int v) {
        return DoubleVector.fromArray(S, acc, v * L);
    }

    /**
     * A bin across knots: node by node into its own moments uj, the span's sums flushed where the
     * span changes; returns the current span.
     */
    private static int generalBin(Layout lay, int j, int fcur, double[] ex, double[] coefs, DoubleVector nj,
            double[] grad, double[] hess, double[] mvec, double[] uj, double[] acc) {
        final double[] c0 = lay.column()[0], c1 = lay.column()[1], c2 = lay.column()[2], c3 = lay.column()[3];
        final int k1 = lay.k1();
        int lo = lay.binLo()[j], hi = lay.binHi()[j];
        DoubleVector coefR = DoubleVector.fromArray(S, coefs, 0);
        Arrays.fill(uj, lo * L, hi * L, 0.0);
        for (int q = lay.binStart()[j]; q < lay.binStart()[j + 1]; q++) {
            DoubleVector e = DoubleVector.fromArray(S, ex, q * L);
            int f = lay.first()[q];
            DoubleVector v0 = DoubleVector.broadcast(S, c0[q]), v1 = DoubleVector.broadcast(S, c1[q]);
            DoubleVector v2 = DoubleVector.broadcast(S, c2[q]), v3 = DoubleVector.broadcast(S, c3[q]);
            e.fma(v0, DoubleVector.fromArray(S, uj, f * L)).intoArray(uj, f * L);
            e.fma(v1, DoubleVector.fromArray(S, uj, (f + 1) * L)).intoArray(uj, (f + 1) * L);
            e.fma(v2, DoubleVector.fromArray(S, uj, (f + 2) * L)).intoArray(uj, (f + 2) * L);
            e.fma(v3, DoubleVector.fromArray(S, uj, (f + 3) * L)).intoArray(uj, (f + 3) * L);
            if (f != fcur) {
                if (fcur >= 0) {
                    flush(fcur, k1, grad, hess, mvec, acc);
                }
                fcur = f;
                Arrays.fill(acc, 0.0);
            }
            DoubleVector r = e.neg().mul(coefR);
            DoubleVector m0 = r.mul(v0), m1 = r.mul(v1), m2 = r.mul(v2), m3 = r.mul(v3);
            m0.fma(v0, DoubleVector.fromArray(S, acc, 0 * L)).intoArray(acc, 0);
            m1.fma(v0, DoubleVector.fromArray(S, acc, 1 * L)).intoArray(acc, L);
            m1.fma(v1, DoubleVector.fromArray(S, acc, 2 * L)).intoArray(acc, 2 * L);
            m2.fma(v0, DoubleVector.fromArray(S, acc, 3 * L)).intoArray(acc, 3 * L);
            m2.fma(v1, DoubleVector.fromArray(S, acc, 4 * L)).intoArray(acc, 4 * L);
            m2.fma(v2, DoubleVector.fromArray(S, acc, 5 * L)).intoArray(acc, 5 * L);
            m3.fma(v0, DoubleVector.fromArray(S, acc, 6 * L)).intoArray(acc, 6 * L);
            m3.fma(v1, DoubleVector.fromArray(S, acc, 7 * L)).intoArray(acc, 7 * L);
            m3.fma(v2, DoubleVector.fromArray(S, acc, 8 * L)).intoArray(acc, 8 * L);
            m3.fma(v3, DoubleVector.fromArray(S, acc, 9 * L)).intoArray(acc, 9 * L);
        }
        for (int i = lo; i < hi; i++) {
            DoubleVector u = DoubleVector.fromArray(S, uj, i * L);
            DoubleVector.fromArray(S, grad, i * L).add(coefR.mul(u)).intoArray(grad, i * L);
            DoubleVector.fromArray(S, mvec, i * L).add(u).intoArray(mvec, i * L);
        }
        if (nj != null) {
            VectorMask<Double> occupied = nj.compare(VectorOperators.GT, 0.0);
            DoubleVector coef = DoubleVector.fromArray(S, coefs, L);
            for (int i = lo; i < hi; i++) {
                DoubleVector ui = coef.mul(DoubleVector.fromArray(S, uj, i * L));
                for (int l = lo; l <= i; l++) {
                    int o = i * k1 + l;
                    DoubleVector h = DoubleVector.fromArray(S, hess, o * L);
                    h.blend(h.add(ui.mul(DoubleVector.fromArray(S, uj, l * L))), occupied).intoArray(hess, o * L);
                }
            }
        }
        return fcur;
    }

    
    /** The span's sums added in the order of the one-unit pass (gradient, moments, then the block). */
    static void flush(int f, int k1, double[] grad, double[] hess, double[] mvec, double[] acc) {
        for (int i = 0; i < 4; i++) {
            int o = (f + i) * L;
            DoubleVector.fromArray(S, grad, o).add(DoubleVector.fromArray(S, acc, (10 + i) * L)).intoArray(grad, o);
        }
        for (int i = 0; i < 4; i++) {
            int o = (f + i) * L;
            DoubleVector.fromArray(S, mvec, o).add(DoubleVector.fromArray(S, acc, (14 + i) * L)).intoArray(mvec, o);
        }
        int r0 = f * k1 + f, r1 = r0 + k1, r2 = r1 + k1, r3 = r2 + k1;
        int[] block = {r0, r1, r1 + 1, r2, r2 + 1, r2 + 2, r3, r3 + 1, r3 + 2, r3 + 3};
        for (int v = 0; v < 10; v++) {
            int o = block[v] * L;
            DoubleVector.fromArray(S, hess, o).add(DoubleVector.fromArray(S, acc, v * L)).intoArray(hess, o);
        }
    }


    @Override
    public void finishDerivatives(int k, int k1, int[] bandLo, double[] grad, double[] hess, double[] mvec,
            double[] c, double[] beta, double[] prior, int[] priorRows, double[] pen, int[] penRows,
            double[] twoLambda, double[] factor, double[] rhs) {
        LaneAlgebra.finishDerivatives(k, k1, bandLo, grad, hess, mvec, c, beta, prior, priorRows, pen, penRows,
                twoLambda, factor, rhs);
    }

    @Override
    public void fisherInformation(int k1, int[] bandLo, double[] hess, double[] mvec, double[] totals, double[] z,
            double[] twoLambda, double[] pen, double[] prior, double[] fisher, double[] j) {
        LaneAlgebra.fisherInformation(k1, bandLo, hess, mvec, totals, z, twoLambda, pen, prior, fisher, j);
    }

    @Override
    public void meat(int n, double[] meat, double[] fisher, double[] scale) {
        LaneAlgebra.meat(n, meat, fisher, scale);
    }

    @Override
    public void start(double[] map, double[] constant, int k, double[] logs, double[] beta) {
        LaneAlgebra.start(map, constant, k, logs, beta);
    }

    @Override
    public void coordinateNorm(double[] u, int k, double[] v, double[] out, int o) {
        LaneAlgebra.coordinateNorm(u, k, v, out, o);
    }

    @Override
    public void quadraticForm(double[] m, int[] rows, int k, double[] b, double[] out, int o) {
        LaneAlgebra.quadraticForm(m, rows, k, b, out, o);
    }

    @Override
    public void cholesky(double[] a, int n, int s, double minRelativePivot, int[] failed) {
        LaneAlgebra.cholesky(a, n, s, minRelativePivot, failed);
    }

    @Override
    public void solve(double[] a, int n, int s, double[] x) {
        LaneAlgebra.solve(a, n, s, x);
    }

    @Override
    public void covarianceStart(int n, double[] j, double[] fisher, double[] linv, double[] t1, double[] edf,
            int[] failed) {
        LaneAlgebra.covarianceStart(n, j, fisher, linv, t1, edf, failed);
    }

    @Override
    public void covarianceFinish(int n, double[] linv, double[] meat, double[] u, double[] t1, double[] wm,
            double[] m, double[] t2, double[] cov) {
        LaneAlgebra.covarianceFinish(n, linv, meat, u, t1, wm, m, t2, cov);
    }
}
