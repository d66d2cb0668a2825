package io.densa.bench;

import io.densa.core.internal.UnitLanes;
import java.util.Locale;
import java.util.Random;

/**
 * Time per call of the estimator's lanes kernels ({@link UnitLanes}: eight units in the lanes of
 * one AVX-512 vector) on a cubic-spline layout of the side-by-side workload's shape (1,158 nodes,
 * 365 bins, 22 spans, K + 1 = 25; invented basis values and counts): the evaluation, the
 * observed-information node pass and the Cholesky factorisation of 24 × 24 matrices. Divide by
 * the lanes for the cost per unit. Needs the vector path:
 *
 * <pre>
 * java --add-modules jdk.incubator.vector -cp benchmarks/target/benchmarks.jar io.densa.bench.LanesKernels
 * </pre>
 */
public final class LanesKernels {
    private LanesKernels() {
    }

    public static void main(String[] args) {
        UnitLanes k = UnitLanes.active();
        if (k == null) {
            throw new IllegalStateException("run with --add-modules jdk.incubator.vector (the vector path)");
        }
        int lanes = k.lanes(), nodes = 1158, bins = 365, k1 = 25, spans = 22;
        Random r = new Random(1);
        double[][] col = new double[4][nodes];
        int[] first = new int[nodes];
        double[] w = new double[nodes];
        for (int q = 0; q < nodes; q++) {
            for (int i = 0; i < 4; i++) {
                col[i][q] = 0.3 * r.nextDouble();
            }
            first[q] = Math.min(k1 - 4, q * spans / nodes);
            w[q] = 0.1;
        }
        int runs = 0;
        for (int q = 0; q < nodes; q++) {
            runs += q == 0 || first[q] != first[q - 1] ? 1 : 0;
        }
        int[] runStart = new int[runs + 1];
        for (int q = 0, rr = 0; q < nodes; q++) {
            if (q == 0 || first[q] != first[q - 1]) {
                runStart[rr++] = q;
            }
        }
        runStart[runs] = nodes;
        int[] binStart = new int[bins + 1];
        for (int j = 0; j <= bins; j++) {
            binStart[j] = (int) ((long) j * nodes / bins);
        }
        int[] lo = new int[bins], hi = new int[bins];
        boolean[] oneSpan = new boolean[bins];
        for (int j = 0; j < bins; j++) {
            lo[j] = first[binStart[j]];
            hi[j] = first[binStart[j + 1] - 1] + 4;
            oneSpan[j] = hi[j] - lo[j] == 4;
        }
        int[] bandLo = new int[k1];
        for (int i = 0; i < k1; i++) {
            bandLo[i] = i;
        }
        for (int j = 0; j < bins; j++) {
            for (int i = lo[j]; i < hi[j]; i++) {
                bandLo[i] = Math.min(bandLo[i], lo[j]);
            }
        }
        UnitLanes.Layout lay = new UnitLanes.Layout(nodes, bins, k1, col, runStart, first, w, binStart, lo, hi,
                oneSpan, bandLo);
        double[] beta = new double[k1 * lanes];
        for (int i = 0; i < beta.length; i++) {
            beta[i] = r.nextGaussian();
        }
        double[] counts = new double[bins * lanes];
        for (int i = 0; i < counts.length; i++) {
            counts[i] = r.nextInt(5);
        }
        double[] eta = new double[nodes * lanes], ex = new double[nodes * lanes], mass = new double[bins * lanes];
        double[] res = new double[3 * lanes], totals = new double[lanes], zs = new double[lanes];
        double[] grad = new double[k1 * lanes], hess = new double[k1 * k1 * lanes], mvec = new double[k1 * lanes];
        double[] uj = new double[k1 * lanes];
        int n = k1 - 1;
        double[] spd = new double[n * n * lanes], work = new double[spd.length];
        for (int l = 0; l < lanes; l++) {
            double[] g = new double[n * n];
            for (int i = 0; i < g.length; i++) {
                g[i] = r.nextGaussian();
            }
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    double s = i == j ? n : 0;
                    for (int p = 0; p < n; p++) {
                        s += g[i * n + p] * g[j * n + p];
                    }
                    spd[(i * n + j) * lanes + l] = s;
                }
            }
        }
        int[] failed = new int[lanes];
        int reps = 20_000;
        for (int round = 0; round < 6; round++) {
            long t0 = System.nanoTime();
            for (int it = 0; it < reps; it++) {
                k.evaluate(lay, beta, counts, eta, ex, mass, res);
            }
            long t1 = System.nanoTime();
            for (int l = 0; l < lanes; l++) {
                totals[l] = 500;
                zs[l] = res[l];
            }
            for (int it = 0; it < reps; it++) {
                k.derivatives(lay, counts, totals, ex, mass, zs, grad, hess, mvec, uj);
            }
            long t2 = System.nanoTime();
            for (int it = 0; it < reps; it++) {
                System.arraycopy(spd, 0, work, 0, spd.length);
                k.cholesky(work, n, n, 0.0, failed);
            }
            long t3 = System.nanoTime();
            System.out.printf(Locale.ROOT, "lanes %d: evaluation %.2f us, node pass %.2f us, Cholesky (%d x %d) %.2f us"
                    + " per call%n", lanes, (t1 - t0) / 1e3 / reps, (t2 - t1) / 1e3 / reps, n, n, (t3 - t2) / 1e3 / reps);
        }
    }
}
