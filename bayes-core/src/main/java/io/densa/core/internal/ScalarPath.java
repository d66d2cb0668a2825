package io.densa.core.internal;

import java.util.Arrays;

/** The plain-Java kernels of {@link KernelPath}: unit-stride inner loops for the JIT's auto-vectoriser. */
final class ScalarPath extends KernelPath {
    /** Output columns per tile: a k × TILE slice of B stays in the L1 cache while a row block uses it. */
    private static final int TILE = 256;

    @Override
    public int lanes() {
        return 1;
    }

    @Override
    public void addColumnSumsAndMaxAbs(double[] a, int k, int r0, int r1, double[] s) {
        double big = s[k];
        for (int i = r0; i < r1; i++) {
            int o = i * k;
            for (int j = 0; j < k; j++) {
                double v = a[o + j];
                s[j] += v;
                big = Math.max(big, Math.abs(v));
            }
        }
        s[k] = big;
    }

    /**
     * Eight (centred) rows are folded into the matrix per pass, so each entry is loaded and stored
     * once per eight rows; the innermost loop runs unit-stride over the upper part (l ≥ j) of a row.
     */
    @Override
    public void addCrossProduct(double[] a, int k, int[] rows, int r0, int r1, double[] center, double[] s) {
        double[] r = new double[8 * k];
        for (int i = r0; i < r1; i += 8) {
            addEightRows(a, k, rows, i, Math.min(8, r1 - i), center, r, s);
        }
    }

    /** Folds up to eight (centred) rows, positions i..i+count−1 of the row list, into the upper triangle of s. */
    private static void addEightRows(double[] a, int k, int[] rows, int i, int count, double[] center, double[] r,
            double[] s) {
        for (int t = 0; t < 8; t++) {
            int o = t >= count ? 0 : (rows == null ? i + t : rows[i + t]) * k;
            for (int j = 0; j < k; j++) {
                r[t * k + j] = t >= count ? 0.0 : center == null ? a[o + j] : a[o + j] - center[j];
            }
        }
        int k1 = k, k2 = 2 * k, k3 = 3 * k, k4 = 4 * k, k5 = 5 * k, k6 = 6 * k, k7 = 7 * k;
        for (int j = 0; j < k; j++) {
            double x0 = r[j], x1 = r[k1 + j], x2 = r[k2 + j], x3 = r[k3 + j];
            double x4 = r[k4 + j], x5 = r[k5 + j], x6 = r[k6 + j], x7 = r[k7 + j];
            int so = j * k;
            // upper triangle only (l ≥ j): half the arithmetic; mirrored after the sum
            for (int l = j; l < k; l++) {
                s[so + l] += x0 * r[l] + x1 * r[k1 + l] + x2 * r[k2 + l] + x3 * r[k3 + l]
                        + x4 * r[k4 + l] + x5 * r[k5 + l] + x6 * r[k6 + l] + x7 * r[k7 + l];
            }
        }
    }

    /**
     * Output columns are tiled so that the slice of B in use stays in cache, and eight rows of B
     * are combined per pass so that each output element is loaded and stored k/8 times; the
     * innermost loop is unit-stride over the tile (auto-vectorised by C2).
     */
    @Override
    public void multiplyRows(double[] a, int aOff, int rows, int k, double[] b, int m, double[] out, int outOff) {
        for (int q0 = 0; q0 < m; q0 += TILE) {
            int q1 = Math.min(m, q0 + TILE);
            for (int i = 0; i < rows; i++) {
                int ai = aOff + i * k;
                int o = outOff + i * m;
                Arrays.fill(out, o + q0, o + q1, 0.0);
                int j = 0;
                for (; j + 8 <= k; j += 8) {
                    double c0 = a[ai + j], c1 = a[ai + j + 1], c2 = a[ai + j + 2], c3 = a[ai + j + 3];
                    double c4 = a[ai + j + 4], c5 = a[ai + j + 5], c6 = a[ai + j + 6], c7 = a[ai + j + 7];
                    int b0 = j * m, b1 = b0 + m, b2 = b1 + m, b3 = b2 + m, b4 = b3 + m, b5 = b4 + m, b6 = b5 + m,
                            b7 = b6 + m;
                    for (int q = q0; q < q1; q++) {
                        out[o + q] += c0 * b[b0 + q] + c1 * b[b1 + q] + c2 * b[b2 + q] + c3 * b[b3 + q]
                                + c4 * b[b4 + q] + c5 * b[b5 + q] + c6 * b[b6 + q] + c7 * b[b7 + q];
                    }
                }
                for (; j + 4 <= k; j += 4) {
                    double c0 = a[ai + j], c1 = a[ai + j + 1], c2 = a[ai + j + 2], c3 = a[ai + j + 3];
                    int b0 = j * m, b1 = b0 + m, b2 = b1 + m, b3 = b2 + m;
                    for (int q = q0; q < q1; q++) {
                        out[o + q] += c0 * b[b0 + q] + c1 * b[b1 + q] + c2 * b[b2 + q] + c3 * b[b3 + q];
                    }
                }
                for (; j < k; j++) {
                    double c0 = a[ai + j];
                    int b0 = j * m;
                    for (int q = q0; q < q1; q++) {
                        out[o + q] += c0 * b[b0 + q];
                    }
                }
            }
        }
    }

    @Override
    public void planarLags(double[] xs, double[] ys, double x0, double y0, int from, int len, double[] d2,
            double[] h) {
        planarLags(xs, ys, x0, y0, from, 0, len, d2, h);
    }

    /** {@link KernelPath#planarLags} for q in [q0, len) (also the vector path's tail). */
    static void planarLags(double[] xs, double[] ys, double x0, double y0, int from, int q0, int len, double[] d2,
            double[] h) {
        for (int q = q0; q < len; q++) {
            double dx = xs[from + q] - x0;
            double dy = ys[from + q] - y0;
            double s = dx * dx + dy * dy;
            d2[q] = s;
            h[q] = Math.sqrt(s);
        }
    }

    @Override
    public void squaredDistances(double ni, double[] nsq, int from, double[] dot, int off, int len) {
        squaredDistances(ni, nsq, from, dot, off, 0, len);
    }

    /** {@link KernelPath#squaredDistances} for q in [q0, len) (also the vector path's tail). */
    static void squaredDistances(double ni, double[] nsq, int from, double[] dot, int off, int q0, int len) {
        for (int q = q0; q < len; q++) {
            double g = ni + nsq[from + q] - 2 * dot[off + q];
            dot[off + q] = g < 0 ? 0 : g;
        }
    }

    @Override
    public void lagBins(double[] d2, double[] h, int len, double invWidth, int last, int beyond, double max2,
            double top, double[] bin) {
        lagBins(d2, h, 0, len, invWidth, last, beyond, max2, top, bin);
    }

    /** {@link KernelPath#lagBins} for q in [q0, len) (also the vector path's tail). */
    static void lagBins(double[] d2, double[] h, int q0, int len, double invWidth, int last, int beyond, double max2,
            double top, double[] bin) {
        for (int q = q0; q < len; q++) {
            bin[q] = lagBin(d2[q], h[q], invWidth, last, beyond, max2, top);
        }
    }

    /** Four coordinates per sweep and two rows sharing each load: eight multiply-adds per element and pass. */
    @Override
    public void rowDots(double[] y, double[] yt, int n, int k, int ia, int ib, int js, int len, double[] da,
            double[] db) {
        boolean two = ib >= 0;
        Arrays.fill(da, 0, len, 0.0);
        if (two) {
            Arrays.fill(db, 0, len, 0.0);
        }
        int oa = ia * k, ob = two ? ib * k : 0;
        int c = 0;
        for (; c + 3 < k; c += 4) {
            double a0 = y[oa + c], a1 = y[oa + c + 1], a2 = y[oa + c + 2], a3 = y[oa + c + 3];
            int o0 = c * n + js, o1 = o0 + n, o2 = o1 + n, o3 = o2 + n;
            if (two) {
                double b0 = y[ob + c], b1 = y[ob + c + 1], b2 = y[ob + c + 2], b3 = y[ob + c + 3];
                for (int q = 0; q < len; q++) {
                    double y0 = yt[o0 + q], y1 = yt[o1 + q], y2 = yt[o2 + q], y3 = yt[o3 + q];
                    da[q] += a0 * y0 + a1 * y1 + a2 * y2 + a3 * y3;
                    db[q] += b0 * y0 + b1 * y1 + b2 * y2 + b3 * y3;
                }
            } else {
                for (int q = 0; q < len; q++) {
                    da[q] += a0 * yt[o0 + q] + a1 * yt[o1 + q] + a2 * yt[o2 + q] + a3 * yt[o3 + q];
                }
            }
        }
        for (; c < k; c++) {
            double a = y[oa + c];
            double b = two ? y[ob + c] : 0;
            int o = c * n + js;
            for (int q = 0; q < len; q++) {
                da[q] += a * yt[o + q];
            }
            if (two) {
                for (int q = 0; q < len; q++) {
                    db[q] += b * yt[o + q];
                }
            }
        }
    }

    @Override
    public void weightedExp(double[] x, double a, double shift, double[] w, double[] out, int n) {
        if (w == null) {
            for (int q = 0; q < n; q++) {
                out[q] = Math.exp(a * x[q] - shift);
            }
            return;
        }
        for (int q = 0; q < n; q++) {
            out[q] = w[q] * Math.exp(a * x[q] - shift);
        }
    }

    @Override
    public void logs(double[] x, int[] idx, int n, double[] out) {
        for (int i = 0; i < n; i++) {
            out[i] = Math.log(x[idx[i]]);
        }
    }
}
