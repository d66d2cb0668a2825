package io.densa.bench;

import java.util.Locale;
import java.util.Random;
import jdk.incubator.vector.DoubleVector;
import jdk.incubator.vector.VectorSpecies;

/**
 * A probe for issue 14's estimation lever "batch several units": the node sums of the estimator's
 * derivative pass for cubic splines (per knot span, four first moments Σ e v_a and ten second
 * moments Σ m_a v_b with m = −e c v, c the bin's coefficient), on the side-by-side workload's shape
 * (1,158 nodes, 24 spans, 365 bins, random values), for eight units one after the other as the
 * estimator does today against the same sums with the eight units in the lanes of one AVX-512
 * vector (the same operations per lane, so the same bits; the probe prints one sum of each). Not
 * the library's code: a measurement of what the lever could give.
 *
 * <pre>
 * java --add-modules jdk.incubator.vector -cp benchmarks/target/benchmarks.jar io.densa.bench.LanesProbe
 * </pre>
 */
public final class LanesProbe {
    private LanesProbe() {
    }

    static final VectorSpecies<Double> S = DoubleVector.SPECIES_512;
    public static void main(String[] args) {
        int nq = 1158, spans = 24, bins = 365;
        Random r = new Random(1);
        double[] v = new double[nq * 4];
        for (int i = 0; i < v.length; i++) v[i] = r.nextDouble();
        int[] span = new int[nq];
        int[] bin = new int[nq];
        for (int q = 0; q < nq; q++) { span[q] = q * spans / nq; bin[q] = q * bins / nq; }
        double[][] ex = new double[8][nq];
        for (double[] e : ex) for (int q = 0; q < nq; q++) e[q] = r.nextDouble();
        double[][] coef = new double[8][bins];
        for (double[] c : coef) for (int j = 0; j < bins; j++) c[j] = r.nextDouble();
        // lane layout
        double[] exL = new double[nq * 8];
        double[] coefL = new double[bins * 8];
        for (int u = 0; u < 8; u++) { for (int q = 0; q < nq; q++) exL[q * 8 + u] = ex[u][q]; for (int j = 0; j < bins; j++) coefL[j * 8 + u] = coef[u][j]; }
        double[] outS = new double[8 * spans * 14];
        double[] outL = new double[spans * 14 * 8];
        for (int rep = 0; rep < 5; rep++) {
            long t0 = System.nanoTime();
            for (int it = 0; it < 20000; it++) for (int u = 0; u < 8; u++) scalar(v, span, bin, ex[u], coef[u], outS, u * spans * 14, nq);
            long t1 = System.nanoTime();
            for (int it = 0; it < 20000; it++) lanes(v, span, bin, exL, coefL, outL, nq);
            long t2 = System.nanoTime();
            boolean same = true;
            for (int u = 0; u < 8; u++) {
                for (int sp = 0; sp < spans; sp++) {
                    for (int t = 0; t < 14; t++) {
                        same &= Double.doubleToRawLongBits(outS[u * spans * 14 + sp * 14 + t])
                                == Double.doubleToRawLongBits(outL[sp * 14 * 8 + t * 8 + u]);
                    }
                }
            }
            System.out.printf(Locale.ROOT, "one by one %.2f us per 8 units, in lanes %.2f us, ratio %.2f; the same bits: %b%n",
                    (t1 - t0) / 2e4 / 1e3, (t2 - t1) / 2e4 / 1e3, (double) (t1 - t0) / (t2 - t1), same);
        }
    }
    static void scalar(double[] v, int[] span, int[] bin, double[] ex, double[] coef, double[] out, int o, int nq) {
        int cur = -1;
        double u0 = 0, u1 = 0, u2 = 0, u3 = 0, h00 = 0, h10 = 0, h11 = 0, h20 = 0, h21 = 0, h22 = 0, h30 = 0, h31 = 0, h32 = 0, h33 = 0;
        for (int q = 0; q < nq; q++) {
            if (span[q] != cur) {
                if (cur >= 0) { int b = o + cur * 14; out[b] = u0; out[b+1] = u1; out[b+2] = u2; out[b+3] = u3; out[b+4] = h00; out[b+5] = h10; out[b+6] = h11; out[b+7] = h20; out[b+8] = h21; out[b+9] = h22; out[b+10] = h30; out[b+11] = h31; out[b+12] = h32; out[b+13] = h33; }
                cur = span[q]; u0 = u1 = u2 = u3 = h00 = h10 = h11 = h20 = h21 = h22 = h30 = h31 = h32 = h33 = 0;
            }
            double e = ex[q], c = coef[bin[q]];
            int base = q << 2;
            double v0 = v[base], v1 = v[base + 1], v2 = v[base + 2], v3 = v[base + 3];
            u0 = Math.fma(e, v0, u0); u1 = Math.fma(e, v1, u1); u2 = Math.fma(e, v2, u2); u3 = Math.fma(e, v3, u3);
            double m0 = -e * c * v0, m1 = -e * c * v1, m2 = -e * c * v2, m3 = -e * c * v3;
            h00 = Math.fma(m0, v0, h00); h10 = Math.fma(m1, v0, h10); h11 = Math.fma(m1, v1, h11); h20 = Math.fma(m2, v0, h20); h21 = Math.fma(m2, v1, h21);
            h22 = Math.fma(m2, v2, h22); h30 = Math.fma(m3, v0, h30); h31 = Math.fma(m3, v1, h31); h32 = Math.fma(m3, v2, h32); h33 = Math.fma(m3, v3, h33);
        }
        int b = o + cur * 14; out[b] = u0; out[b+1] = u1; out[b+2] = u2; out[b+3] = u3; out[b+4] = h00; out[b+5] = h10; out[b+6] = h11; out[b+7] = h20; out[b+8] = h21; out[b+9] = h22; out[b+10] = h30; out[b+11] = h31; out[b+12] = h32; out[b+13] = h33;
    }
    static void lanes(double[] v, int[] span, int[] bin, double[] ex, double[] coef, double[] out, int nq) {
        int cur = -1;
        DoubleVector z = DoubleVector.zero(S);
        DoubleVector u0 = z, u1 = z, u2 = z, u3 = z, h00 = z, h10 = z, h11 = z, h20 = z, h21 = z, h22 = z, h30 = z, h31 = z, h32 = z, h33 = z;
        for (int q = 0; q < nq; q++) {
            if (span[q] != cur) {
                if (cur >= 0) { int b = cur * 14 * 8; u0.intoArray(out, b); u1.intoArray(out, b + 8); u2.intoArray(out, b + 16); u3.intoArray(out, b + 24); h00.intoArray(out, b + 32); h10.intoArray(out, b + 40); h11.intoArray(out, b + 48); h20.intoArray(out, b + 56); h21.intoArray(out, b + 64); h22.intoArray(out, b + 72); h30.intoArray(out, b + 80); h31.intoArray(out, b + 88); h32.intoArray(out, b + 96); h33.intoArray(out, b + 104); }
                cur = span[q]; u0 = u1 = u2 = u3 = h00 = h10 = h11 = h20 = h21 = h22 = h30 = h31 = h32 = h33 = z;
            }
            DoubleVector e = DoubleVector.fromArray(S, ex, q * 8);
            DoubleVector c = DoubleVector.fromArray(S, coef, bin[q] * 8);
            int base = q << 2;
            DoubleVector v0 = DoubleVector.broadcast(S, v[base]), v1 = DoubleVector.broadcast(S, v[base + 1]), v2 = DoubleVector.broadcast(S, v[base + 2]), v3 = DoubleVector.broadcast(S, v[base + 3]);
            u0 = e.fma(v0, u0); u1 = e.fma(v1, u1); u2 = e.fma(v2, u2); u3 = e.fma(v3, u3);
            DoubleVector ec = e.mul(c).neg();
            DoubleVector m0 = ec.mul(v0), m1 = ec.mul(v1), m2 = ec.mul(v2), m3 = ec.mul(v3);
            h00 = m0.fma(v0, h00); h10 = m1.fma(v0, h10); h11 = m1.fma(v1, h11); h20 = m2.fma(v0, h20); h21 = m2.fma(v1, h21);
            h22 = m2.fma(v2, h22); h30 = m3.fma(v0, h30); h31 = m3.fma(v1, h31); h32 = m3.fma(v2, h32); h33 = m3.fma(v3, h33);
        }
        int b = cur * 14 * 8; u0.intoArray(out, b); u1.intoArray(out, b + 8); u2.intoArray(out, b + 16); u3.intoArray(out, b + 24); h00.intoArray(out, b + 32); h10.intoArray(out, b + 40); h11.intoArray(out, b + 48); h20.intoArray(out, b + 56); h21.intoArray(out, b + 64); h22.intoArray(out, b + 72); h30.intoArray(out, b + 80); h31.intoArray(out, b + 88); h32.intoArray(out, b + 96); h33.intoArray(out, b + 104);
    }
}
