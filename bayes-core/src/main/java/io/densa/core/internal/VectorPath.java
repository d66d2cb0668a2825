package io.densa.core.internal;

import java.util.Arrays;
import jdk.incubator.vector.DoubleVector;
import jdk.incubator.vector.LongVector;
import jdk.incubator.vector.VectorMask;
import jdk.incubator.vector.VectorOperators;
import jdk.incubator.vector.VectorSpecies;

/**
 * The kernels of {@link KernelPath} written with the incubating SIMD vectors of
 * {@code jdk.incubator.vector} (loaded by name, only when the JVM runs with that module; never
 * referenced otherwise). Register-blocked: each kernel keeps a small tile of its output in vector
 * registers across the whole inner loop and combines one vector load with several fused
 * multiply-adds, which the auto-vectoriser does not do for these loop shapes.
 */
final class VectorPath extends KernelPath {
    private static final VectorSpecies<Double> S = DoubleVector.SPECIES_PREFERRED;
    private static final int L = S.length();
    /** Rows gathered per pass of the cross product (64 KB at k = 32, so they stay in the L2 cache). */
    private static final int SUB = 256;

    private static final UnitLanes UNIT_LANES = new VectorLanes();

    static {
        try {
            primeOperatorTables();
        } catch (RuntimeException e) {
            // priming only saves time; it must never keep the vector path from loading
        }
    }

    /**
     * Applies every lane-wise operator of the double and long vectors once, before any kernel
     * runs, so that the incubator's per-operator tables are complete before the JIT compiles a
     * kernel: a first use inside compiled code records a type-check trap in the shared lookup,
     * C2 adds the traps of all its inlined copies, and past the per-method limit (100 on HotSpot
     * 17) it compiles the kernel without vector intrinsics and with its vectors on the heap
     * (1.4–1.9× slower estimation in 4 of 10 runs before; DEVELOPERS.md has the story). About
     * 70 ms once per JVM.
     */
    private static void primeOperatorTables() {
        DoubleVector d = DoubleVector.broadcast(S, 1.5);
        LongVector l = d.reinterpretAsLongs();
        VectorMask<Double> dm = d.compare(VectorOperators.GT, 0.0);
        VectorMask<Long> lm = l.compare(VectorOperators.NE, 0L);
        for (java.lang.reflect.Field f : VectorOperators.class.getFields()) {
            Object op;
            try {
                op = f.get(null);
            } catch (IllegalAccessException e) {
                continue;
            }
            if (op instanceof VectorOperators.Unary) {
                VectorOperators.Unary u = (VectorOperators.Unary) op;
                prime(() -> d.lanewise(u));
                prime(() -> l.lanewise(u));
            }
            if (op instanceof VectorOperators.Binary) {
                VectorOperators.Binary b = (VectorOperators.Binary) op;
                prime(() -> d.lanewise(b, d));
                prime(() -> l.lanewise(b, l));
                prime(() -> l.lanewise(b, 1L)); // shifts by a broadcast count have a table of their own
            }
            if (op instanceof VectorOperators.Ternary) {
                VectorOperators.Ternary t = (VectorOperators.Ternary) op;
                prime(() -> d.lanewise(t, d, d));
                prime(() -> l.lanewise(t, l, l));
            }
            if (op instanceof VectorOperators.Associative) {
                VectorOperators.Associative a = (VectorOperators.Associative) op;
                prime(() -> d.reduceLanes(a));
                prime(() -> d.reduceLanes(a, dm));
                prime(() -> l.reduceLanes(a));
                prime(() -> l.reduceLanes(a, lm));
            }
        }
        // operators of four kinds through the shared operator-kind check 3,000 times (about 25 ms), so that its
        // type profile holds several classes before anything inlining it is compiled: with one or two, C2 built a
        // generic operation that trapped on the next class, the same failure (AVX2: 11 JVMs in 48, then 0 in 30)
        DoubleVector acc = d;
        for (int i = 0; i < 3000; i++) {
            acc = acc.lanewise(VectorOperators.NEG).lanewise(VectorOperators.SUB, d).lanewise(VectorOperators.ADD, d)
                    .lanewise(VectorOperators.FMA, d, d).blend(d, acc.compare(VectorOperators.LT, d));
        }
    }

    /**
     * Runs one priming operation: an operator the element type does not support throws and is
     * skipped, as is any other failure (priming must never keep the vector path from loading).
     */
    private static void prime(Runnable op) {
        try {
            op.run();
        } catch (RuntimeException e) {
            // not defined for this element type (or not primable here): nothing to prime
        }
    }

    @Override
    public int lanes() {
        return L;
    }

    @Override
    UnitLanes unitLanes() {
        return UNIT_LANES;
    }

    /**
     * Whole vectors of columns through running sums and maxima kept in a small array (each column's
     * sum in row order, as the scalar loop: the same bits), the remaining columns one by one.
     */
    @Override
    public void addColumnSumsAndMaxAbs(double[] a, int k, int r0, int r1, double[] s) {
        int kv = k / L * L;
        double[] acc = new double[2 * kv];
        System.arraycopy(s, 0, acc, 0, kv);
        Arrays.fill(acc, kv, 2 * kv, s[k]);
        double big = s[k];
        for (int i = r0; i < r1; i++) {
            int o = i * k;
            for (int v = 0; v < kv; v += L) {
                DoubleVector x = DoubleVector.fromArray(S, a, o + v);
                DoubleVector.fromArray(S, acc, v).add(x).intoArray(acc, v);
                DoubleVector.fromArray(S, acc, kv + v).max(x.abs()).intoArray(acc, kv + v);
            }
            for (int j = kv; j < k; j++) {
                s[j] += a[o + j];
                big = Math.max(big, Math.abs(a[o + j]));
            }
        }
        System.arraycopy(acc, 0, s, 0, kv);
        for (int j = 0; j < kv; j++) {
            big = Math.max(big, acc[kv + j]);
        }
        s[k] = big;
    }

    /**
     * The (centred) rows are gathered SUB at a time into a buffer padded to a multiple of the
     * vector length; the padded upper triangle is accumulated four matrix rows by two column
     * vectors at a time (eight independent accumulators; per data row two loads and four
     * broadcasts feed eight fused multiply-adds), then added to s.
     */
    @Override
    public void addCrossProduct(double[] a, int k, int[] rows, int r0, int r1, double[] center, double[] s) {
        int kp = (k + L - 1) / L * L;
        double[] buf = new double[SUB * kp];
        double[] acc = new double[kp * kp];
        for (int i0 = r0; i0 < r1; i0 += SUB) {
            int cnt = Math.min(SUB, r1 - i0);
            for (int t = 0; t < cnt; t++) {
                int o = (rows == null ? i0 + t : rows[i0 + t]) * k;
                int bo = t * kp;
                if (center == null) {
                    System.arraycopy(a, o, buf, bo, k);
                } else {
                    for (int j = 0; j < k; j++) {
                        buf[bo + j] = a[o + j] - center[j];
                    }
                }
            }
            for (int j0 = 0; j0 < k; j0 += 4) {
                int a0 = j0 * kp, a1 = a0 + kp, a2 = a1 + kp, a3 = a2 + kp;
                int v = j0 / L * L;
                // two column vectors per pass: eight independent accumulator chains
                for (; v + 2 * L <= kp; v += 2 * L) {
                    int w = v + L;
                    DoubleVector c0 = DoubleVector.fromArray(S, acc, a0 + v);
                    DoubleVector c1 = DoubleVector.fromArray(S, acc, a1 + v);
                    DoubleVector c2 = DoubleVector.fromArray(S, acc, a2 + v);
                    DoubleVector c3 = DoubleVector.fromArray(S, acc, a3 + v);
                    DoubleVector d0 = DoubleVector.fromArray(S, acc, a0 + w);
                    DoubleVector d1 = DoubleVector.fromArray(S, acc, a1 + w);
                    DoubleVector d2 = DoubleVector.fromArray(S, acc, a2 + w);
                    DoubleVector d3 = DoubleVector.fromArray(S, acc, a3 + w);
                    for (int t = 0, bo = 0; t < cnt; t++, bo += kp) {
                        DoubleVector x = DoubleVector.fromArray(S, buf, bo + v);
                        DoubleVector y = DoubleVector.fromArray(S, buf, bo + w);
                        double b0 = buf[bo + j0], b1 = buf[bo + j0 + 1], b2 = buf[bo + j0 + 2], b3 = buf[bo + j0 + 3];
                        c0 = x.lanewise(VectorOperators.FMA, b0, c0);
                        c1 = x.lanewise(VectorOperators.FMA, b1, c1);
                        c2 = x.lanewise(VectorOperators.FMA, b2, c2);
                        c3 = x.lanewise(VectorOperators.FMA, b3, c3);
                        d0 = y.lanewise(VectorOperators.FMA, b0, d0);
                        d1 = y.lanewise(VectorOperators.FMA, b1, d1);
                        d2 = y.lanewise(VectorOperators.FMA, b2, d2);
                        d3 = y.lanewise(VectorOperators.FMA, b3, d3);
                    }
                    c0.intoArray(acc, a0 + v);
                    c1.intoArray(acc, a1 + v);
                    c2.intoArray(acc, a2 + v);
                    c3.intoArray(acc, a3 + v);
                    d0.intoArray(acc, a0 + w);
                    d1.intoArray(acc, a1 + w);
                    d2.intoArray(acc, a2 + w);
                    d3.intoArray(acc, a3 + w);
                }
                for (; v < kp; v += L) {
                    DoubleVector c0 = DoubleVector.fromArray(S, acc, a0 + v);
                    DoubleVector c1 = DoubleVector.fromArray(S, acc, a1 + v);
                    DoubleVector c2 = DoubleVector.fromArray(S, acc, a2 + v);
                    DoubleVector c3 = DoubleVector.fromArray(S, acc, a3 + v);
                    for (int t = 0, bo = 0; t < cnt; t++, bo += kp) {
                        DoubleVector x = DoubleVector.fromArray(S, buf, bo + v);
                        c0 = x.lanewise(VectorOperators.FMA, buf[bo + j0], c0);
                        c1 = x.lanewise(VectorOperators.FMA, buf[bo + j0 + 1], c1);
                        c2 = x.lanewise(VectorOperators.FMA, buf[bo + j0 + 2], c2);
                        c3 = x.lanewise(VectorOperators.FMA, buf[bo + j0 + 3], c3);
                    }
                    c0.intoArray(acc, a0 + v);
                    c1.intoArray(acc, a1 + v);
                    c2.intoArray(acc, a2 + v);
                    c3.intoArray(acc, a3 + v);
                }
            }
        }
        for (int j = 0; j < k; j++) {
            for (int l = j; l < k; l++) {
                s[j * k + l] += acc[j * kp + l];
            }
        }
    }

    @Override
    public void multiplyRows(double[] a, int aOff, int rows, int k, double[] b, int m, double[] out, int outOff) {
        int i = 0;
        for (; i + 2 <= rows; i += 2) {
            int ai = aOff + i * k, o = outOff + i * m;
            rowsTimes(a, ai, ai + k, true, k, b, 0, m, m, out, o, out, o + m);
        }
        if (i < rows) {
            int ai = aOff + i * k;
            rowsTimes(a, ai, ai, false, k, b, 0, m, m, out, outOff + i * m, null, 0);
        }
    }

    @Override
    public void planarLags(double[] xs, double[] ys, double x0, double y0, int from, int len, double[] d2,
            double[] h) {
        int q = 0;
        for (; q + L <= len; q += L) {
            DoubleVector dx = DoubleVector.fromArray(S, xs, from + q).sub(x0);
            DoubleVector dy = DoubleVector.fromArray(S, ys, from + q).sub(y0);
            DoubleVector s = dx.mul(dx).add(dy.mul(dy));
            s.intoArray(d2, q);
            s.lanewise(VectorOperators.SQRT).intoArray(h, q);
        }
        ScalarPath.planarLags(xs, ys, x0, y0, from, q, len, d2, h);
    }

    @Override
    public void squaredDistances(double ni, double[] nsq, int from, double[] dot, int off, int len) {
        int q = 0;
        DoubleVector n0 = DoubleVector.broadcast(S, ni);
        DoubleVector zero = DoubleVector.zero(S);
        for (; q + L <= len; q += L) {
            DoubleVector g = n0.add(DoubleVector.fromArray(S, nsq, from + q))
                    .sub(DoubleVector.fromArray(S, dot, off + q).mul(2.0));
            g.blend(zero, g.compare(VectorOperators.LT, 0.0)).intoArray(dot, off + q);
        }
        ScalarPath.squaredDistances(ni, nsq, from, dot, off, q, len);
    }

    /**
     * ⌈x⌉ as round(x) plus one where that lies below x, round(x) = (x + 2⁵²) − 2⁵² (exact for
     * 0 ≤ x &lt; 2⁵²; from there on x is beyond every bin and both forms clamp to last), so the bins
     * of {@link KernelPath#lagBin} without a double-to-int conversion per lane.
     */
    @Override
    public void lagBins(double[] d2, double[] h, int len, double invWidth, int last, int beyond, double max2,
            double top, double[] bin) {
        int q = 0;
        DoubleVector zero = DoubleVector.zero(S);
        for (; q + L <= len; q += L) {
            DoubleVector hv = DoubleVector.fromArray(S, h, q);
            DoubleVector x = hv.mul(invWidth);
            DoubleVector r = x.add(EXPONENT_BASE).sub(EXPONENT_BASE);
            DoubleVector c = r.blend(r.add(1.0), r.compare(VectorOperators.LT, x));
            DoubleVector b = c.sub(1.0).min((double) last).max(zero);
            VectorMask<Double> out = DoubleVector.fromArray(S, d2, q).compare(VectorOperators.GT, max2)
                    .or(hv.compare(VectorOperators.GT, top));
            b.blend((double) beyond, out).intoArray(bin, q);
        }
        ScalarPath.lagBins(d2, h, q, len, invWidth, last, beyond, max2, top, bin);
    }

    @Override
    public void rowDots(double[] y, double[] yt, int n, int k, int ia, int ib, int js, int len, double[] da,
            double[] db) {
        boolean two = ib >= 0;
        rowsTimes(y, ia * k, (two ? ib : ia) * k, two, k, yt, js, n, len, da, 0, db, 0);
    }

    /**
     * The one product kernel of this path: out0[o0 + q] = Σ_j a[a0 + j] b[bOff + j·bStride + q] and,
     * when {@code two}, out1[o1 + q] = Σ_j a[a1 + j] b[bOff + j·bStride + q], for q &lt; width (one or
     * two rows of A, k entries each, times k rows of B). Register-blocked: two output rows by four
     * column vectors per tile (eight accumulators; per term four loads of B and two broadcasts of A
     * feed eight fused multiply-adds), remaining columns one vector at a time, then scalar fused
     * multiply-adds; with one row the second accumulator set repeats the first and is not stored.
     */
    private static void rowsTimes(double[] a, int a0, int a1, boolean two, int k, double[] b, int bOff, int bStride,
            int width, double[] out0, int o0, double[] out1, int o1) {
        int wv = width / L * L;
        int w4 = 4 * L;
        int q = 0;
        for (; q + w4 <= wv; q += w4) {
            DoubleVector x0 = DoubleVector.zero(S), x1 = x0, x2 = x0, x3 = x0;
            DoubleVector y0 = x0, y1 = x0, y2 = x0, y3 = x0;
            for (int j = 0, bj = bOff + q; j < k; j++, bj += bStride) {
                DoubleVector b0 = DoubleVector.fromArray(S, b, bj);
                DoubleVector b1 = DoubleVector.fromArray(S, b, bj + L);
                DoubleVector b2 = DoubleVector.fromArray(S, b, bj + 2 * L);
                DoubleVector b3 = DoubleVector.fromArray(S, b, bj + 3 * L);
                double p = a[a0 + j], r = a[a1 + j];
                x0 = b0.lanewise(VectorOperators.FMA, p, x0);
                x1 = b1.lanewise(VectorOperators.FMA, p, x1);
                x2 = b2.lanewise(VectorOperators.FMA, p, x2);
                x3 = b3.lanewise(VectorOperators.FMA, p, x3);
                y0 = b0.lanewise(VectorOperators.FMA, r, y0);
                y1 = b1.lanewise(VectorOperators.FMA, r, y1);
                y2 = b2.lanewise(VectorOperators.FMA, r, y2);
                y3 = b3.lanewise(VectorOperators.FMA, r, y3);
            }
            x0.intoArray(out0, o0 + q);
            x1.intoArray(out0, o0 + q + L);
            x2.intoArray(out0, o0 + q + 2 * L);
            x3.intoArray(out0, o0 + q + 3 * L);
            if (two) {
                y0.intoArray(out1, o1 + q);
                y1.intoArray(out1, o1 + q + L);
                y2.intoArray(out1, o1 + q + 2 * L);
                y3.intoArray(out1, o1 + q + 3 * L);
            }
        }
        for (; q < wv; q += L) {
            DoubleVector x0 = DoubleVector.zero(S), y0 = x0;
            for (int j = 0, bj = bOff + q; j < k; j++, bj += bStride) {
                DoubleVector b0 = DoubleVector.fromArray(S, b, bj);
                x0 = b0.lanewise(VectorOperators.FMA, a[a0 + j], x0);
                y0 = b0.lanewise(VectorOperators.FMA, a[a1 + j], y0);
            }
            x0.intoArray(out0, o0 + q);
            if (two) {
                y0.intoArray(out1, o1 + q);
            }
        }
        for (; q < width; q++) {
            double sx = 0, sy = 0;
            for (int j = 0, bj = bOff + q; j < k; j++, bj += bStride) {
                sx = Math.fma(a[a0 + j], b[bj], sx);
                sy = Math.fma(a[a1 + j], b[bj], sy);
            }
            out0[o0 + q] = sx;
            if (two) {
                out1[o1 + q] = sy;
            }
        }
    }

    /** log2(e), and ln 2 split as the double nearest ln 2 plus the rest (Cody &amp; Waite 1980). */
    static final double LOG2E = 1.4426950408889634;
    static final double LN2_HI = 0.6931471805599453;
    static final double LN2_LO = 2.3190468138462996e-17;
    /** 1.5·2⁵²: adding it rounds a double of magnitude below 2⁵¹ to an integer held in the low mantissa bits. */
    static final double ROUND = 0x1.8p52;
    static final long ROUND_BITS = Double.doubleToRawLongBits(ROUND);
    /** The largest |x − shift| the vector form serves; beyond it (under- or overflow ahead) Math.exp does. */
    private static final double RANGE = 708.0;
    /** 1/i! for i = 0..13. */
    static final double[] INV_FACTORIAL = inverseFactorials(13);

    private static double[] inverseFactorials(int degree) {
        double[] c = new double[degree + 1];
        double f = 1;
        for (int i = 0; i <= degree; i++) {
            f *= Math.max(1, i);
            c[i] = 1.0 / f;
        }
        return c;
    }

    /**
     * exp(v) = 2^k·exp(r) with k = round(v / ln 2) and r = v − k ln 2 (|r| ≤ ln 2 / 2, ln 2 in two
     * parts, each product in one fused multiply-add: Cody &amp; Waite (1980), Software Manual for the
     * Elementary Functions, ch. 6), exp(r) by its degree-13 Taylor polynomial (remainder below
     * 4·10⁻¹⁸ relative at |r| = ln 2 / 2) in Horner's form, and 2^k built in the exponent bits.
     * Every step is a lane-wise IEEE operation, so the result does not depend on the JIT; measured
     * within one unit in the last place of {@link StrictMath#exp} (fdlibm). A value outside
     * [−708, 708] (or NaN) is computed with {@link Math#exp} instead, so underflow to subnormals
     * and zero, overflow and NaN are those of the scalar path. Each output is a function of its own
     * input only (the tail after the last full vector runs the same operations one by one), so the
     * units carried in the lanes of {@code VectorLanes} get the same bits as one unit here.
     */
    @Override
    public void weightedExp(double[] x, double a, double shift, double[] w, double[] out, int n) {
        int q = 0;
        for (; q + L <= n; q += L) {
            DoubleVector v = DoubleVector.fromArray(S, x, q).mul(a).sub(shift);
            DoubleVector p = exp(v);
            if (w != null) {
                p = p.mul(DoubleVector.fromArray(S, w, q));
            }
            p.intoArray(out, q);
            VectorMask<Double> inside = v.abs().compare(VectorOperators.LE, RANGE);
            if (!inside.allTrue()) {
                for (int i = q; i < q + L; i++) {
                    if (!inside.laneIsSet(i - q)) {
                        out[i] = (w == null ? 1.0 : w[i]) * Math.exp(a * x[i] - shift);
                    }
                }
            }
        }
        for (; q < n; q++) {
            out[q] = (w == null ? 1.0 : w[q]) * exp(a * x[q] - shift);
        }
    }

    /**
     * The polynomial exponential of {@link #weightedExp} lane by lane; lanes outside [−708, 708]
     * (or NaN) hold no meaningful value and must be replaced by {@link Math#exp} of theirs.
     */
    static DoubleVector exp(DoubleVector v) {
        double[] c = INV_FACTORIAL;
        DoubleVector t = v.lanewise(VectorOperators.FMA, LOG2E, ROUND);
        DoubleVector kk = t.sub(ROUND);
        DoubleVector r = kk.lanewise(VectorOperators.FMA, -LN2_HI, v);
        r = kk.lanewise(VectorOperators.FMA, -LN2_LO, r);
        DoubleVector p = DoubleVector.broadcast(S, c[13]);
        for (int i = 12; i >= 0; i--) {
            p = p.lanewise(VectorOperators.FMA, r, DoubleVector.broadcast(S, c[i]));
        }
        DoubleVector scale = (DoubleVector) ((LongVector) t.reinterpretAsLongs()).sub(ROUND_BITS - 1023L)
                .lanewise(VectorOperators.LSHL, 52).reinterpretAsDoubles();
        return p.mul(scale);
    }

    /**
     * exp(v): the same operations as one lane of {@link #exp(DoubleVector)} (so the same bits)
     * where |v| ≤ 708, {@link Math#exp} elsewhere: the exponential of every node is a function of
     * that node's value alone, wherever the node falls in the blocks of vectors.
     */
    static double exp(double v) {
        if (!(Math.abs(v) <= RANGE)) {
            return Math.exp(v);
        }
        double[] c = INV_FACTORIAL;
        double t = Math.fma(v, LOG2E, ROUND);
        double kk = t - ROUND;
        double r = Math.fma(kk, -LN2_HI, v);
        r = Math.fma(kk, -LN2_LO, r);
        double p = c[13];
        for (int i = 12; i >= 0; i--) {
            p = Math.fma(p, r, c[i]);
        }
        double scale = Double.longBitsToDouble((Double.doubleToRawLongBits(t) - (ROUND_BITS - 1023L)) << 52);
        return p * scale;
    }

    private static final long MANTISSA = 0x000f_ffff_ffff_ffffL;
    private static final long ONE_BITS = Double.doubleToRawLongBits(1.0);
    private static final double SQRT2 = 1.4142135623730951;
    private static final double EXPONENT_BASE = 0x1p52;
    private static final long EXPONENT_BASE_BITS = Double.doubleToRawLongBits(EXPONENT_BASE);
    /** 2/(2i + 1) for i = 1..10: 2 atanh(s) = 2s + s·Σ_i (2/(2i + 1)) s^(2i). */
    private static final double[] ATANH = atanhCoefficients(10);

    private static double[] atanhCoefficients(int terms) {
        double[] c = new double[terms + 1];
        for (int i = 1; i <= terms; i++) {
            c[i] = 2.0 / (2 * i + 1);
        }
        return c;
    }

    /**
     * ln x = e ln 2 + ln m for x = 2^e m, m in [√2/2, √2) (exponent and mantissa from the bits), and
     * ln m = ln(1 + f) = f − s(f − R) with s = f/(2 + f), R = Σ_{i=1..10} (2/(2i + 1)) s^(2i): the
     * series of 2 atanh s = ln((1 + s)/(1 − s)) (Abramowitz &amp; Stegun (1964), Handbook of
     * Mathematical Functions, 4.1.28), written so that the exact f carries the result and the
     * rounded part is at most a sixth of it; |s| ≤ 0.1716, so the series' remainder is below 10⁻¹⁷
     * relative. e ln 2 enters by one fused multiply-add with ln 2 in two parts. Measured within two
     * units in the last place of {@link StrictMath#log} (two where e ln 2 and ln m nearly cancel,
     * x in (1/2, 1/√2); one elsewhere). Values outside the positive normal numbers use {@link Math#log}.
     * As for the exponential, each output depends on its own input only.
     */
    @Override
    public void logs(double[] x, int[] idx, int n, double[] out) {
        int i = 0;
        for (; i + L <= n; i += L) {
            DoubleVector v = DoubleVector.fromArray(S, x, 0, idx, i);
            log(v).intoArray(out, i);
            VectorMask<Double> normal = v.compare(VectorOperators.GE, Double.MIN_NORMAL)
                    .and(v.compare(VectorOperators.LE, Double.MAX_VALUE));
            if (!normal.allTrue()) {
                for (int t = i; t < i + L; t++) {
                    if (!normal.laneIsSet(t - i)) {
                        out[t] = Math.log(x[idx[t]]);
                    }
                }
            }
        }
        for (; i < n; i++) {
            out[i] = log(x[idx[i]]);
        }
    }

    /**
     * The series logarithm of {@link #logs} lane by lane; lanes outside the positive normal
     * numbers hold no meaningful value and must be replaced by {@link Math#log} of theirs.
     */
    static DoubleVector log(DoubleVector v) {
        double[] c = ATANH;
        LongVector bits = (LongVector) v.reinterpretAsLongs();
        // the biased exponent k (0..4095 with the sign bit) as the double 2^52 + k, less 2^52 + 1023: every
        // term an integer below 2^53, so e = k − 1023 exactly, the value of the one-lane (double) conversion;
        // a long-to-double conversion has no instruction before AVX-512 and would run lane by lane in Java
        DoubleVector e = ((DoubleVector) bits.lanewise(VectorOperators.LSHR, 52).or(EXPONENT_BASE_BITS)
                .reinterpretAsDoubles()).sub(EXPONENT_BASE + 1023.0);
        DoubleVector m = (DoubleVector) bits.and(MANTISSA).or(ONE_BITS).reinterpretAsDoubles();
        VectorMask<Double> big = m.compare(VectorOperators.GT, SQRT2);
        m = m.blend(m.mul(0.5), big);
        e = e.blend(e.add(1.0), big);
        DoubleVector f = m.sub(1.0);
        DoubleVector sv = f.div(f.add(2.0));
        DoubleVector z = sv.mul(sv);
        DoubleVector r = DoubleVector.broadcast(S, c[10]);
        for (int t = 9; t >= 1; t--) {
            r = r.lanewise(VectorOperators.FMA, z, DoubleVector.broadcast(S, c[t]));
        }
        r = r.mul(z);
        DoubleVector lnm = f.sub(sv.mul(f.sub(r)));
        DoubleVector rest = e.lanewise(VectorOperators.FMA, LN2_LO, lnm);
        return e.lanewise(VectorOperators.FMA, LN2_HI, rest);
    }

    /**
     * ln x: the same operations as one lane of {@link #log(DoubleVector)} (so the same bits) where
     * x is a positive normal number, {@link Math#log} elsewhere.
     */
    static double log(double x) {
        if (!(x >= Double.MIN_NORMAL && x <= Double.MAX_VALUE)) {
            return Math.log(x);
        }
        double[] c = ATANH;
        long bits = Double.doubleToRawLongBits(x);
        double e = (double) ((bits >>> 52) - 1023L);
        double m = Double.longBitsToDouble((bits & MANTISSA) | ONE_BITS);
        if (m > SQRT2) {
            m = m * 0.5;
            e = e + 1.0;
        }
        double f = m - 1.0;
        double sv = f / (f + 2.0);
        double z = sv * sv;
        double r = c[10];
        for (int t = 9; t >= 1; t--) {
            r = Math.fma(r, z, c[t]);
        }
        r = r * z;
        double lnm = f - sv * (f - r);
        double rest = Math.fma(e, LN2_LO, lnm);
        return Math.fma(e, LN2_HI, rest);
    }
}
