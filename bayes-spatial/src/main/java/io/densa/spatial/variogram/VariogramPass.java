package io.densa.spatial.variogram;

import io.densa.core.internal.KernelPath;
import io.densa.spatial.Locations;
import io.densa.spatial.internal.GreatCircle;
import io.densa.spatial.internal.Scaling;

/** One estimation pass of {@link EmpiricalVariogram}: the inputs shared by all tiles (read-only; package-private). */
final class VariogramPass {
    private static final int JTILE = 256;
    private static final int LANES = 4;
    private static final KernelPath PATH = KernelPath.active();

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
    /** Planar x and y coordinates apart (the lags' kernel reads them as runs), or null on the sphere. */
    private final double[] xs;
    private final double[] ys;

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
        this.xs = geo ? null : new double[n];
        this.ys = geo ? null : new double[n];
        for (int i = 0; !geo && i < n; i++) {
            xs[i] = p[2 * i];
            ys[i] = p[2 * i + 1];
        }
    }

    /** Bin totals of all pairs (i, j), i in [i0, i1), j &gt; i (first stride entries are valid). */
    TileSums tile(int i0, int i1) {
        // LANES interleaved accumulator copies break the store-to-load dependency chains when
        // consecutive pairs fall in the same bin; copies are combined in fixed order below
        // each copy has one extra slot (index stride) that collects the pairs out of range in the
        // branch-free loop (never read)
        int lw = stride + 1;
        double[] sg = new double[LANES * lw];
        double[] sh = new double[LANES * lw];
        long[] sc = new long[LANES * lw];
        double[] da = new double[JTILE];
        double[] db = new double[JTILE];
        double[][] buf = new double[3][JTILE]; // a run's squared distances, distances and bins
        int dim = geo ? 3 : 2;
        double[] box = new double[2 * dim];
        for (int j0 = i0; j0 < n; j0 += JTILE) {
            int j1 = Math.min(n, j0 + JTILE);
            boundingBox(j0, j1, box);
            for (int i = i0; i < i1; i += 2) {
                boolean two = i + 1 < i1;
                int js = Math.max(j0, i + 1);
                if (js >= j1) {
                    continue;
                }
                // rows farther than the largest lag from every location of the block have no pair in it
                boolean nearA = near(i, box);
                boolean nearB = two && near(i + 1, box);
                if (nearA && nearB) {
                    int len = j1 - js;
                    dots(i, true, js, len, da, db);
                    bin(i, js, len, da, 0, buf, sg, sh, sc);
                    int js2 = Math.max(j0, i + 2);
                    if (js2 < j1) {
                        bin(i + 1, js2, j1 - js2, db, js2 - js, buf, sg, sh, sc);
                    }
                } else if (nearA || nearB) {
                    int r = nearA ? i : i + 1;
                    int jr = Math.max(j0, r + 1);
                    if (jr < j1) {
                        dots(r, false, jr, j1 - jr, da, db);
                        bin(r, jr, j1 - jr, da, 0, buf, sg, sh, sc);
                    }
                }
            }
        }
        for (int l = 1; l < LANES; l++) {
            for (int o = 0; o < stride; o++) {
                sg[o] += sg[l * lw + o];
                sh[o] += sh[l * lw + o];
                sc[o] += sc[l * lw + o];
            }
        }
        return new TileSums(sg, sh, sc);
    }

    /** The smallest and largest coordinates (box[0..dim) and box[dim..2 dim)) of the locations j0..j1−1. */
    private void boundingBox(int j0, int j1, double[] box) {
        int dim = box.length / 2;
        for (int c = 0; c < dim; c++) {
            box[c] = Double.POSITIVE_INFINITY;
            box[dim + c] = Double.NEGATIVE_INFINITY;
        }
        for (int j = j0; j < j1; j++) {
            for (int c = 0; c < dim; c++) {
                double v = p[dim * j + c];
                box[c] = Math.min(box[c], v);
                box[dim + c] = Math.max(box[dim + c], v);
            }
        }
    }

    /**
     * Whether location i may lie within the largest lag of some location in the box: the squared
     * distance from p_i to the box (a lower bound of the squared spatial or chord distance to each
     * location in it) does not exceed the prefilter bound max2, which every pair that is binned
     * satisfies. A conservative test: it never drops a pair that the bins would keep.
     */
    private boolean near(int i, double[] box) {
        int dim = box.length / 2;
        double d2 = 0;
        for (int c = 0; c < dim; c++) {
            double v = p[dim * i + c];
            double gap = Math.max(0, Math.max(box[c] - v, v - box[dim + c]));
            d2 += gap * gap;
        }
        return !(d2 > max2);
    }

    /** da[q] = y_i · y_{js+q} (and db for row i + 1), q &lt; len, by the active {@link KernelPath}. */
    private void dots(int i, boolean two, int js, int len, double[] da, double[] db) {
        PATH.rowDots(y, yt, n, k, i, two ? i + 1 : -1, js, len, da, db);
    }

    private void bin(int i, int js, int len, double[] dot, int dotOff, double[][] buf, double[] sg, double[] sh,
            long[] sc) {
        if (!geo && uniform && !directional) {
            pairsPlanarUniform(i, js, len, dot, dotOff, buf, sg, sh, sc);
        } else {
            pairs(i, js, len, dot, dotOff, sg, sh, sc);
        }
    }

    /**
     * {@link #pairs} for the common case (planar, equal-width bins, all directions) without
     * data-dependent branches: a pair out of range goes to the extra slot of its accumulator copy
     * instead of being skipped, so the loop does not pay a mispredicted branch for the roughly half
     * of all pairs that lie beyond the largest lag. Same arithmetic, same bins, same sums.
     */
    private void pairsPlanarUniform(int i, int js, int len, double[] dot, int dotOff, double[][] buf, double[] sg,
            double[] sh, long[] sc) {
        double ni = nsq[i];
        double xi = xs[i], yi = ys[i];
        double top = e[nb];
        int lw = stride + 1;
        int last = nb - 1;
        double[] d2s = buf[0], lag = buf[1], bins = buf[2];
        // the squared spatial distances, their roots and the bins, as runs
        PATH.planarLags(xs, ys, xi, yi, js, len, d2s, lag);
        PATH.lagBins(d2s, lag, len, invWidth, last, stride, max2, top, bins);
        PATH.squaredDistances(ni, nsq, js, dot, dotOff, len); // the dot products become squared B2 distances
        for (int q = 0; q < len; q++) {
            int j = js + q;
            double d2 = d2s[q];
            double h = lag[q];
            int b = (int) bins[q];
            if (!(d2 <= 0x1p960 && d2 >= 0x1p-960)) {
                h = Scaling.planarNorm(xs[j] - xi, ys[j] - yi); // outside the plain square root's safe range (rare)
                b = KernelPath.lagBin(d2, h, invWidth, last, stride, max2, top);
            }
            int o = (q & (LANES - 1)) * lw + b;
            sg[o] += dot[dotOff + q];
            sh[o] += h;
            sc[o]++;
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
            int lane = (q & (LANES - 1)) * (stride + 1);
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
