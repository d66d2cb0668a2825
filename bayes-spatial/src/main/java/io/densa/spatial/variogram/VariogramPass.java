package io.densa.spatial.variogram;

import io.densa.spatial.Locations;
import io.densa.spatial.internal.GreatCircle;
import io.densa.spatial.internal.Scaling;
import java.util.Arrays;

/** One estimation pass of {@link EmpiricalVariogram}: the inputs shared by all tiles (read-only; package-private). */
final class VariogramPass {
    private static final int JTILE = 256;
    private static final int LANES = 4;

    /** Per-tile bin totals: sums of squared B2 distances, sums of lags, pair counts. */
    record TileSums(double[] gamma, double[] lag, long[] count) {
    }

    final int n;
    final int k;
    final double[] y;
    final double[] yt;
    final double[] nsq;
    final double[] p;
    final boolean geo;
    final double max2;
    final double[] e;
    final boolean uniform;
    final double invWidth;
    final int ns;
    final int nb;
    final double[] dcos;
    final double[] dsin;
    final double cosT;
    final boolean directional;
    final int stride;

    VariogramPass(int n, int k, double[] y, double[] yt, double[] nsq, double[] p, boolean geo, double max2, double[] e,
            boolean uniform, double invWidth, int ns, double[] dcos, double[] dsin, double cosT,
            boolean directional) {
        this.n = n;
        this.k = k;
        this.y = y;
        this.yt = yt;
        this.nsq = nsq;
        this.p = p;
        this.geo = geo;
        this.max2 = max2;
        this.e = e;
        this.uniform = uniform;
        this.invWidth = invWidth;
        this.ns = ns;
        this.nb = e.length - 1;
        this.dcos = dcos;
        this.dsin = dsin;
        this.cosT = cosT;
        this.directional = directional;
        this.stride = ns * nb;
    }

    /** Bin totals of all pairs (i, j), i in [i0, i1), j &gt; i (first stride entries are valid). */
    TileSums tile(int i0, int i1) {
        // LANES interleaved accumulator copies break the store-to-load dependency chains when
        // consecutive pairs fall in the same bin; copies are combined in fixed order below
        double[] sg = new double[LANES * stride];
        double[] sh = new double[LANES * stride];
        long[] sc = new long[LANES * stride];
        double[] da = new double[JTILE];
        double[] db = new double[JTILE];
        for (int j0 = i0; j0 < n; j0 += JTILE) {
            int j1 = Math.min(n, j0 + JTILE);
            for (int i = i0; i < i1; i += 2) {
                boolean two = i + 1 < i1;
                int js = Math.max(j0, i + 1);
                if (js >= j1) {
                    continue;
                }
                int len = j1 - js;
                dots(i, two, js, len, da, db);
                pairs(i, js, len, da, 0, sg, sh, sc);
                if (two) {
                    int js2 = Math.max(j0, i + 2);
                    if (js2 < j1) {
                        pairs(i + 1, js2, j1 - js2, db, js2 - js, sg, sh, sc);
                    }
                }
            }
        }
        for (int l = 1; l < LANES; l++) {
            for (int o = 0; o < stride; o++) {
                sg[o] += sg[l * stride + o];
                sh[o] += sh[l * stride + o];
                sc[o] += sc[l * stride + o];
            }
        }
        return new TileSums(sg, sh, sc);
    }

    /**
     * da[q] = y_i · y_{js+q} (and db for row i + 1), q &lt; len: four coordinates per sweep and
     * two rows sharing each load, so each pass over da/db carries eight multiply-adds per element.
     */
    private void dots(int i, boolean two, int js, int len, double[] da, double[] db) {
        Arrays.fill(da, 0, len, 0.0);
        if (two) {
            Arrays.fill(db, 0, len, 0.0);
        }
        int ia = i * k, ib = (i + 1) * k;
        int c = 0;
        for (; c + 3 < k; c += 4) {
            double a0 = y[ia + c], a1 = y[ia + c + 1], a2 = y[ia + c + 2], a3 = y[ia + c + 3];
            int o0 = c * n + js, o1 = o0 + n, o2 = o1 + n, o3 = o2 + n;
            if (two) {
                double b0 = y[ib + c], b1 = y[ib + c + 1], b2 = y[ib + c + 2], b3 = y[ib + c + 3];
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
            double a = y[ia + c];
            double b = two ? y[ib + c] : 0;
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

    /** Bins the pairs (i, js + q), q &lt; len, whose dot products are dot[dotOff + q]. */
    private void pairs(int i, int js, int len, double[] dot, int dotOff, double[] sg, double[] sh, long[] sc) {
        double ni = nsq[i];
        for (int q = 0; q < len; q++) {
            int j = js + q;
            double d2;
            double dx = 0, dy = 0;
            if (geo) {
                double ex = p[3 * i] - p[3 * j], ey = p[3 * i + 1] - p[3 * j + 1], ez = p[3 * i + 2] - p[3 * j + 2];
                d2 = ex * ex + ey * ey + ez * ez;
            } else {
                dx = p[2 * j] - p[2 * i];
                dy = p[2 * j + 1] - p[2 * i + 1];
                d2 = dx * dx + dy * dy;
            }
            if (d2 > max2) {
                continue;
            }
            // the same operations as Locations.distance, so a pair on a bin edge bins the same way
            // planar: √d2 wherever d2 is in range, as Scaling.planarNorm (the scaled form only beyond)
            double h = geo ? GreatCircle.kmFromChordSq(p, 3 * i, 3 * j, d2)
                    : d2 <= 0x1p960 && d2 >= 0x1p-960 ? Math.sqrt(d2) : Scaling.planarNorm(dx, dy);
            if (h > e[nb]) {
                continue;
            }
            int b = uniform ? Math.max(0, Math.min(nb - 1, (int) Math.ceil(h * invWidth) - 1))
                    : invWidth > 0 ? EmpiricalVariogram.binNear(e, h, invWidth) : EmpiricalVariogram.bin(e, h);
            if (b < 0) {
                continue;
            }
            double g = ni + nsq[j] - 2 * dot[dotOff + q];
            if (g < 0) {
                g = 0;
            }
            int lane = (q & (LANES - 1)) * stride;
            if (!directional) {
                sg[lane + b] += g;
                sh[lane + b] += h;
                sc[lane + b]++;
            } else {
                for (int s = 0; s < ns; s++) {
                    if (Math.abs(dx * dcos[s] + dy * dsin[s]) >= cosT * h) {
                        int o = lane + s * nb + b;
                        sg[o] += g;
                        sh[o] += h;
                        sc[o]++;
                    }
                }
            }
        }
    }
}
