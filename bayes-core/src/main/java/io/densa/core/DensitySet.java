package io.densa.core;

import io.densa.core.internal.Kernels;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;
import java.util.Objects;
import org.ejml.data.DMatrixRMaj;

/**
 * n densities of one {@link BayesSpace}, held as one n × K row-major coordinate matrix (row i =
 * observation i), with optional string ids. This is what every model takes and returns.
 *
 * <p>Batch operations are matrix operations over the coordinate block, never loops over
 * {@link Density} objects: the ⊕-mean is the column mean, centring subtracts it, the Gram matrix
 * is C Cᵀ, pdfs on a grid are C Eᵀ (E the basis at the grid) followed by one exp/normalise pass.
 * Large batches run on the common ForkJoin pool in fixed row blocks; results are bit-identical to
 * the serial computation.
 *
 * <p>Immutable and thread-safe; arrays in and out are copies.
 */
public final class DensitySet {
    private static final long MAX_SQUARE = 150_000_000L;

    private final BayesSpace space;
    private final int n;
    private final int k;
    private final double[] data;
    private final String[] ids; // null when absent
    private volatile double[] logZ;

    private DensitySet(BayesSpace space, int n, double[] data, String[] ids) {
        this.space = space;
        this.n = n;
        this.k = space.dimension();
        this.data = data;
        this.ids = ids;
    }

    // ---------------------------------------------------------------- construction

    /**
     * A set from a coordinate array (row per density), without ids.
     *
     * @param coordinates n rows of K finite values (copied)
     */
    public static DensitySet of(BayesSpace space, double[][] coordinates) {
        return of(space, coordinates, null);
    }

    /**
     * A set from a coordinate array with ids.
     *
     * @param ids n distinct-or-not labels, or null (copied)
     * @throws IllegalArgumentException on ragged rows, non-finite values (naming row and column) or
     *                                  an id array of the wrong length
     */
    public static DensitySet of(BayesSpace space, double[][] coordinates, String[] ids) {
        Objects.requireNonNull(space, "space");
        Objects.requireNonNull(coordinates, "coordinates");
        int n = coordinates.length;
        int k = space.dimension();
        double[] d = new double[n * k];
        for (int i = 0; i < n; i++) {
            double[] row = coordinates[i];
            if (row == null || row.length != k) {
                throw new IllegalArgumentException("row " + i + " has " + (row == null ? "no" : row.length)
                        + " coordinates, expected K = " + k);
            }
            System.arraycopy(row, 0, d, i * k, k);
        }
        return fromRowMajor(space, d, n, ids, false);
    }

    /**
     * A set from a row-major n × K array.
     *
     * @param rowMajor n·K finite values (copied)
     */
    public static DensitySet ofRowMajor(BayesSpace space, double[] rowMajor, int n, String[] ids) {
        Objects.requireNonNull(space, "space");
        Objects.requireNonNull(rowMajor, "rowMajor");
        if (n < 0 || (long) n * space.dimension() != rowMajor.length) {
            throw new IllegalArgumentException("row-major array has " + rowMajor.length + " values, expected n·K = "
                    + n + "·" + space.dimension());
        }
        return fromRowMajor(space, rowMajor.clone(), n, ids, false);
    }

    /** A set from an n × K EJML matrix (copied). */
    public static DensitySet of(BayesSpace space, DMatrixRMaj coordinates, String[] ids) {
        Objects.requireNonNull(coordinates, "coordinates");
        if (coordinates.numCols != space.dimension()) {
            throw new IllegalArgumentException("matrix has " + coordinates.numCols + " columns, expected K = "
                    + space.dimension());
        }
        return fromRowMajor(space, Arrays.copyOf(coordinates.data, coordinates.numRows * coordinates.numCols),
                coordinates.numRows, ids, false);
    }

    /**
     * A set from densities of one space.
     *
     * @throws IllegalArgumentException if the list is empty or mixes spaces
     */
    public static DensitySet of(List<Density> densities, String[] ids) {
        Objects.requireNonNull(densities, "densities");
        if (densities.isEmpty()) {
            throw new IllegalArgumentException("need at least one density to know the space");
        }
        BayesSpace space = densities.get(0).space();
        int k = space.dimension();
        double[] d = new double[densities.size() * k];
        for (int i = 0; i < densities.size(); i++) {
            Density f = densities.get(i);
            space.requireSame(f.space());
            System.arraycopy(f.coordinatesInternal(), 0, d, i * k, k);
        }
        return fromRowMajor(space, d, densities.size(), ids, true);
    }

    /** A set from densities of one space, without ids. */
    public static DensitySet of(List<Density> densities) {
        return of(densities, null);
    }

    /** Wraps an array this package owns (no copy). */
    static DensitySet wrap(BayesSpace space, double[] data, int n, String[] ids) {
        return new DensitySet(space, n, data, ids);
    }

    private static DensitySet fromRowMajor(BayesSpace space, double[] d, int n, String[] ids, boolean trusted) {
        int k = space.dimension();
        if (!trusted) {
            for (int i = 0; i < d.length; i++) {
                if (!Double.isFinite(d[i])) {
                    throw new IllegalArgumentException("coordinate (row " + i / k + ", column " + i % k
                            + ") is not finite: " + d[i]);
                }
            }
        }
        String[] idCopy = null;
        if (ids != null) {
            if (ids.length != n) {
                throw new IllegalArgumentException("ids has " + ids.length + " entries for " + n + " densities");
            }
            idCopy = ids.clone();
        }
        return new DensitySet(space, n, d, idCopy);
    }

    // ---------------------------------------------------------------- accessors

    /** The space of every density in the set. */
    public BayesSpace space() {
        return space;
    }

    /** Number of densities n. */
    public int size() {
        return n;
    }

    /** Dimension K. */
    public int dimension() {
        return k;
    }

    /** Whether ids were given. */
    public boolean hasIds() {
        return ids != null;
    }

    /** Id of row i, or "#i" when the set has no ids. */
    public String id(int i) {
        checkRow(i);
        return ids == null ? "#" + i : ids[i];
    }

    /** The ids (unmodifiable), or an empty list when absent. */
    public List<String> ids() {
        return ids == null ? List.of() : Collections.unmodifiableList(Arrays.asList(ids.clone()));
    }

    String[] idsInternal() {
        return ids;
    }

    /** Density of row i. */
    public Density get(int i) {
        checkRow(i);
        return new Density(space, Arrays.copyOfRange(data, i * k, (i + 1) * k), false);
    }

    /** Coordinate k of row i. */
    public double coordinate(int i, int j) {
        checkRow(i);
        if (j < 0 || j >= k) {
            throw new IndexOutOfBoundsException("column " + j + " outside [0, " + k + ")");
        }
        return data[i * k + j];
    }

    /** Coordinates as a fresh n × K array. */
    public double[][] coordinates() {
        double[][] out = new double[n][];
        for (int i = 0; i < n; i++) {
            out[i] = Arrays.copyOfRange(data, i * k, (i + 1) * k);
        }
        return out;
    }

    /** Coordinates as a fresh n × K EJML matrix. */
    public DMatrixRMaj coordinateMatrix() {
        return DMatrixRMaj.wrap(n, k, data.clone());
    }

    /** Coordinates as a fresh row-major array of length n·K. */
    public double[] coordinatesRowMajor() {
        return data.clone();
    }

    double[] dataInternal() {
        return data;
    }

    private void checkRow(int i) {
        if (i < 0 || i >= n) {
            throw new IndexOutOfBoundsException("row " + i + " outside [0, " + n + ")");
        }
    }

    // ---------------------------------------------------------------- algebra

    /**
     * ⊕-mean (Fréchet mean in B2): the density whose coordinates are the column means.
     *
     * @throws IllegalArgumentException if the set is empty
     */
    public Density mean() {
        requireNonEmpty("mean");
        double[] s = Kernels.columnSums(data, n, k, true);
        for (int j = 0; j < k; j++) {
            s[j] /= n;
        }
        return new Density(space, s, false);
    }

    /**
     * Every density ⊖ the ⊕-mean (ids kept).
     *
     * @throws IllegalArgumentException if the set is empty
     */
    public DensitySet centred() {
        requireNonEmpty("centring");
        double[] m = mean().coordinatesInternal();
        double[] out = new double[data.length];
        Kernels.subtractRow(data, n, k, m, out, true);
        return new DensitySet(space, n, out, ids);
    }

    /** Every density ⊕ d (ids kept). */
    public DensitySet perturb(Density d) {
        space.requireSame(d.space());
        double[] neg = d.coordinatesInternal().clone();
        for (int j = 0; j < k; j++) {
            neg[j] = -neg[j];
        }
        double[] out = new double[data.length];
        Kernels.subtractRow(data, n, k, neg, out, true);
        return new DensitySet(space, n, out, ids);
    }

    /**
     * K × K cross-product matrix Cᵀ C of the coordinates (the Gram matrix of the coordinate
     * columns); with {@code centred}, of the centred coordinates.
     *
     * @throws IllegalArgumentException if {@code centred} and the set is empty
     */
    public DMatrixRMaj crossProducts(boolean centred) {
        double[] center = null;
        if (centred) {
            requireNonEmpty("centred cross products");
            center = mean().coordinatesInternal();
        }
        return DMatrixRMaj.wrap(k, k, Kernels.crossProduct(data, n, k, center, true));
    }

    /**
     * K × K sample covariance of the coordinates, divisor n − 1 (the covariance operator of the
     * densities in the orthonormal basis).
     *
     * @throws IllegalArgumentException if n &lt; 2
     */
    public DMatrixRMaj covariance() {
        if (n < 2) {
            throw new IllegalArgumentException("covariance of a density set needs at least 2 densities, have " + n);
        }
        DMatrixRMaj c = crossProducts(true);
        for (int i = 0; i < c.data.length; i++) {
            c.data[i] /= (n - 1);
        }
        return c;
    }

    /**
     * n × n Gram matrix of B2 inner products ⟨f_i, f_j⟩_B.
     *
     * @throws IllegalArgumentException if n² exceeds 1.5·10⁸ entries (use {@link #crossProducts})
     */
    public DMatrixRMaj gram() {
        checkSquare("gram");
        double[] g = new double[n * n];
        Kernels.gram(data, n, k, g, true);
        return DMatrixRMaj.wrap(n, n, g);
    }

    /**
     * n × n matrix of B2 distances ‖f_i ⊖ f_j‖_B, computed as ‖a‖² + ‖b‖² − 2 a·b with negative
     * rounding clipped to 0, and exact zeros on the diagonal.
     */
    public DMatrixRMaj distances() {
        DMatrixRMaj g = gram();
        double[] d = g.data;
        double[] diag = new double[n];
        for (int i = 0; i < n; i++) {
            diag[i] = d[i * n + i];
        }
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double v = i == j ? 0.0 : diag[i] + diag[j] - 2 * d[i * n + j];
                d[i * n + j] = v > 0 ? Math.sqrt(v) : 0.0;
            }
        }
        return g;
    }

    /** B2 norms of every density. */
    public double[] norms() {
        double[] s = Kernels.rowNormsSq(data, n, k);
        for (int i = 0; i < n; i++) {
            s[i] = Math.sqrt(s[i]);
        }
        return s;
    }

    private void checkSquare(String what) {
        if ((long) n * n > MAX_SQUARE) {
            throw new IllegalArgumentException(what + ": n = " + n + " would need an n × n matrix of " + (long) n * n
                    + " entries (limit " + MAX_SQUARE + "); use crossProducts() for the K × K form");
        }
    }

    private void requireNonEmpty(String what) {
        if (n == 0) {
            throw new IllegalArgumentException(what + " of an empty density set (0 densities); at least one"
                    + " density is needed");
        }
    }

    // ---------------------------------------------------------------- subsets

    /** Rows at the given indices, in that order (ids kept). */
    public DensitySet subset(int... rows) {
        double[] out = new double[rows.length * k];
        String[] newIds = ids == null ? null : new String[rows.length];
        for (int r = 0; r < rows.length; r++) {
            checkRow(rows[r]);
            System.arraycopy(data, rows[r] * k, out, r * k, k);
            if (newIds != null) {
                newIds[r] = ids[rows[r]];
            }
        }
        return new DensitySet(space, rows.length, out, newIds);
    }

    /**
     * This set followed by another of the same space. Ids are kept when both have them; when only
     * one has them the other's rows get "#i" labels.
     */
    public DensitySet concat(DensitySet other) {
        space.requireSame(other.space);
        double[] out = Arrays.copyOf(data, data.length + other.data.length);
        System.arraycopy(other.data, 0, out, data.length, other.data.length);
        String[] newIds = null;
        if (ids != null || other.ids != null) {
            newIds = new String[n + other.n];
            for (int i = 0; i < n; i++) {
                newIds[i] = id(i);
            }
            for (int i = 0; i < other.n; i++) {
                newIds[n + i] = other.id(i);
            }
        }
        return new DensitySet(space, n + other.n, out, newIds);
    }

    /** The densities as a list. */
    public List<Density> toList() {
        List<Density> list = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            list.add(get(i));
        }
        return list;
    }

    // ---------------------------------------------------------------- batch evaluation

    /** log ∫ exp(clr f_i) dP for every row (cached). */
    double[] logNormalisers() {
        double[] z = logZ;
        if (z == null) {
            z = computeLogNormalisers();
            logZ = z;
        }
        return z;
    }

    private double[] computeLogNormalisers() {
        int q = space.nodeCount();
        double[] out = new double[n];
        int rows = 256;
        int blocks = (n + rows - 1) / rows;
        Kernels.forEachBlock(blocks, Kernels.parallelWorth((long) n * k * q), blk -> {
            int r0 = blk * rows, r1 = Math.min(n, r0 + rows);
            double[] clr = new double[q];
            for (int i = r0; i < r1; i++) {
                space.clrAtNodes(data, i * k, clr);
                out[i] = space.logNormaliser(clr, 0, data, i * k);
            }
        });
        return out;
    }

    /**
     * Lebesgue pdfs of every density on a grid, written row-major into {@code out} (n × m): one
     * matrix product C Eᵀ (E the basis at the grid, blocked by {@link Kernels#multiplyRows}), then
     * one pass of exp(clr − log Z_i) times the reference density. Points outside [a, b] give 0,
     * as {@link Density#pdf(double)} does. The log normalisers log Z_i are computed on the first
     * call and cached.
     *
     * @param grid m points (not modified)
     * @param out  array of length ≥ n·m, overwritten
     * @throws IllegalArgumentException if a grid point is NaN or out is too short
     */
    public void pdf(double[] grid, double[] out) {
        Objects.requireNonNull(grid, "grid");
        Objects.requireNonNull(out, "out");
        int m = grid.length;
        if (out.length < (long) n * m) {
            throw new IllegalArgumentException("output has " + out.length + " slots, need n·m = " + (long) n * m);
        }
        double[] inside = new double[m];
        double[] ref = new double[m];
        for (int j = 0; j < m; j++) {
            double x = grid[j];
            if (Double.isNaN(x)) {
                throw new IllegalArgumentException("grid point " + j + " is NaN");
            }
            inside[j] = Math.min(space.upper(), Math.max(space.lower(), x));
            ref[j] = space.referenceDensity(x);
        }
        double[] et = space.basisTransposed(inside);
        double[] z = logNormalisers();
        int rows = 16;
        int blocks = (n + rows - 1) / rows;
        Kernels.forEachBlock(blocks, Kernels.parallelWorth((long) n * k * m), blk -> {
            int r0 = blk * rows, r1 = Math.min(n, r0 + rows);
            Kernels.multiplyRows(data, r0 * k, r1 - r0, k, et, m, out, r0 * m);
            for (int i = r0; i < r1; i++) {
                int o = i * m;
                double zi = z[i];
                for (int q = 0; q < m; q++) {
                    double r = ref[q];
                    out[o + q] = r == 0 ? 0.0 : r * Math.exp(out[o + q] - zi);
                }
            }
        });
    }

    /** Lebesgue pdfs on a grid as an n × m matrix. */
    public DMatrixRMaj pdf(double... grid) {
        DMatrixRMaj out = new DMatrixRMaj(n, grid.length);
        pdf(grid, out.data);
        return out;
    }

    /**
     * clr values of every density on a grid as an n × m matrix (one matrix product).
     */
    public DMatrixRMaj clr(double... grid) {
        double[] et = space.basisTransposed(grid);
        DMatrixRMaj out = new DMatrixRMaj(n, grid.length);
        Kernels.multiply(data, n, k, et, grid.length, out.data, true);
        return out;
    }

    private interface RowFunction {
        double apply(Shape shape, double[] clrNodes, double[] scratch);
    }

    private double[] perRow(RowFunction f) {
        int q = space.nodeCount();
        double[] out = new double[n];
        int rows = 128;
        int blocks = (n + rows - 1) / rows;
        Kernels.forEachBlock(blocks, Kernels.parallelWorth((long) n * k * q), blk -> {
            int r0 = blk * rows, r1 = Math.min(n, r0 + rows);
            double[] nodeRow = new double[q];
            double[] scratch = new double[space.scratchSize()];
            for (int i = r0; i < r1; i++) {
                space.clrAtNodes(data, i * k, nodeRow);
                Shape s = space.shape(data, i * k, nodeRow);
                out[i] = f.apply(s, nodeRow, scratch);
            }
        });
        return out;
    }

    /** P(X_i ≤ x) for every density. */
    public double[] cdf(double x) {
        if (Double.isNaN(x)) {
            throw new IllegalArgumentException("x is NaN");
        }
        return perRow((s, nodes, scratch) -> space.cdf(s, x, scratch));
    }

    /** Tail probabilities P(X_i &gt; t) for every density. */
    public double[] tailProbability(double t) {
        if (Double.isNaN(t)) {
            throw new IllegalArgumentException("threshold is NaN");
        }
        return perRow((s, nodes, scratch) -> space.tail(s, t, scratch));
    }

    /**
     * The p-quantile of every density.
     *
     * @throws IllegalArgumentException if p is not in (0, 1)
     */
    public double[] quantiles(double p) {
        if (!(p > 0 && p < 1)) {
            throw new IllegalArgumentException("probability must be in (0, 1), got " + p);
        }
        return perRow((s, nodes, scratch) -> space.quantile(s, p, scratch));
    }

    /** E[X_i] for every density. */
    public double[] means() {
        return perRow((s, nodes, scratch) -> space.mean(s, nodes));
    }

    @Override
    public String toString() {
        return "DensitySet[n=" + n + ", " + space + "]";
    }
}
