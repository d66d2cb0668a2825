package io.densa.spatial;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.stream.IntStream;
import org.locationtech.jts.geom.Dimension;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.IntersectionMatrix;
import org.locationtech.jts.geom.Location;
import org.locationtech.jts.geom.MultiPolygon;
import org.locationtech.jts.geom.Polygon;
import org.locationtech.jts.index.strtree.ItemBoundable;
import org.locationtech.jts.index.strtree.STRtree;
import org.locationtech.jts.operation.overlay.snap.GeometrySnapper;

/**
 * Spatial weights W = (w_ij) between n units, stored as an immutable sparse matrix in
 * compressed-row form (row i lists the neighbours j of unit i in increasing order with their
 * weights w_ij &gt; 0).
 *
 * <h2>Semantics</h2>
 * <ul>
 *   <li>Weights are finite and non-negative, the diagonal is zero (a unit is never its own
 *       neighbour), and only positive weights are stored. W need not be symmetric.</li>
 *   <li>Their range is checked: S0, S1 and S2 below must be finite doubles (weights up to about
 *       1e150 pass; larger ones are rejected with an {@link IllegalArgumentException} naming the
 *       largest weight — Moran's I and Geary's c do not depend on a common factor of the weights,
 *       so dividing them by one loses nothing). Very small weights are accepted; the statistics
 *       compute on the weights divided by the power of two of the largest (exact).</li>
 *   <li>The constants of Cliff &amp; Ord (1981), Spatial Processes (from memory) are computed
 *       from the stored entries without assuming symmetry:
 *       S0 = Σ_i Σ_j w_ij, S1 = ½ Σ_i Σ_j (w_ij + w_ji)², S2 = Σ_i (w_i· + w_·i)², where w_i·
 *       and w_·i are the row and column sums; sums use Neumaier compensated summation.</li>
 *   <li>An <em>island</em> is a unit whose row is empty (no neighbours). Islands are reported by
 *       {@link #islands()}; the statistics handle them by an island policy (an error by
 *       default, or the islands are excluded from the analysis).</li>
 *   <li>{@link #rowStandardised()} divides every non-empty row by its sum (rows then sum to
 *       one); island rows stay empty.</li>
 * </ul>
 *
 * <h2>Builders</h2>
 * k nearest neighbours ({@link #nearestNeighbours}), distance band ({@link #distanceBand}),
 * inverse distance ({@link #inverseDistance}), polygon contiguity ({@link #contiguity}), and
 * explicit matrices or neighbour lists ({@link #fromMatrix}, {@link #fromNeighbours}).
 * Neighbour searches on planar locations use a JTS {@code STRtree}; geographic locations
 * (great-circle distances) use an exact scan over all pairs, O(n²).
 *
 * <p>Immutable and thread-safe; arrays are copied in and out.
 */
public final class SpatialWeights {

    /** Polygon contiguity rule. */
    public enum Contiguity {
        /** Neighbours share a stretch of boundary of positive length (an edge). */
        ROOK,
        /** Neighbours share at least one boundary point (a vertex or an edge). */
        QUEEN
    }

    /** How k-nearest-neighbour relations are made symmetric. */
    public enum Symmetry {
        /** j is a neighbour of i when j is among the k nearest of i (W is in general asymmetric). */
        DIRECTED,
        /** i and j are neighbours when either is among the k nearest of the other. */
        UNION,
        /** i and j are neighbours only when each is among the k nearest of the other. */
        MUTUAL
    }

    private final int n;
    private final int[] rowStart;
    private final int[] cols;
    private final double[] vals;
    private final boolean rowStandardised;
    private final double s0;
    private final double s1;
    private final double s2;
    private final int[] islands;
    private final boolean symmetric;
    private final double maxWeight;

    SpatialWeights(int n, int[] rowStart, int[] cols, double[] vals, boolean rowStandardised) {
        this.n = n;
        this.rowStart = rowStart;
        this.cols = cols;
        this.vals = vals;
        this.rowStandardised = rowStandardised;
        // Transpose by counting sort: columns of the transpose come out in increasing order.
        int[] tStart = new int[n + 1];
        for (int c : cols) {
            tStart[c + 1]++;
        }
        for (int i = 0; i < n; i++) {
            tStart[i + 1] += tStart[i];
        }
        int[] fill = Arrays.copyOf(tStart, n);
        int[] tCols = new int[cols.length];
        double[] tVals = new double[cols.length];
        for (int i = 0; i < n; i++) {
            for (int p = rowStart[i]; p < rowStart[i + 1]; p++) {
                int q = fill[cols[p]]++;
                tCols[q] = i;
                tVals[q] = vals[p];
            }
        }
        double[] acc0 = new double[2];
        double[] acc1 = new double[2];
        double[] acc2 = new double[2];
        boolean sym = true;
        List<Integer> isl = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            int p = rowStart[i], pe = rowStart[i + 1];
            int q = tStart[i], qe = tStart[i + 1];
            if (p == pe) {
                isl.add(i);
            }
            double rowSum = 0, colSum = 0;
            while (p < pe || q < qe) {
                double a = 0, b = 0;
                int cp = p < pe ? cols[p] : Integer.MAX_VALUE;
                int cq = q < qe ? tCols[q] : Integer.MAX_VALUE;
                if (cp == cq) {
                    a = vals[p++];
                    b = tVals[q++];
                } else if (cp < cq) {
                    a = vals[p++];
                } else {
                    b = tVals[q++];
                }
                if (a != b) {
                    sym = false;
                }
                rowSum += a;
                colSum += b;
                add(acc0, a);
                add(acc1, 0.5 * (a + b) * (a + b));
            }
            add(acc2, (rowSum + colSum) * (rowSum + colSum));
        }
        this.s0 = acc0[0] + acc0[1];
        this.s1 = acc1[0] + acc1[1];
        this.s2 = acc2[0] + acc2[1];
        this.symmetric = sym;
        this.islands = isl.stream().mapToInt(Integer::intValue).toArray();
        double max = 0;
        int at = -1;
        for (int p = 0; p < vals.length; p++) {
            if (vals[p] > max) {
                max = vals[p];
                at = p;
            }
        }
        this.maxWeight = max;
        if (!(s0 <= Double.MAX_VALUE && s1 <= Double.MAX_VALUE && s2 <= Double.MAX_VALUE)) {
            int row = 0;
            while (rowStart[row + 1] <= at) {
                row++;
            }
            throw new IllegalArgumentException("the weights are too large: their sums S0 = Σ w_ij, S1 and S2 (sums"
                    + " of squared weights) overflow a double; the largest weight is " + max
                    + " (link " + row + " -> " + cols[at] + "). Accepted are weights whose sums stay finite (up to"
                    + " about 1e150 each); divide them by a common factor, which changes neither Moran's I nor"
                    + " Geary's c");
        }
    }

    /**
     * These weights divided by the power of two 2^e of the largest weight (exact) when that lies
     * outside [2^-64, 2^65), otherwise this object: what the global statistics compute on, so
     * that n / S0, S0² and the weighted sums neither overflow nor underflow. Moran's I, Geary's c
     * and their moments do not depend on a common factor of the weights. The result keeps the
     * links and {@link #isRowStandardised()} of this object.
     */
    public SpatialWeights normalisedForStatistics() {
        int e = Math.getExponent(maxWeight);
        if (vals.length == 0 || (e >= -64 && e <= 64)) {
            return this;
        }
        double[] v = new double[vals.length];
        for (int p = 0; p < vals.length; p++) {
            v[p] = Math.scalb(vals[p], -e);
        }
        return new SpatialWeights(n, rowStart, cols, v, rowStandardised);
    }

    /** Neumaier compensated addition: acc = {sum, compensation}. */
    private static void add(double[] acc, double x) {
        double s = acc[0], t = s + x;
        if (Math.abs(s) >= Math.abs(x)) {
            acc[1] += (s - t) + x;
        } else {
            acc[1] += (x - t) + s;
        }
        acc[0] = t;
    }

    // ------------------------------------------------------------------ explicit builders

    /**
     * Weights from a dense n × n matrix (row i = weights of the neighbours of unit i).
     *
     * @param matrix square matrix of finite, non-negative weights with zero diagonal (not
     *               modified); zero entries are not stored
     * @throws IllegalArgumentException if the matrix is not square, an entry is negative or not
     *                                  finite, or a diagonal entry is non-zero (naming the entry)
     */
    public static SpatialWeights fromMatrix(double[][] matrix) {
        return WeightsAssembly.fromMatrix(matrix);
    }

    /**
     * Binary weights (w_ij = 1) from neighbour lists.
     *
     * @param neighbours neighbours[i] = indices of the neighbours of unit i (any order, not
     *                   modified); an empty list makes unit i an island
     * @throws IllegalArgumentException on an index out of range, a self-neighbour or a repeated
     *                                  neighbour (naming the unit)
     */
    public static SpatialWeights fromNeighbours(int[][] neighbours) {
        Objects.requireNonNull(neighbours, "neighbours");
        double[][] ones = new double[neighbours.length][];
        for (int i = 0; i < neighbours.length; i++) {
            if (neighbours[i] == null) {
                throw new IllegalArgumentException("neighbour list of unit " + i + " is null; use an empty array");
            }
            ones[i] = new double[neighbours[i].length];
            Arrays.fill(ones[i], 1.0);
        }
        return fromNeighbours(neighbours, ones);
    }

    /**
     * Weights from neighbour lists with a weight per link.
     *
     * @param neighbours neighbours[i] = indices of the neighbours of unit i (not modified)
     * @param weights    weights[i][m] = weight of the link from i to neighbours[i][m]; finite and
     *                   positive (not modified)
     * @throws IllegalArgumentException on mismatched lengths, an index out of range, a
     *                                  self-neighbour, a repeated neighbour, or a weight that is
     *                                  not finite and positive (naming the unit)
     */
    public static SpatialWeights fromNeighbours(int[][] neighbours, double[][] weights) {
        return WeightsAssembly.fromNeighbours(neighbours, weights);
    }

    /**
     * Weights from their compressed rows (what {@link #rowStarts()}, {@link #columnIndices()},
     * {@link #linkWeights()} and {@link #isRowStandardised()} return): every statistic of the result
     * equals that of the object the arrays came from, bit for bit. The links are checked as
     * {@link #fromNeighbours(int[][], double[][])} checks them; a row-standardised flag is kept as
     * given (the weights are not re-standardised).
     *
     * @param rowStarts       n + 1 non-decreasing offsets, the first 0 and the last the link count (not modified)
     * @param columns         neighbour index per link, increasing within a row (not modified)
     * @param weights         weight per link, finite and positive (not modified)
     * @param rowStandardised whether the weights are marked row-standardised
     * @throws IllegalArgumentException on inconsistent lengths or offsets, or a link that
     *                                  {@code fromNeighbours} refuses (naming the unit)
     */
    public static SpatialWeights fromCompressedRows(int[] rowStarts, int[] columns, double[] weights,
            boolean rowStandardised) {
        Objects.requireNonNull(rowStarts, "rowStarts");
        Objects.requireNonNull(columns, "columns");
        Objects.requireNonNull(weights, "weights");
        if (rowStarts.length < 1 || rowStarts[0] != 0 || rowStarts[rowStarts.length - 1] != columns.length
                || weights.length != columns.length) {
            throw new IllegalArgumentException("compressed rows need rowStarts[0] = 0 and rowStarts[n] = number of"
                    + " links = columns.length = weights.length; got " + rowStarts.length + " row starts, "
                    + columns.length + " columns and " + weights.length + " weights");
        }
        int n = rowStarts.length - 1;
        int[][] nb = new int[n][];
        double[][] wt = new double[n][];
        for (int i = 0; i < n; i++) {
            if (!(rowStarts[i + 1] >= rowStarts[i])) {
                throw new IllegalArgumentException("row start " + (i + 1) + " (" + rowStarts[i + 1]
                        + ") is below row start " + i + " (" + rowStarts[i] + "); offsets must not decrease");
            }
            nb[i] = Arrays.copyOfRange(columns, rowStarts[i], rowStarts[i + 1]);
            wt[i] = Arrays.copyOfRange(weights, rowStarts[i], rowStarts[i + 1]);
            for (int m = 1; m < nb[i].length; m++) {
                if (!(nb[i][m] > nb[i][m - 1])) {
                    throw new IllegalArgumentException("unit " + i + ": neighbours must be strictly increasing in"
                            + " compressed rows; " + nb[i][m] + " follows " + nb[i][m - 1]);
                }
            }
        }
        SpatialWeights w = fromNeighbours(nb, wt);
        return rowStandardised ? new SpatialWeights(w.n, w.rowStart, w.cols, w.vals, true) : w;
    }

    // ------------------------------------------------------------------ distance builders

    /**
     * k-nearest-neighbour binary weights: w_ij = 1 when j is among the k nearest units of i
     * (ties in distance broken by the smaller index), made symmetric as requested.
     *
     * @param locations unit locations (planar: Euclidean distance; geographic: great-circle)
     * @param k         number of neighbours, 1 ≤ k ≤ n − 1
     * @param symmetry  {@link Symmetry#DIRECTED} to keep the k-nearest relation as is,
     *                  {@link Symmetry#UNION} or {@link Symmetry#MUTUAL} to symmetrise it
     * @throws IllegalArgumentException if k is out of range
     */
    public static SpatialWeights nearestNeighbours(Locations locations, int k, Symmetry symmetry) {
        return DistanceWeights.nearestNeighbours(locations, k, symmetry);
    }

    /**
     * Distance-band binary weights: w_ij = 1 when 0 ≤ d(i, j) ≤ maxDistance, i ≠ j (coincident
     * units are neighbours). Units farther than maxDistance from every other unit are islands.
     *
     * @param maxDistance band radius, finite and positive, in the unit of the locations' distance
     * @throws IllegalArgumentException if maxDistance is not finite and positive
     */
    public static SpatialWeights distanceBand(Locations locations, double maxDistance) {
        return DistanceWeights.distanceBand(locations, maxDistance);
    }

    /**
     * Inverse-distance weights w_ij = d(i, j)^(−power) for 0 &lt; d(i, j) ≤ maxDistance.
     * With {@code maxDistance = Double.POSITIVE_INFINITY} every pair is linked (n(n − 1)
     * stored entries: use a band for large n).
     *
     * @param power       exponent, finite and positive (1 and 2 are usual)
     * @param maxDistance band radius, positive, or {@code Double.POSITIVE_INFINITY} for no band
     * @throws IllegalArgumentException on a bad power or band, on two coincident units (named),
     *                                  whose weight would be infinite, or on a weight that over-
     *                                  or underflows a double (named), or weights whose sums
     *                                  overflow
     */
    public static SpatialWeights inverseDistance(Locations locations, double power, double maxDistance) {
        return DistanceWeights.inverseDistance(locations, power, maxDistance);
    }

    // ------------------------------------------------------------------ contiguity

    /**
     * Binary polygon contiguity: rook (shared boundary of positive length) or queen (at least
     * one shared boundary point). Units whose interiors overlap are neighbours under both rules.
     *
     * <p>To tolerate digitising errors (tiny gaps or overlaps), with {@code tolerance &gt; 0}
     * each candidate pair is first snapped together with JTS {@code GeometrySnapper} (vertices
     * within the tolerance moved onto each other, vertices within the tolerance of the other
     * polygon's segments inserted into them); the rules are then applied exactly to the snapped
     * pair through the DE-9IM relation (rook: boundary ∩ boundary of dimension 1 or interiors
     * intersecting in an area; queen: the polygons intersect). Coordinates are treated as
     * planar.
     *
     * @param polygons  one {@link Polygon} or {@link MultiPolygon} per unit, non-empty (not
     *                  modified)
     * @param rule      rook or queen
     * @param tolerance snapping distance, ≥ 0 (0 for exact contiguity), in the polygons' unit
     * @throws IllegalArgumentException if a geometry is not a non-empty polygon or multipolygon
     *                                  (naming the unit) or the tolerance is negative or NaN
     */
    public static SpatialWeights contiguity(List<? extends Geometry> polygons, Contiguity rule, double tolerance) {
        return ContiguityWeights.contiguity(polygons, rule, tolerance);
    }

    // ------------------------------------------------------------------ transforms

    /**
     * Row-standardised copy: w*_ij = w_ij / Σ_k w_ik for every unit with neighbours (rows sum to
     * one, S0 = n − number of islands); island rows stay empty. Returns this object if it is
     * already row-standardised.
     */
    public SpatialWeights rowStandardised() {
        if (rowStandardised) {
            return this;
        }
        double[] v = new double[vals.length];
        for (int i = 0; i < n; i++) {
            double s = 0;
            for (int p = rowStart[i]; p < rowStart[i + 1]; p++) {
                s += vals[p];
            }
            for (int p = rowStart[i]; p < rowStart[i + 1]; p++) {
                v[p] = vals[p] / s;
            }
        }
        return new SpatialWeights(n, rowStart, cols, v, true);
    }

    /**
     * The weights among the given units: rows and columns of these units, renumbered 0..m−1 in the
     * given order (links to other units are dropped); a row-standardised object stays marked as
     * such (its kept rows are not re-standardised).
     *
     * @param units distinct unit indices in 0..n−1 (not modified)
     * @throws IllegalArgumentException on an index outside 0..n−1 or a repeated index
     */
    public SpatialWeights restrictedTo(int... units) {
        Objects.requireNonNull(units, "units");
        int[] keep = units.clone();
        int[] newIndex = new int[n];
        Arrays.fill(newIndex, -1);
        for (int a = 0; a < keep.length; a++) {
            checkIndex(keep[a]);
            if (newIndex[keep[a]] >= 0) {
                throw new IllegalArgumentException("unit " + keep[a] + " is listed twice (positions "
                        + newIndex[keep[a]] + " and " + a + "); give each unit once");
            }
            newIndex[keep[a]] = a;
        }
        int m = keep.length;
        int[][] nb = new int[m][];
        double[][] wt = new double[m][];
        for (int a = 0; a < m; a++) {
            int i = keep[a];
            int[] c = new int[rowStart[i + 1] - rowStart[i]];
            double[] w = new double[c.length];
            int q = 0;
            for (int p = rowStart[i]; p < rowStart[i + 1]; p++) {
                if (newIndex[cols[p]] >= 0) {
                    c[q] = newIndex[cols[p]];
                    w[q++] = vals[p];
                }
            }
            nb[a] = Arrays.copyOf(c, q);
            wt[a] = Arrays.copyOf(w, q);
        }
        SpatialWeights r = WeightsAssembly.assemble(m, nb, wt);
        return rowStandardised ? new SpatialWeights(r.n, r.rowStart, r.cols, r.vals, true) : r;
    }

    // ------------------------------------------------------------------ accessors

    /** Number of units n. */
    public int size() {
        return n;
    }

    /** Number of stored (positive) weights. */
    public int linkCount() {
        return cols.length;
    }

    /** Number of neighbours of unit i. */
    public int neighbourCount(int i) {
        checkIndex(i);
        return rowStart[i + 1] - rowStart[i];
    }

    /** Neighbours of unit i in increasing order (fresh copy). */
    public int[] neighbours(int i) {
        checkIndex(i);
        return Arrays.copyOfRange(cols, rowStart[i], rowStart[i + 1]);
    }

    /** Weights of the neighbours of unit i, in the order of {@link #neighbours(int)} (fresh copy). */
    public double[] neighbourWeights(int i) {
        checkIndex(i);
        return Arrays.copyOfRange(vals, rowStart[i], rowStart[i + 1]);
    }

    /** w_ij (0 if j is not a neighbour of i). */
    public double weight(int i, int j) {
        checkIndex(i);
        checkIndex(j);
        int p = Arrays.binarySearch(cols, rowStart[i], rowStart[i + 1], j);
        return p >= 0 ? vals[p] : 0.0;
    }

    /** Row sum w_i· = Σ_j w_ij. */
    public double rowSum(int i) {
        checkIndex(i);
        double s = 0;
        for (int p = rowStart[i]; p < rowStart[i + 1]; p++) {
            s += vals[p];
        }
        return s;
    }

    /** S0 = Σ_i Σ_j w_ij. */
    public double s0() {
        return s0;
    }

    /** S1 = ½ Σ_i Σ_j (w_ij + w_ji)². */
    public double s1() {
        return s1;
    }

    /** S2 = Σ_i (w_i· + w_·i)². */
    public double s2() {
        return s2;
    }

    /** Whether w_ij = w_ji exactly for all pairs. */
    public boolean isSymmetric() {
        return symmetric;
    }

    /** Whether this is the result of {@link #rowStandardised()}. */
    public boolean isRowStandardised() {
        return rowStandardised;
    }

    /** Units without neighbours, in increasing order (fresh copy; empty if none). */
    public int[] islands() {
        return islands.clone();
    }

    /** Whether some unit has no neighbours. */
    public boolean hasIslands() {
        return islands.length > 0;
    }

    /**
     * Spatial lag (W v)_i = Σ_j w_ij v_j.
     *
     * @param values n values (not modified)
     * @return a fresh n-vector
     * @throws IllegalArgumentException if the length is not n, a value is not finite, or a unit's
     *                                  lag overflows a double (naming the unit)
     */
    public double[] spatialLag(double[] values) {
        Objects.requireNonNull(values, "values");
        if (values.length != n) {
            throw new IllegalArgumentException("values has " + values.length + " entries but the weights have "
                    + n + " units");
        }
        double[] out = new double[n];
        for (int i = 0; i < n; i++) {
            double s = 0;
            for (int p = rowStart[i]; p < rowStart[i + 1]; p++) {
                s += vals[p] * values[cols[p]];
            }
            if (!Double.isFinite(s)) {
                for (int j = 0; j < n; j++) {
                    if (!Double.isFinite(values[j])) {
                        throw new IllegalArgumentException("value of unit " + j + " is " + values[j]
                                + "; every value must be finite");
                    }
                }
                throw new IllegalArgumentException("the spatial lag of unit " + i + " overflows a double (its "
                        + (rowStart[i + 1] - rowStart[i]) + " weighted neighbour values sum beyond about 1.8e308);"
                        + " rescale the values or the weights");
            }
            out[i] = s;
        }
        return out;
    }

    /** Dense n × n copy of W (for small n). */
    public double[][] toMatrix() {
        double[][] m = new double[n][n];
        for (int i = 0; i < n; i++) {
            for (int p = rowStart[i]; p < rowStart[i + 1]; p++) {
                m[i][cols[p]] = vals[p];
            }
        }
        return m;
    }

    private void checkIndex(int i) {
        if (i < 0 || i >= n) {
            throw new IllegalArgumentException("unit " + i + " is outside 0.." + (n - 1));
        }
    }

    /**
     * Row starts of the compressed-row form (n + 1 values, a fresh copy): the links of unit i are
     * the entries rowStarts()[i] .. rowStarts()[i + 1] − 1 of {@link #columnIndices()} and
     * {@link #linkWeights()}, in increasing column order.
     */
    public int[] rowStarts() {
        return rowStart.clone();
    }

    /** Neighbour (column) index of every link, in compressed-row order (a fresh copy). */
    public int[] columnIndices() {
        return cols.clone();
    }

    /** Weight of every link, in compressed-row order (a fresh copy). */
    public double[] linkWeights() {
        return vals.clone();
    }

    @Override
    public String toString() {
        return "SpatialWeights[n=" + n + ", links=" + cols.length + ", S0=" + s0 + (rowStandardised
                ? ", row-standardised" : "") + (islands.length > 0 ? ", islands=" + islands.length : "") + "]";
    }
}
