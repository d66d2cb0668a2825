package io.densa.regression;

import io.densa.core.internal.Kernels;

/**
 * Per-fold first and second moments of the rows of an n × w matrix: the rows are grouped by
 * fold and each fold's rows go through the shared kernels {@code Kernels.columnSumsOfRows} and
 * {@code Kernels.crossProductOfRows} (fixed blocks combined in order, so parallel and serial
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
        // rows sorted by fold (stable counting sort), then each fold's range through the shared kernels
        int[] counts = new int[folds];
        int[] order = null;
        int[] start = new int[folds + 1];
        if (fold == null) {
            counts[0] = n;
        } else {
            for (int i = 0; i < n; i++) {
                counts[fold[i]]++;
            }
            for (int f = 0; f < folds; f++) {
                start[f + 1] = start[f] + counts[f];
            }
            order = new int[n];
            int[] next = start.clone();
            for (int i = 0; i < n; i++) {
                order[next[fold[i]]++] = i;
            }
        }
        start[folds] = n;
        double[][] sums = new double[folds][];
        double[][] cross = new double[folds][];
        for (int f = 0; f < folds; f++) {
            int from = fold == null ? (f == 0 ? 0 : n) : start[f];
            int to = fold == null ? n : start[f + 1];
            sums[f] = Kernels.columnSumsOfRows(x, w, order, from, to, shift, parallel);
            cross[f] = Kernels.crossProductOfRows(x, w, order, from, to, shift, parallel);
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
