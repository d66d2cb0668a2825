package io.densa.core.internal;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;

/**
 * Both kernel paths against EJML's general dense products (CommonOps_DDRM.multTransA / mult, a
 * general-purpose reference library) and against each other. The SIMD path exists only when the
 * JVM runs with {@code --add-modules jdk.incubator.vector}; the build runs this module's tests a
 * second time with that flag and {@code densa.vector.required=true}, where its absence fails.
 */
class KernelPathTest {
    private static final int[] WIDTHS = {1, 3, 4, 7, 8, 9, 13, 16, 24, 31, 32, 33, 40};

    private static KernelPath vectorPath() {
        KernelPath v = KernelPath.vector();
        if (Boolean.getBoolean("densa.vector.required")) {
            assertNotNull(v, "densa.vector.required is set but the SIMD path did not load");
        }
        Assumptions.assumeTrue(v != null, "JVM without jdk.incubator.vector");
        return v;
    }

    @Test
    void activePathFollowsTheModuleAndTheSwitch() {
        boolean module = ModuleLayer.boot().findModule("jdk.incubator.vector").isPresent();
        if (!module) {
            assertEquals(1, KernelPath.active().lanes());
            assertEquals("scalar", KernelPath.active().describe());
        } else if (!"false".equalsIgnoreCase(System.getProperty("densa.vector", ""))) {
            assertTrue(KernelPath.active().lanes() >= 4, KernelPath.active().describe());
        }
        assertEquals(1, KernelPath.scalar().lanes());
    }

    /** Σ_i (a_i − c)(a_i − c)ᵀ by EJML: (A − 1cᵀ)ᵀ(A − 1cᵀ). */
    private static double[] ejmlCross(double[] a, int k, int[] rows, int r0, int r1, double[] c) {
        int n = r1 - r0;
        DMatrixRMaj m = new DMatrixRMaj(n, k);
        for (int t = 0; t < n; t++) {
            int o = (rows == null ? r0 + t : rows[r0 + t]) * k;
            for (int j = 0; j < k; j++) {
                m.set(t, j, a[o + j] - (c == null ? 0 : c[j]));
            }
        }
        DMatrixRMaj out = new DMatrixRMaj(k, k);
        CommonOps_DDRM.multTransA(m, m, out);
        return out.data;
    }

    private static void assertUpperClose(double[] expected, double[] actual, int k, double rel, String what) {
        for (int j = 0; j < k; j++) {
            for (int l = j; l < k; l++) {
                double scale = Math.sqrt(Math.abs(expected[j * k + j] * expected[l * k + l])) + 1e-300;
                assertEquals(expected[j * k + l], actual[j * k + l], rel * scale, what + " (" + j + "," + l + ")");
            }
        }
    }

    private static void checkCross(KernelPath path) {
        Random rnd = new Random(11);
        for (int k : WIDTHS) {
            int n = 700;
            double[] a = new double[n * k];
            for (int i = 0; i < a.length; i++) {
                a[i] = 3 + rnd.nextGaussian();
            }
            double[] c = new double[k];
            for (int j = 0; j < k; j++) {
                c[j] = 3 + 0.1 * rnd.nextGaussian();
            }
            int[] rows = new int[900];
            for (int i = 0; i < rows.length; i++) {
                rows[i] = rnd.nextInt(n);
            }
            double[] s = new double[k * k];
            path.addCrossProduct(a, k, null, 5, 650, c, s);
            assertUpperClose(ejmlCross(a, k, null, 5, 650, c), s, k, 1e-13, path.describe() + " k=" + k);
            double[] s2 = new double[k * k];
            path.addCrossProduct(a, k, rows, 17, 883, null, s2);
            assertUpperClose(ejmlCross(a, k, rows, 17, 883, null), s2, k, 1e-13, path.describe() + " rows k=" + k);
            // accumulates: a second call doubles the sums
            path.addCrossProduct(a, k, rows, 17, 883, null, s2);
            double[] twice = ejmlCross(a, k, rows, 17, 883, null);
            for (int i = 0; i < twice.length; i++) {
                twice[i] *= 2;
            }
            assertUpperClose(twice, s2, k, 1e-13, path.describe() + " accumulated k=" + k);
        }
    }

    private static void checkMultiply(KernelPath path) {
        Random rnd = new Random(12);
        for (int k : WIDTHS) {
            for (int m : new int[] {1, 5, 8, 31, 32, 33, 64, 70, 300}) {
                int rows = 7;
                double[] a = new double[3 + rows * k];
                double[] b = new double[k * m];
                for (int i = 0; i < a.length; i++) {
                    a[i] = rnd.nextGaussian();
                }
                for (int i = 0; i < b.length; i++) {
                    b[i] = rnd.nextGaussian();
                }
                double[] out = new double[2 + rows * m];
                java.util.Arrays.fill(out, Double.NaN);
                path.multiplyRows(a, 3, rows, k, b, m, out, 2);
                DMatrixRMaj am = new DMatrixRMaj(rows, k);
                System.arraycopy(a, 3, am.data, 0, rows * k);
                DMatrixRMaj ref = new DMatrixRMaj(rows, m);
                CommonOps_DDRM.mult(am, DMatrixRMaj.wrap(k, m, b), ref);
                assertTrue(Double.isNaN(out[0]) && Double.isNaN(out[1]), "writes only its block");
                for (int i = 0; i < rows * m; i++) {
                    assertEquals(ref.data[i], out[2 + i], 1e-13 * Math.sqrt(k) * 4,
                            path.describe() + " k=" + k + " m=" + m + " at " + i);
                }
            }
        }
    }

    private static void checkRowDots(KernelPath path) {
        Random rnd = new Random(13);
        int n = 300;
        for (int k : WIDTHS) {
            double[] y = new double[n * k];
            for (int i = 0; i < y.length; i++) {
                y[i] = rnd.nextGaussian();
            }
            double[] yt = new double[k * n];
            for (int i = 0; i < n; i++) {
                for (int c = 0; c < k; c++) {
                    yt[c * n + i] = y[i * k + c];
                }
            }
            for (int len : new int[] {1, 7, 8, 31, 32, 33, 64, 100, 256}) {
                int js = n - len - 3;
                double[] da = new double[256];
                double[] db = new double[256];
                path.rowDots(y, yt, n, k, 4, 5, js, len, da, db);
                double[] da1 = new double[256];
                path.rowDots(y, yt, n, k, 4, -1, js, len, da1, null);
                for (int q = 0; q < len; q++) {
                    DMatrixRMaj yi = DMatrixRMaj.wrap(1, k, java.util.Arrays.copyOfRange(y, 4 * k, 5 * k));
                    DMatrixRMaj yj = DMatrixRMaj.wrap(k, 1, java.util.Arrays.copyOfRange(y, (js + q) * k,
                            (js + q + 1) * k));
                    DMatrixRMaj yi2 = DMatrixRMaj.wrap(1, k, java.util.Arrays.copyOfRange(y, 5 * k, 6 * k));
                    double ra = CommonOps_DDRM.dot(yi, DMatrixRMaj.wrap(1, k, yj.data));
                    double rb = CommonOps_DDRM.dot(yi2, DMatrixRMaj.wrap(1, k, yj.data));
                    String what = path.describe() + " k=" + k + " len=" + len + " q=" + q;
                    assertEquals(ra, da[q], 1e-13 * k, what);
                    assertEquals(rb, db[q], 1e-13 * k, what);
                    assertEquals(da[q], da1[q], 0.0, "one row alone gives the same sums");
                }
            }
        }
    }

    @Test
    void scalarPathMatchesEjml() {
        KernelPath p = KernelPath.scalar();
        checkCross(p);
        checkMultiply(p);
        checkRowDots(p);
    }

    @Test
    void vectorPathMatchesEjml() {
        KernelPath p = vectorPath();
        checkCross(p);
        checkMultiply(p);
        checkRowDots(p);
    }

    /** The agreement bound between the paths: 1e-12 relative on the sums of products. */
    @Test
    void pathsAgreeOnLargeSums() {
        KernelPath v = vectorPath();
        Random rnd = new Random(14);
        int n = 20_000;
        int k = 32;
        double[] a = new double[n * k];
        for (int i = 0; i < a.length; i++) {
            a[i] = 5 + rnd.nextGaussian();
        }
        double[] mean = Kernels.columnSums(a, n, k, false);
        for (int j = 0; j < k; j++) {
            mean[j] /= n;
        }
        double[] s1 = new double[k * k];
        double[] s2 = new double[k * k];
        KernelPath.scalar().addCrossProduct(a, k, null, 0, n, mean, s1);
        v.addCrossProduct(a, k, null, 0, n, mean, s2);
        assertUpperClose(s1, s2, k, 1e-12, "scalar vs vector");
    }

    /**
     * w·exp(a·x − shift) on both paths (also a ≠ 1 and w null) against {@link StrictMath#exp},
     * which the Java platform
     * specifies as the fdlibm algorithm (Sun Microsystems, fdlibm 5.3, e_exp.c: error below one
     * unit in the last place): within two units of StrictMath's result (so within three of the
     * exact value), over arguments spanning the whole range, the fallback's edges (±708), underflow
     * to subnormals and zero, NaN and infinities, and lengths that are not multiples of the vector.
     */
    private static void checkWeightedExp(KernelPath path) {
        Random rnd = new Random(2026);
        double[] special = {0, -0.0, 1e-300, -1e-300, -0.34657359027997264, 0.34657359027997264, -707.9999, -708,
            -708.0001, -709.7, -744.4, -746, -1e4, 707.9, 708.2, Double.NaN, Double.NEGATIVE_INFINITY, -1e-17};
        for (int n : new int[] {1, 7, 8, 9, 33, 1159}) {
            double[] x = new double[n];
            double[] w = new double[n];
            double[] out = new double[n];
            for (int rep = 0; rep < 40; rep++) {
                double shift = rep % 3 == 0 ? 0 : 10 * rnd.nextGaussian();
                for (int q = 0; q < n; q++) {
                    double u = rnd.nextDouble();
                    double v = rep % 4 == 0 ? -745 * u : rep % 4 == 1 ? -40 * u
                            : rep % 4 == 2 ? 1400 * u - 700 : 2 * u - 1;
                    x[q] = rnd.nextInt(20) == 0 ? special[rnd.nextInt(special.length)] + shift : v + shift;
                    w[q] = rep % 2 == 0 ? 1.0 : 0.5 + rnd.nextDouble();
                }
                double[] xs = x.clone();
                double[] ws = w.clone();
                double a = rep % 5 == 0 ? 1.0 : rep % 5 == 1 ? -0.37 : 1.0 + 0.5 * rnd.nextGaussian();
                boolean unweighted = rep % 7 == 3;
                path.weightedExp(x, a, shift, unweighted ? null : w, out, n);
                for (int q = 0; q < n; q++) {
                    double expected = (unweighted ? 1.0 : w[q]) * StrictMath.exp(a * x[q] - shift);
                    if (Double.isNaN(expected) || expected == 0 || Double.isInfinite(expected)) {
                        assertEquals(expected, out[q], 0.0, "a x − shift = " + (a * x[q] - shift));
                    } else {
                        assertEquals(expected, out[q], 2 * Math.ulp(expected), path.describe() + ": a x − shift = "
                                + (a * x[q] - shift) + ", w = " + w[q]);
                    }
                }
                org.junit.jupiter.api.Assertions.assertArrayEquals(xs, x, "x modified");
                org.junit.jupiter.api.Assertions.assertArrayEquals(ws, w, "w modified");
            }
        }
    }

    @Test
    void weightedExpScalarPathIsTheMathExpExpression() {
        checkWeightedExp(KernelPath.scalar());
        double[] x = {-3.5, 0.25, -700, 12};
        double[] w = {2, 0.5, 1, 3};
        double[] out = new double[4];
        KernelPath.scalar().weightedExp(x, 1.0, 1.5, w, out, 4);
        for (int q = 0; q < 4; q++) {
            assertEquals(w[q] * Math.exp(x[q] - 1.5), out[q], 0.0);
        }
        KernelPath.scalar().weightedExp(x, -0.25, 0.0, null, out, 4);
        for (int q = 0; q < 4; q++) {
            assertEquals(Math.exp(-0.25 * x[q]), out[q], 0.0);
        }
    }

    @Test
    void weightedExpVectorPathWithinTwoUlps() {
        checkWeightedExp(vectorPath());
    }

    /**
     * ln x of gathered entries on both paths against {@link StrictMath#log} (fdlibm 5.3, e_log.c:
     * error below one unit in the last place): within two units of StrictMath's result, for x over
     * the whole positive range, next to 1 (where ln x is small and relative accuracy is hardest),
     * next to √2 and powers of two (the reduction's switch points), and for 0, subnormals, ∞,
     * negative numbers and NaN, whose logarithms must be those of {@link Math#log} exactly.
     */
    private static void checkLogs(KernelPath path) {
        Random rnd = new Random(77);
        double[] special = {0.0, -0.0, Double.MIN_VALUE, 1e-310, Double.MIN_NORMAL, 1.0, 2.0, 0.5, 1.4142135623730951,
            1.4142135623730950, 0.7071067811865476, 1 + 1e-15, 1 - 1e-16, Double.MAX_VALUE, Double.POSITIVE_INFINITY,
            -1.0, Double.NaN, 1e300, 1e-300};
        for (int n : new int[] {1, 5, 8, 13, 300, 365}) {
            double[] x = new double[2 * n + 3];
            int[] idx = new int[n];
            double[] out = new double[n];
            for (int rep = 0; rep < 60; rep++) {
                for (int j = 0; j < x.length; j++) {
                    double u = rnd.nextDouble();
                    int kind = rep % 4;
                    x[j] = kind == 0 ? Math.exp(1400 * u - 700) : kind == 1 ? 1 + (u - 0.5) * 1e-3
                            : kind == 2 ? Math.scalb(0.7 + 0.75 * u, rnd.nextInt(200) - 100) : 1e-20 + u;
                    if (rnd.nextInt(25) == 0) {
                        x[j] = special[rnd.nextInt(special.length)];
                    }
                }
                for (int i = 0; i < n; i++) {
                    idx[i] = rnd.nextInt(x.length);
                }
                double[] xs = x.clone();
                path.logs(x, idx, n, out);
                for (int i = 0; i < n; i++) {
                    double xi = x[idx[i]];
                    double expected = StrictMath.log(xi);
                    if (!(xi >= Double.MIN_NORMAL && xi <= Double.MAX_VALUE)) {
                        assertEquals(Math.log(xi), out[i], 0.0, "x = " + xi);
                    } else {
                        assertEquals(expected, out[i], 2 * Math.ulp(expected), path.describe() + ": x = " + xi);
                    }
                }
                org.junit.jupiter.api.Assertions.assertArrayEquals(xs, x, "x modified");
            }
        }
    }

    @Test
    void logsScalarPathIsMathLog() {
        checkLogs(KernelPath.scalar());
        double[] x = {3.5, 0.25, 1e-200};
        double[] out = new double[2];
        KernelPath.scalar().logs(x, new int[] {2, 0}, 2, out);
        assertEquals(Math.log(1e-200), out[0], 0.0);
        assertEquals(Math.log(3.5), out[1], 0.0);
    }

    @Test
    void logsVectorPathWithinTwoUlps() {
        checkLogs(vectorPath());
    }

    /**
     * The variogram's pair kernels against their definitions, on runs of every length around the
     * vector width: d² = dx² + dy² and h = √d² (Math.sqrt, correctly rounded: IEEE 754-2019 §5.4.1,
     * so one right answer), the bin ⌈h/w⌉ − 1 (Math.ceil) clamped to [0, last] or "beyond" past the
     * largest lag, and ‖a‖² + ‖b‖² − 2 a·b with negative rounding set to 0. Lags are drawn on and
     * next to bin edges (where the ceiling's integer case decides), at 0 and far beyond the bins.
     */
    private static void checkPairKernels(KernelPath path) {
        Random rnd = new Random(91);
        double width = 0.5 / 30;
        double inv = 1 / width;
        int last = 29;
        int beyond = 30;
        double top = 0.5;
        double max2 = top * top * (1 + 1e-12);
        for (int len : new int[] {1, 3, 4, 5, 8, 9, 17, 256}) {
            double[] xs = new double[len + 5], ys = new double[len + 5];
            for (int rep = 0; rep < 40; rep++) {
                for (int j = 0; j < xs.length; j++) {
                    int kind = rnd.nextInt(4);
                    double r = kind == 0 ? rnd.nextInt(40) * width : kind == 1 ? Math.nextUp(rnd.nextInt(40) * width)
                            : kind == 2 ? 0.0 : rnd.nextDouble() * (rnd.nextBoolean() ? 0.7 : 1e9);
                    double a = rnd.nextDouble() * 2 * Math.PI;
                    boolean axis = rnd.nextBoolean(); // along an axis the lag is r itself, edges included
                    xs[j] = 0.25 + (axis ? r : r * Math.cos(a));
                    ys[j] = -0.5 + (axis ? 0 : r * Math.sin(a));
                }
                double x0 = 0.25, y0 = -0.5;
                int from = rnd.nextInt(5);
                double[] d2 = new double[len], h = new double[len], bin = new double[len];
                path.planarLags(xs, ys, x0, y0, from, len, d2, h);
                path.lagBins(d2, h, len, inv, last, beyond, max2, top, bin);
                for (int q = 0; q < len; q++) {
                    double dx = xs[from + q] - x0, dy = ys[from + q] - y0;
                    double e2 = dx * dx + dy * dy;
                    String what = path.describe() + " len=" + len + " q=" + q;
                    assertEquals(e2, d2[q], 0.0, what);
                    assertEquals(Math.sqrt(e2), h[q], 0.0, what);
                    double b = e2 > max2 || h[q] > top ? beyond
                            : Math.max(0, Math.min(last, Math.ceil(h[q] * inv) - 1));
                    assertEquals(b, bin[q], 0.0, what + " h/w=" + h[q] * inv);
                }
                double[] nsq = new double[len + 5], dot = new double[len + 3];
                for (int j = 0; j < nsq.length; j++) {
                    nsq[j] = rnd.nextDouble() * 4;
                }
                for (int j = 0; j < dot.length; j++) {
                    dot[j] = (rnd.nextDouble() - 0.3) * 4;
                }
                double ni = rnd.nextDouble() * 4;
                double[] before = dot.clone();
                path.squaredDistances(ni, nsq, from, dot, 2, len);
                for (int q = 0; q < dot.length; q++) {
                    double expect = q < 2 || q >= 2 + len ? before[q]
                            : Math.max(0.0, ni + nsq[from + q - 2] - 2 * before[q]);
                    assertEquals(expect, dot[q], 0.0, path.describe() + " squaredDistances len=" + len + " at " + q);
                }
            }
        }
    }

    @Test
    void pairKernelsScalarPath() {
        checkPairKernels(KernelPath.scalar());
    }

    @Test
    void pairKernelsVectorPath() {
        checkPairKernels(vectorPath());
    }
}
