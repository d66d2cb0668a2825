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
 * <p>Evaluation follows the rule stated on {@link Density}: evaluation points (cdf, tail
 * probabilities, pdfs on a grid) may lie anywhere but NaN and give 0 or 1 outside the domain,
 * probabilities (quantiles) must be in [0, 1], no result is ±∞ or NaN (a value beyond the double
 * range throws, saying so), and a row whose coordinates are too large to evaluate throws a
 * {@link DensaException} naming the row. Sums over rows (mean, centring, cross products) detect
 * overflow with one comparison against the largest |coordinate| and only then take a slower,
 * scaled or checked path. Row and column indices outside the set throw
 * {@link IllegalArgumentException}.
 *
 * <p>Immutable and thread-safe; arrays in and out are copies.
 */
public final class DensitySet {
    final BayesSpace space;
    final int n;
    final int k;
    final double[] data;
    private final String[] ids; // null when absent
    private volatile double[] logZ;
    /** Largest |coordinate| (NaN until computed): decides whether sums can overflow. */
    private volatile double maxAbs = Double.NaN;
    /** Column means (null until computed; never handed out, callers get copies). */
    private volatile double[] columnMeans;

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
     * @param ids n distinct-or-not non-null labels, or null for none (copied)
     * @throws IllegalArgumentException on ragged rows, non-finite values (naming row and column), an
     *                                  id array of the wrong length or a null id (naming the row)
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
            space.requireSame(f.space(), "density " + i);
            System.arraycopy(f.coordinatesInternal(), 0, d, i * k, k);
        }
        return fromRowMajor(space, d, densities.size(), ids, true);
    }

    /** A set from densities of one space, without ids. */
    public static DensitySet of(List<Density> densities) {
        return of(densities, null);
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
            for (int i = 0; i < n; i++) {
                if (idCopy[i] == null) {
                    throw new IllegalArgumentException("id of row " + i + " is null; give every row a (not"
                            + " necessarily distinct) id, or pass no id array at all");
                }
            }
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
            throw new IllegalArgumentException("column " + j + " is outside [0, " + k + "): the space has K = " + k
                    + " coordinates");
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
            throw new IllegalArgumentException("row index " + i + " is outside [0, " + n + "): the set has " + n
                    + " densities");
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
        return new Density(space, meanCoordinates(), false);
    }

    /**
     * Column means (computed once per set, which is immutable; FPCA asks for them twice: for the
     * centred cross-products and for the mean density). The plain column sums cannot overflow when
     * n·max|c| is below the largest double (the usual case, one check); otherwise every value is
     * scaled by a power of two first (exact), so that rows near 1e308 still give their
     * (representable) mean.
     */
    private double[] meanCoordinates() {
        double[] m = columnMeans;
        if (m == null) {
            m = computeMeans();
            columnMeans = m;
        }
        return m.clone();
    }

    /** The column means of {@link #meanCoordinates} (one pass over the coordinates). */
    private double[] computeMeans() {
        if (Double.isNaN(maxAbs)) {
            // largest |coordinate| not known yet: one pass gives the plain sums and it
            double[] sm = Kernels.columnSumsAndMaxAbs(data, n, k, true);
            maxAbs = sm[k];
            if (sm[k] * n < Double.MAX_VALUE) {
                double[] s = java.util.Arrays.copyOf(sm, k);
                for (int j = 0; j < k; j++) {
                    s[j] = s[j] / n;
                }
                return s;
            }
        }
        double big = maxAbs();
        double scale = 1.0;
        if (!(big * n < Double.MAX_VALUE)) {
            scale = 0x1p-64; // n < 2^31 rows: sums of scaled values stay below 2^31 · 2^1024 · 2^-64
        }
        double[] s;
        if (scale == 1.0) {
            s = Kernels.columnSums(data, n, k, true);
        } else {
            double[] scaled = new double[data.length];
            for (int i = 0; i < data.length; i++) {
                scaled[i] = data[i] * scale;
            }
            s = Kernels.columnSums(scaled, n, k, true);
        }
        for (int j = 0; j < k; j++) {
            s[j] = s[j] / n / scale;
        }
        return s;
    }

    /** Largest |coordinate| of the set (cached; 0 for an empty set). */
    double maxAbs() {
        double m = maxAbs;
        if (Double.isNaN(m)) {
            m = 0;
            for (double v : data) {
                m = Math.max(m, Math.abs(v));
            }
            maxAbs = m;
        }
        return m;
    }

    /**
     * Every density ⊖ the ⊕-mean (ids kept).
     *
     * @throws IllegalArgumentException if the set is empty
     */
    public DensitySet centred() {
        requireNonEmpty("centring");
        double[] m = meanCoordinates();
        double[] out = new double[data.length];
        Kernels.subtractRow(data, n, k, m, out, true);
        if (!(maxAbs() * 2 < Double.MAX_VALUE)) {
            RowEvaluation.requireFinite(out, "the centred coordinate array", "coordinates up to about 8.9e307 are accepted");
        }
        return new DensitySet(space, n, out, ids);
    }

    /**
     * Every density ⊕ d (ids kept).
     *
     * @throws IllegalArgumentException if a sum of coordinates leaves the double range
     */
    public DensitySet perturb(Density d) {
        space.requireSame(d.space(), "density");
        double[] neg = d.coordinatesInternal().clone();
        double dMax = 0;
        for (int j = 0; j < k; j++) {
            neg[j] = -neg[j];
            dMax = Math.max(dMax, Math.abs(neg[j]));
        }
        double[] out = new double[data.length];
        Kernels.subtractRow(data, n, k, neg, out, true);
        if (!(maxAbs() + dMax < Double.MAX_VALUE)) {
            RowEvaluation.requireFinite(out, "the perturbed coordinate array", "sums of coordinates up to "
                    + Double.MAX_VALUE + " are accepted");
        }
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
            center = meanCoordinates();
        }
        double[] out = Kernels.crossProduct(data, n, k, center, true);
        double big = centred ? 2 * maxAbs() : maxAbs();
        if (!(big * big * n < Double.MAX_VALUE)) {
            RowEvaluation.requireFinite(out, "the K × K cross-product matrix", "its entries are sums of n products of"
                    + " coordinates: coordinates up to about 1e154 / √n are accepted");
        }
        return DMatrixRMaj.wrap(k, k, out);
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
     * @throws IllegalArgumentException if n² exceeds 1.5·10⁸ entries (use {@link #crossProducts}),
     *                                  or if an inner product is beyond the double range (coordinates
     *                                  near 1e154 and above): it is never returned as ±∞ or NaN
     */
    public DMatrixRMaj gram() {
        return RowEvaluation.gram(this);
    }

    /**
     * n × m matrix of B2 inner products ⟨f_i, g_j⟩_B of these densities with those of {@code other}
     * (for example FPCA scores: the data against the eigenfunctions); a fresh matrix, no copies.
     *
     * @throws IllegalArgumentException for sets of different spaces, n·m beyond the largest array,
     *                                  or an inner product beyond the double range (never ±∞ or NaN)
     */
    public DMatrixRMaj innerProducts(DensitySet other) {
        return RowEvaluation.innerProducts(this, other);
    }

    /**
     * n × n matrix of B2 distances ‖f_i ⊖ f_j‖_B, computed as ‖a‖² + ‖b‖² − 2 a·b with negative
     * rounding clipped to 0, and exact zeros on the diagonal.
     */
    public DMatrixRMaj distances() {
        return RowEvaluation.distances(this);
    }

    /**
     * B2 norms of every density (scaled where the plain sum of squares overflows or underflows, as
     * {@link Density#norm()}).
     *
     * @throws IllegalArgumentException if a norm exceeds the largest double
     */
    public double[] norms() {
        return RowEvaluation.norms(this);
    }

    private void requireNonEmpty(String what) {
        if (n == 0) {
            throw new IllegalArgumentException(what + " of an empty density set (0 densities); at least one"
                    + " density is needed");
        }
    }

    // ---------------------------------------------------------------- subsets

    /**
     * Rows at the given indices, in that order (ids kept; repeats allowed).
     *
     * @param rows indices in [0, n) (not modified)
     * @throws IllegalArgumentException if an index is outside [0, n), naming its position, value and n
     */
    public DensitySet subset(int... rows) {
        Objects.requireNonNull(rows, "rows");
        double[] out = new double[rows.length * k];
        String[] newIds = ids == null ? null : new String[rows.length];
        for (int r = 0; r < rows.length; r++) {
            if (rows[r] < 0 || rows[r] >= n) {
                throw new IllegalArgumentException("subset index " + r + " is row " + rows[r] + ", outside [0, " + n
                        + "): the set has " + n + " densities");
            }
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
        space.requireSame(other.space, "density set");
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

    /**
     * log ∫ exp(clr f_i) dP for every row (cached), as triples (shift, log of the shifted integral,
     * point of the largest clr) per row: see {@link BayesSpace#logNormaliser}.
     */
    double[] logNormalisers() {
        double[] z = logZ;
        if (z == null) {
            z = RowEvaluation.logNormalisers(this);
            logZ = z;
        }
        return z;
    }

    /**
     * Lebesgue pdfs of every density on a grid, written row-major into {@code out} (n × m): one
     * matrix product C Eᵀ (E the basis at the grid, blocked by {@code Kernels.multiplyRows}), then
     * one pass of exp(clr − log Z_i) times the reference density. Points outside [a, b] give 0,
     * as {@link Density#pdf(double)} does. The log normalisers log Z_i are computed on the first
     * call and cached.
     *
     * @param grid m points (not modified)
     * @param out  array of length ≥ n·m, overwritten
     * @throws IllegalArgumentException if a grid point is NaN or out is too short
     */
    public void pdf(double[] grid, double[] out) {
        RowEvaluation.pdf(this, grid, out);
    }

    /** Lebesgue pdfs on a grid as an n × m matrix. */
    public DMatrixRMaj pdf(double... grid) {
        DMatrixRMaj out = new DMatrixRMaj(n, grid.length);
        pdf(grid, out.data);
        return out;
    }

    /**
     * clr values of every density on a grid as an n × m matrix (one matrix product).
     *
     * @param grid points in the domain [a, b] (not modified)
     * @throws IllegalArgumentException for a point outside the domain or a clr value beyond the
     *                                  double range (naming row and point)
     */
    public DMatrixRMaj clr(double... grid) {
        return RowEvaluation.clr(this, grid);
    }

    /**
     * P(X_i ≤ x) for every density; x may lie outside the domain [a, b] (0 below it, 1 above), as
     * for {@link Density#cdf}.
     *
     * @throws IllegalArgumentException if x is NaN
     * @throws DensaException           naming the row, if a density's coordinates are too large to
     *                                  evaluate (see {@link Density})
     */
    public double[] cdf(double x) {
        space.checkCdfPoint(x);
        return RowEvaluation.perRow(this, (s, nodes, scratch) -> space.cdf(s, x, scratch));
    }

    /**
     * Tail probabilities P(X_i &gt; t) for every density; t may lie outside the domain (1 below it,
     * 0 above), as for {@link Density#tailProbability}.
     *
     * @throws IllegalArgumentException if t is NaN
     * @throws DensaException           naming the row, as {@link #cdf}
     */
    public double[] tailProbability(double t) {
        space.checkThreshold(t);
        return RowEvaluation.perRow(this, (s, nodes, scratch) -> space.tail(s, t, scratch));
    }

    /**
     * The p-quantile of every density; p = 0 gives the domain's lower end, p = 1 its upper end.
     *
     * @throws IllegalArgumentException if p is not in [0, 1] (NaN included)
     * @throws DensaException           naming the row, as {@link #cdf}
     */
    public double[] quantiles(double p) {
        space.checkProbability(p);
        return RowEvaluation.perRow(this, (s, nodes, scratch) -> space.quantile(s, p, scratch));
    }

    /**
     * E[X_i] for every density.
     *
     * @throws DensaException naming the row, as {@link #cdf}
     */
    public double[] means() {
        return RowEvaluation.perRow(this, (s, nodes, scratch) -> space.mean(s, nodes));
    }

    @Override
    public String toString() {
        return "DensitySet[n=" + n + ", " + space + "]";
    }
}
