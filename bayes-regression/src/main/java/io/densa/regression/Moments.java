package io.densa.regression;

import io.densa.core.internal.Kernels;

/**
 * Per-fold first and second moments of the rows of an n × w matrix, computed in one blocked
 * pass (fixed blocks of {@code Kernels.BLOCK} rows combined in order, so parallel and serial
 * results are bit-identical). Columns flagged for centring are shifted by their global mean
 * before accumulation (to avoid cancellation); everything returned by the package-private
 * accessors is in these shifted units unless stated otherwise.
 */
final class Moments {
    final int w;
    final int folds;
    final double[] shift;      // w
    private final int[] counts;     // folds
    private final double[][] sums;  // folds × w
    private final double[][] cross; // folds × (w × w), full symmetric
    private final int n;

    private Moments(int n, int w, int folds, double[] shift, int[] counts, double[][] sums, double[][] cross) {
        this.n = n;
        this.w = w;
        this.folds = folds;
        this.shift = shift;
        this.counts = counts;
        this.sums = sums;
        this.cross = cross;
    }

    /** All columns centred (the FPCA case). */
    static Moments of(double[] x, int n, int w, int[] fold, int folds) {
        boolean[] c = new boolean[w];
        java.util.Arrays.fill(c, true);
        return of(x, n, w, fold, folds, c);
    }

    /**
     * @param fold   fold index of every row (null: a single fold 0)
     * @param centre which columns to shift by their global mean
     */
    static Moments of(double[] x, int n, int w, int[] fold, int folds, boolean[] centre) {
        return of(x, n, w, fold, folds, centre, true);
    }

    /** As above; {@code parallel = false} forces the serial path (same blocks, same result). */
    static Moments of(double[] x, int n, int w, int[] fold, int folds, boolean[] centre, boolean parallel) {
        double[] colSums = Kernels.columnSums(x, n, w, parallel);
        double[] shift = new double[w];
        for (int j = 0; j < w; j++) {
            shift[j] = centre[j] && n > 0 ? colSums[j] / n : 0.0;
        }
        int blocks = (n + Kernels.BLOCK - 1) / Kernels.BLOCK;
        double[][][] pc = new double[blocks][][];
        double[][][] ps = new double[blocks][][];
        int[][] pn = new int[blocks][];
        Kernels.forEachBlock(blocks, parallel && Kernels.parallelWorth((long) n * w * w), blk -> {
            double[][] c = new double[folds][w * w];
            double[][] s = new double[folds][w];
            int[] cnt = new int[folds];
            double[] row = new double[w];
            int r0 = blk * Kernels.BLOCK, r1 = Math.min(n, r0 + Kernels.BLOCK);
            for (int i = r0; i < r1; i++) {
                int f = fold == null ? 0 : fold[i];
                int o = i * w;
                for (int j = 0; j < w; j++) {
                    row[j] = x[o + j] - shift[j];
                }
                double[] cf = c[f];
                double[] sf = s[f];
                cnt[f]++;
                for (int j = 0; j < w; j++) {
                    double rj = row[j];
                    sf[j] += rj;
                    int co = j * w;
                    for (int l = 0; l <= j; l++) {
                        cf[co + l] += rj * row[l];
                    }
                }
            }
            pc[blk] = c;
            ps[blk] = s;
            pn[blk] = cnt;
        });
        int[] counts = new int[folds];
        double[][] sums = new double[folds][w];
        double[][] cross = new double[folds][w * w];
        for (int b = 0; b < blocks; b++) {
            for (int f = 0; f < folds; f++) {
                counts[f] += pn[b][f];
                double[] s = ps[b][f];
                double[] c = pc[b][f];
                for (int j = 0; j < w; j++) {
                    sums[f][j] += s[j];
                }
                for (int j = 0; j < w * w; j++) {
                    cross[f][j] += c[j];
                }
            }
        }
        for (double[] c : cross) {
            for (int j = 0; j < w; j++) {
                for (int l = 0; l < j; l++) {
                    c[l * w + j] = c[j * w + l];
                }
            }
        }
        return new Moments(n, w, folds, shift, counts, sums, cross);
    }

    int count(int f) {
        return counts[f];
    }

    int total() {
        return n;
    }

    /** Shifted-unit cross products Σ over fold f (f = −1: all rows), a fresh array. */
    double[] cross(int f) {
        if (f >= 0) {
            return cross[f].clone();
        }
        double[] t = new double[w * w];
        for (double[] c : cross) {
            for (int j = 0; j < t.length; j++) {
                t[j] += c[j];
            }
        }
        return t;
    }

    /** Shifted-unit column sums over fold f (−1: all rows). */
    double[] sum(int f) {
        if (f >= 0) {
            return sums[f].clone();
        }
        double[] t = new double[w];
        for (double[] s : sums) {
            for (int j = 0; j < w; j++) {
                t[j] += s[j];
            }
        }
        return t;
    }

    /** Cross products of all rows outside fold f (f = −1: all rows). */
    double[] trainingCross(int f) {
        double[] t = cross(-1);
        if (f >= 0) {
            for (int j = 0; j < t.length; j++) {
                t[j] -= cross[f][j];
            }
        }
        return t;
    }

    /** Column sums of all rows outside fold f (f = −1: all rows). */
    double[] trainingSum(int f) {
        double[] t = sum(-1);
        if (f >= 0) {
            for (int j = 0; j < w; j++) {
                t[j] -= sums[f][j];
            }
        }
        return t;
    }

    int trainingCount(int f) {
        return f >= 0 ? n - counts[f] : n;
    }

    /** Training mean in original units. */
    double[] trainingMean(int f) {
        double[] s = trainingSum(f);
        int m = trainingCount(f);
        for (int j = 0; j < w; j++) {
            s[j] = s[j] / m + shift[j];
        }
        return s;
    }

    /** Training covariance (divisor n_tr − 1) given the training mean in original units. */
    double[] trainingCovariance(int f, double[] meanOriginal) {
        double[] c = trainingCross(f);
        int m = trainingCount(f);
        double[] mu = new double[w];
        for (int j = 0; j < w; j++) {
            mu[j] = meanOriginal[j] - shift[j];
        }
        for (int j = 0; j < w; j++) {
            for (int l = 0; l < w; l++) {
                c[j * w + l] = (c[j * w + l] - m * mu[j] * mu[l]) / (m - 1);
            }
        }
        return c;
    }

    /** Σ_{i ∈ f} (x_i − μ)(x_i − μ)ᵀ for a centre μ in original units. */
    double[] foldScatterAbout(int f, double[] meanOriginal) {
        double[] c = cross(f);
        double[] s = sums[f];
        int m = counts[f];
        double[] mu = new double[w];
        for (int j = 0; j < w; j++) {
            mu[j] = meanOriginal[j] - shift[j];
        }
        for (int j = 0; j < w; j++) {
            for (int l = 0; l < w; l++) {
                c[j * w + l] += -s[j] * mu[l] - mu[j] * s[l] + m * mu[j] * mu[l];
            }
        }
        return c;
    }
}
