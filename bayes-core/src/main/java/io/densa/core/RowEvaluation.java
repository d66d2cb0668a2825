package io.densa.core;

import io.densa.core.internal.Kernels;
import org.ejml.data.DMatrixRMaj;
import java.util.Objects;
import io.densa.core.DistributionFunctions.Shape;

/**
 * Batch evaluation of every row of a {@link DensitySet}: log normalisers, pdfs on a grid (one
 * matrix product, then one pass), per-row functionals (cdf, tails, quantiles, means) in fixed
 * blocks of rows, the Gram matrix and inner products with another set, norms and pairwise distances
 * (with their scaled paths for extreme coordinates). Package-private; the public entry points are on
 * DensitySet.
 */
final class RowEvaluation {
    /** {@link DensitySet#gram()}. */
    static DMatrixRMaj gram(DensitySet set) {
        int n = set.n;
        checkSquare(n, "gram");
        double[] g = new double[n * n];
        Kernels.gram(set.data, n, set.k, g, true);
        double big = set.maxAbs();
        if (!(big * big * set.k < Double.MAX_VALUE)) {
            requireFinite(g, "the n × n Gram matrix", "its entries are inner products of K coordinates:"
                    + " coordinates up to about 1e154 / √K are accepted (distances() and norms() accept more)");
        }
        return DMatrixRMaj.wrap(n, n, g);
    }

    /** {@link DensitySet#innerProducts}: B's rows transposed once, then the n × K by K × m product. */
    static DMatrixRMaj innerProducts(DensitySet set, DensitySet other) {
        Objects.requireNonNull(other, "other");
        set.space().requireSame(other.space(), "density set");
        int n = set.n, k = set.k, m = other.n;
        if ((long) n * m > Integer.MAX_VALUE - 8) {
            throw new IllegalArgumentException("innerProducts of " + n + " by " + m + " densities: " + ((long) n * m)
                    + " entries exceed the largest array; split either set");
        }
        double[] t = new double[k * m];
        for (int j = 0; j < m; j++) {
            for (int i = 0; i < k; i++) {
                t[i * m + j] = other.data[j * k + i];
            }
        }
        double[] out = new double[n * m];
        Kernels.multiply(set.data, n, k, t, m, out, true);
        double big = set.maxAbs() * other.maxAbs();
        if (!(big * k < Double.MAX_VALUE)) {
            requireFinite(out, "the n × m inner products", "they are sums of K products of coordinates:"
                    + " coordinates up to about 1e154 / √K are accepted");
        }
        return DMatrixRMaj.wrap(n, m, out);
    }

    /** Largest n × n result (entries) that gram() and distances() build. */
    private static final long MAX_SQUARE = 150_000_000L;

    private RowEvaluation() {
    }

    static void checkSquare(int n, String what) {
        if ((long) n * n > MAX_SQUARE) {
            throw new IllegalArgumentException(what + ": n = " + n + " would need an n × n matrix of " + (long) n * n
                    + " entries (limit " + MAX_SQUARE + "); use crossProducts() for the K × K form");
        }
    }

    static double[] logNormalisers(DensitySet set) {
        int q = set.space.nodeCount();
        double[] out = new double[3 * set.n];
        int rows = 256;
        int blocks = (set.n + rows - 1) / rows;
        Kernels.forEachBlock(blocks, Kernels.parallelWorth((long) set.n * set.k * q), blk -> {
            int r0 = blk * rows, r1 = Math.min(set.n, r0 + rows);
            double[] clr = new double[q];
            for (int i = r0; i < r1; i++) {
                set.space.clrAtNodes(set.data, i * set.k, clr);
                set.space.logNormaliser(clr, 0, set.data, i * set.k, out, 3 * i);
            }
        });
        return out;
    }

    static void pdf(DensitySet set, double[] grid, double[] out) {
        Objects.requireNonNull(grid, "grid");
        Objects.requireNonNull(out, "out");
        int m = grid.length;
        if (out.length < (long) set.n * m) {
            throw new IllegalArgumentException("output has " + out.length + " slots, need n·m = " + (long) set.n * m);
        }
        double[] inside = new double[m];
        double[] ref = new double[m];
        for (int j = 0; j < m; j++) {
            double x = grid[j];
            if (Double.isNaN(x)) {
                throw new IllegalArgumentException("grid point " + j + " is NaN");
            }
            x = set.space.wrap(x);
            inside[j] = Math.min(set.space.upper(), Math.max(set.space.lower(), x));
            ref[j] = set.space.referenceDensity(x);
        }
        double[] et = basisTransposed(set.space, inside);
        double[] z = set.logNormalisers();
        for (int i = 0; i < set.n; i++) {
            if (Double.isNaN(z[3 * i + 1])) {
                throw new DensaException("row " + i + " (" + set.id(i) + "): " + BayesSpace.concentrated(z[3 * i + 2])
                        .getMessage(), BayesSpace.concentrated(z[3 * i + 2]).diagnostics());
            }
        }
        int rows = 16;
        int blocks = (set.n + rows - 1) / rows;
        Kernels.forEachBlock(blocks, Kernels.parallelWorth((long) set.n * set.k * m), blk -> {
            int r0 = blk * rows, r1 = Math.min(set.n, r0 + rows);
            Kernels.multiplyRows(set.data, r0 * set.k, r1 - r0, set.k, et, m, out, r0 * m);
            for (int i = r0; i < r1; i++) {
                int o = i * m;
                double shift = z[3 * i], logTotal = z[3 * i + 1];
                for (int q = 0; q < m; q++) {
                    double r = ref[q];
                    out[o + q] = r == 0 ? 0.0 : r * Math.exp((out[o + q] - shift) - logTotal);
                }
                for (int q = 0; q < m; q++) {
                    if (out[o + q] == Double.POSITIVE_INFINITY) {
                        // beyond the largest double, or rounding noise of a huge clr: the checked
                        // single-density path decides (and names the row if it overflows)
                        out[o + q] = rowPdf(set, i, grid[q]);
                    }
                }
            }
        });
    }

    private static double rowPdf(DensitySet set, int i, double x) {
        try {
            return set.get(i).pdf(x);
        } catch (DensaException e) {
            throw new DensaException("row " + i + " (" + set.id(i) + "): " + e.getMessage(), e.diagnostics());
        }
    }

    interface RowFunction {
        double apply(Shape shape, double[] clrNodes, double[] scratch);
    }

    static double[] perRow(DensitySet set, RowFunction f) {
        int q = set.space.nodeCount();
        double[] out = new double[set.n];
        int rows = 128;
        int blocks = (set.n + rows - 1) / rows;
        Kernels.forEachBlock(blocks, Kernels.parallelWorth((long) set.n * set.k * q), blk -> {
            int r0 = blk * rows, r1 = Math.min(set.n, r0 + rows);
            double[] nodeRow = new double[q];
            double[] scratch = new double[set.space.scratchSize()];
            for (int i = r0; i < r1; i++) {
                set.space.clrAtNodes(set.data, i * set.k, nodeRow);
                try {
                    Shape s = set.space.shape(set.data, i * set.k, nodeRow);
                    out[i] = f.apply(s, nodeRow, scratch);
                } catch (DensaException e) {
                    throw new DensaException("row " + i + " (" + set.id(i) + "): " + e.getMessage(), e.diagnostics());
                }
            }
        });
        return out;
    }

    static DMatrixRMaj distances(DensitySet set) {
        double big = set.maxAbs();
        if (!(big * big * set.k < Double.MAX_VALUE) || big * big < 0x1p-900) {
            return scaledDistances(set); // sums of squares would overflow or underflow
        }
        DMatrixRMaj g = set.gram();
        double[] d = g.data;
        double[] diag = new double[set.n];
        for (int i = 0; i < set.n; i++) {
            diag[i] = d[i * set.n + i];
        }
        for (int i = 0; i < set.n; i++) {
            for (int j = 0; j < set.n; j++) {
                double v = i == j ? 0.0 : diag[i] + diag[j] - 2 * d[i * set.n + j];
                d[i * set.n + j] = v > 0 ? Math.sqrt(v) : 0.0;
            }
        }
        return g;
    }

    /**
     * Distances for coordinates too large for the Gram identity: each pair by the scaled norm of
     * its difference (O(n² K), only for such sets).
     */
    private static DMatrixRMaj scaledDistances(DensitySet set) {
        checkSquare(set.n, "distances");
        double[] d = new double[set.n * set.n];
        double[] x = new double[set.k];
        double[] y = new double[set.k];
        for (int i = 0; i < set.n; i++) {
            System.arraycopy(set.data, i * set.k, x, 0, set.k);
            for (int j = i + 1; j < set.n; j++) {
                System.arraycopy(set.data, j * set.k, y, 0, set.k);
                double v = Density.scaledNorm(x, y);
                if (v == Double.POSITIVE_INFINITY) {
                    throw new IllegalArgumentException("the distance between rows " + i + " and " + j
                            + " exceeds the largest double " + Double.MAX_VALUE);
                }
                d[i * set.n + j] = v;
                d[j * set.n + i] = v;
            }
        }
        return DMatrixRMaj.wrap(set.n, set.n, d);
    }

    static double[] norms(DensitySet set) {
        double[] s = Kernels.rowNormsSq(set.data, set.n, set.k);
        double[] row = null;
        for (int i = 0; i < set.n; i++) {
            if (s[i] < Double.POSITIVE_INFINITY && (s[i] >= 0x1p-900 || s[i] == 0 && rowIsZero(set, i))) {
                s[i] = Math.sqrt(s[i]);
                continue;
            }
            row = row == null ? new double[set.k] : row;
            System.arraycopy(set.data, i * set.k, row, 0, set.k);
            s[i] = Density.scaledNorm(row, null);
            if (s[i] == Double.POSITIVE_INFINITY) {
                throw new IllegalArgumentException("the norm of row " + i + " exceeds the largest double "
                        + Double.MAX_VALUE);
            }
        }
        return s;
    }

    private static boolean rowIsZero(DensitySet set, int i) {
        for (int j = i * set.k; j < (i + 1) * set.k; j++) {
            if (set.data[j] != 0) {
                return false;
            }
        }
        return true;
    }

    /** The transposed basis matrix K × m (row k = e_k at every x), for batch products. */
    static double[] basisTransposed(BayesSpace space, double[] xs) {
        double[] out = new double[space.dimension() * xs.length];
        double[] raw = new double[space.dimension()];
        double[] row = new double[space.dimension()];
        for (int i = 0; i < xs.length; i++) {
            space.basisAt(xs[i], row, raw);
            for (int k = 0; k < space.dimension(); k++) {
                out[k * xs.length + i] = row[k];
            }
        }
        return out;
    }

    /** {@link DensitySet#clr(double...)}: one matrix product, then one pass checking the range. */
    static DMatrixRMaj clr(DensitySet set, double[] grid) {
        double[] et = basisTransposed(set.space(), grid);
        int n = set.size();
        DMatrixRMaj out = new DMatrixRMaj(n, grid.length);
        Kernels.multiply(set.dataInternal(), n, set.dimension(), et, grid.length, out.data, true);
        for (int i = 0; i < out.data.length; i++) { // one pass, against n·K per entry for the product
            if (!Double.isFinite(out.data[i])) {
                int row = i / grid.length;
                throw new IllegalArgumentException("the clr of row " + row + " (" + set.id(row) + ") at x = "
                        + grid[i % grid.length] + " is " + out.data[i] + ": beyond the double range for its"
                        + " coordinates");
            }
        }
        return out;
    }

    /** Fails when a result of a set's arithmetic left the double range (checked only when it could). */
    static void requireFinite(double[] values, String what, String hint) {
        for (int i = 0; i < values.length; i++) {
            if (!Double.isFinite(values[i])) {
                throw new IllegalArgumentException(what + " has entry " + i + " = " + values[i]
                        + ": beyond the double range (largest " + Double.MAX_VALUE + ") for these coordinates; "
                        + hint);
            }
        }
    }
}
