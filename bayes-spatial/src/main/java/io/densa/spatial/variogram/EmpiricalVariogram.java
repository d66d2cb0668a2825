package io.densa.spatial.variogram;

import io.densa.core.DensitySet;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.ProgressCounter;
import io.densa.spatial.Locations;
import io.densa.spatial.internal.GreatCircle;
import io.densa.spatial.internal.Scaling;
import java.util.Arrays;
import java.util.Objects;

/**
 * The empirical trace-semivariogram of densities at locations,
 * γ̂(h_b) = (1 / (2|N(h_b)|)) Σ_{(i,j) ∈ N(h_b)} ‖X(s_i) ⊖ X(s_j)‖²_B
 * (Giraldo, Delicado, Mateu (2011), Ordinary kriging for function-valued spatial data, Environ.
 * Ecol. Stat. 18 — from memory), where N(h_b) are the unordered pairs whose distance falls in bin
 * b (and, with directions, in the sector). Each bin reports its pair count and mean lag. After
 * counting, adjacent bins holding too few pairs are merged ({@link VariogramOptions}, "Pairs per
 * bin"), so every reported bin holds at least one pair and no NaN is reported; the edges reported
 * are the merged ones, per sector.
 *
 * <p>Computation: the coordinates are first centred on their column means (distances are
 * unchanged, and densities far from the neutral element keep the digits of their differences);
 * squared B2 distances then come from the centred coordinates by ‖a‖² + ‖b‖² − 2a·b, with the a·b
 * products of an i-tile × j-tile of locations formed as a small matrix product (unit-stride over a
 * transposed coordinate copy) so that they stay in cache; pairs beyond the maximum lag are rejected
 * on the squared spatial distance (chord distance for geographic locations) before any square
 * root, and lags are computed by the same operations as {@link Locations#distance(int, int)}
 * (which neither overflow nor underflow); the centred coordinates are divided by the power of two
 * of their largest magnitude (exact) so that squared B2 distances neither overflow nor underflow
 * for coordinates far from 1, and γ̂ is scaled back at the end. The locations are visited in Z
 * (Morton) order, so that each block of 256 is compact in space, and a location skips every block
 * whose bounding box lies beyond the maximum lag from it (a lower bound of the same squared
 * distance the pair filter uses, so no pair is lost). Tiles of locations are processed in
 * parallel, each into its own bin totals, and totals are combined in tile order, so the result is
 * bit-identical to the serial run (and independent of how the locations are numbered, up to
 * locations with equal Z keys).
 *
 * <p>Immutable; accessors return copies.
 */
public final class EmpiricalVariogram {
    private static final int ITILE = 64;

    private final double[][] edges; // per sector (bins merged per sector)
    private final double[] directions; // null: omnidirectional
    private final double tolerance;
    private final long[][] counts;
    private final double[][] meanLag;
    private final double[][] gamma;
    private final VariogramCloud cloud;

    private EmpiricalVariogram(double[][] edges, double[] directions, double tolerance, long[][] counts,
            double[][] meanLag, double[][] gamma, VariogramCloud cloud) {
        this.edges = edges;
        this.directions = directions;
        this.tolerance = tolerance;
        this.counts = counts;
        this.meanLag = meanLag;
        this.gamma = gamma;
        this.cloud = cloud;
    }

    /**
     * Estimates the trace-semivariogram of the densities at the locations.
     *
     * @throws IllegalArgumentException if the sizes differ, there are fewer than 2 locations,
     *                                  or directions are requested for geographic locations
     */
    public static EmpiricalVariogram of(Locations locations, DensitySet densities, VariogramOptions options) {
        checkSizes(locations, densities);
        return of(locations, densities.coordinatesRowMajor(), densities.dimension(), options);
    }

    /** Checks that there is one density per location (neither null). */
    static void checkSizes(Locations locations, DensitySet densities) {
        Objects.requireNonNull(densities, "densities");
        Objects.requireNonNull(locations, "locations");
        if (locations.size() != densities.size()) {
            throw new IllegalArgumentException("locations (" + locations.size() + ") and densities ("
                    + densities.size() + ") differ in number");
        }
    }

    /** The same from a row-major n × k coordinate array (not modified). */
    public static EmpiricalVariogram of(Locations loc, double[] y, int k, VariogramOptions options) {
        Prepared pr = prepare(loc, y, k, options);
        int tiles = pr.tiles();
        double[][] pg = new double[tiles][];
        double[][] ph = new double[tiles][];
        long[][] pc = new long[tiles][];
        int n = pr.n();
        ProgressCounter progress = new ProgressCounter(options.progressListener(), "variogram tiles",
                tiles);
        Kernels.forEachBlock(tiles, options.parallel() && Kernels.parallelWorth((long) n * n * k / 2), t -> {
            VariogramPass.TileSums acc = pr.tile(t);
            pg[t] = acc.gamma();
            ph[t] = acc.lag();
            pc[t] = acc.count();
            progress.advance(1);
        });
        return finish(pr, options, pg, ph, pc, loc);
    }

    /** Locations per tile (block) of the pair loop: tile t holds the pairs (i, j &gt; i) with i in [64t, 64t + 64). */
    static final int TILE_LOCATIONS = ITILE;

    /**
     * The inputs shared by all tiles of one estimation: the pass, resolved edges, directions and the
     * coordinate scale. Read-only; {@link #tile} may be called from several threads.
     */
    record Prepared(VariogramPass pass, int n, int k, double[] edges, double[] directions, double yScale, double[] y,
            int tiles) {
        /** Bin totals of tile t (pairs (i, j &gt; i), i in [64t, min(n, 64t + 64))). */
        VariogramPass.TileSums tile(int t) {
            return pass.tile(t * ITILE, Math.min(n, t * ITILE + ITILE));
        }

        /** Entries of each tile's total arrays: sectors × bins before merging. */
        int stride() {
            return pass.stride;
        }
    }

    /** Validates, resolves the bins and prepares the shared pass (see the class documentation). */
    static Prepared prepare(Locations loc, double[] y, int k, VariogramOptions options) {
        Objects.requireNonNull(options, "options");
        int n = loc.size();
        if (n < 2) {
            throw new IllegalArgumentException("need at least 2 locations for a variogram, got " + n);
        }
        boolean geo = loc.kind() == Locations.Kind.GEOGRAPHIC;
        double[] dirs = options.directions();
        if (dirs != null && geo) {
            throw new IllegalArgumentException("direction sectors need planar locations");
        }
        double[] bb = loc.boundingBox();
        double diag = geo ? geoDiameterBound(loc) : Math.hypot(bb[2] - bb[0], bb[3] - bb[1]);
        double[] e = options.resolveEdges(diag / 2);
        int nb = e.length - 1;
        int ns = dirs == null ? 1 : dirs.length;
        double maxLag = e[nb];
        // spatial vectors: planar (x, y); geographic unit vectors (3D) with chord distances
        int dim = geo ? 3 : 2;
        double[] p = new double[n * dim];
        for (int i = 0; i < n; i++) {
            if (geo) {
                GreatCircle.unitVector(loc.x(i), loc.y(i), p, 3 * i);
            } else {
                p[2 * i] = loc.x(i);
                p[2 * i + 1] = loc.y(i);
            }
        }
        // prefilter on the squared spatial (chord) distance, widened by a relative 1e-12 so that no
        // pair at distance <= maxLag is lost to rounding; the exact test is on the lag itself
        double max2 = (1 + 1e-12) * (geo ? sq(2 * Math.sin(Math.min(Math.PI, maxLag / Locations.EARTH_RADIUS_KM) / 2))
                : maxLag * maxLag);
        // centre the coordinates first (distances are unchanged): ‖a‖² + ‖b‖² − 2a·b on uncentred
        // coordinates far from the neutral element cancels the leading digits of small differences
        y = centredCopy(y, n, k);
        // then divide by the power of two of the largest |centred coordinate| (exact): squared
        // distances of coordinates near 1e200 would overflow, of coordinates near 1e-200 underflow
        double yScale = Scaling.powerOfTwoScale(y);
        double yInv = 1 / yScale;
        for (int i = 0; i < y.length; i++) {
            y[i] *= yInv;
        }
        // the pass visits the locations in Z order (Morton 1966), so that each block of 256 is
        // compact in space and whole blocks beyond the largest lag from a location are skipped;
        // the pairs and bins are the same, only the order of the sums changes
        int[] order = zOrder(p, n, dim);
        double[] pz = new double[n * dim];
        double[] yz = new double[n * k];
        for (int i = 0; i < n; i++) {
            System.arraycopy(p, order[i] * dim, pz, i * dim, dim);
            System.arraycopy(y, order[i] * k, yz, i * k, k);
        }
        double[] nsq = Kernels.rowNormsSq(yz, n, k);
        double[] yt = new double[k * n];
        for (int i = 0; i < n; i++) {
            for (int c = 0; c < k; c++) {
                yt[c * n + i] = yz[i * k + c];
            }
        }
        double[] dcos = new double[ns];
        double[] dsin = new double[ns];
        double cosTol = 0;
        if (dirs != null) {
            for (int s = 0; s < ns; s++) {
                dcos[s] = Math.cos(Math.toRadians(dirs[s]));
                dsin[s] = Math.sin(Math.toRadians(dirs[s]));
            }
            cosTol = Math.cos(Math.toRadians(options.tolerance()));
        }
        boolean uniform = options.uniformBins() && e[0] == 0;
        // equal widths w = e_1 − e_0 (the last bin may be narrower when a width does not divide the
        // maximum lag): bin b = ⌈h/w⌉ − 1 holds (e_b, e_{b+1}] like the general search
        double invWidth = uniform ? 1 / (e[1] - e[0]) : nearlyEqualSpacing(e) ? (e.length - 1) / (e[e.length - 1] - e[0]) : 0;
        int tiles = (n + ITILE - 1) / ITILE;
        VariogramPass pass = new VariogramPass(n, k, yz, yt, nsq, pz, geo, max2, e, uniform, invWidth, ns, dcos, dsin,
                cosTol, dirs != null);
        return new Prepared(pass, n, k, e, dirs, yScale, y, tiles);
    }

    /**
     * The locations' indices sorted by their Z-order (Morton) key: each of the dim coordinates of
     * p (n × dim) scaled to 21-bit integers over its range and the bits interleaved; ties keep
     * the input order, so the order is a function of the coordinates alone.
     */
    static int[] zOrder(double[] p, int n, int dim) {
        double[] lo = new double[dim];
        double[] scale = new double[dim];
        for (int c = 0; c < dim; c++) {
            double mn = Double.POSITIVE_INFINITY, mx = Double.NEGATIVE_INFINITY;
            for (int i = 0; i < n; i++) {
                mn = Math.min(mn, p[i * dim + c]);
                mx = Math.max(mx, p[i * dim + c]);
            }
            lo[c] = mn;
            double range = mx - mn;
            scale[c] = range > 0 && Double.isFinite(range) ? ((1 << 21) - 1) / range : 0;
        }
        long[] keys = new long[n];
        Integer[] idx = new Integer[n];
        for (int i = 0; i < n; i++) {
            long key = 0;
            for (int c = 0; c < dim; c++) {
                long v = (long) Math.min((1 << 21) - 1, Math.max(0, (p[i * dim + c] - lo[c]) * scale[c]));
                for (int bit = 0; bit < 21; bit++) {
                    key |= ((v >>> bit) & 1L) << (bit * dim + c);
                }
            }
            keys[i] = key;
            idx[i] = i;
        }
        java.util.Arrays.sort(idx, (a, b) -> keys[a] != keys[b] ? Long.compare(keys[a], keys[b])
                : Integer.compare(a, b));
        int[] out = new int[n];
        for (int i = 0; i < n; i++) {
            out[i] = idx[i];
        }
        return out;
    }

    /**
     * Combines the tile totals in tile order, merges sparse bins and scales back (the tail of the
     * estimation, shared by the serial, parallel and pair-block paths).
     */
    static EmpiricalVariogram finish(Prepared pr, VariogramOptions options, double[][] pg, double[][] ph, long[][] pc,
            Locations loc) {
        int tiles = pr.tiles();
        double[] e = pr.edges();
        double[] dirs = pr.directions();
        int nb = e.length - 1;
        int ns = dirs == null ? 1 : dirs.length;
        double maxLag = e[nb];
        double yScale = pr.yScale();
        double[] y = pr.y();
        int k = pr.k();
        long[][] counts = new long[ns][nb];
        double[][] lag = new double[ns][nb];
        double[][] gam = new double[ns][nb];
        for (int t = 0; t < tiles; t++) {
            for (int s = 0; s < ns; s++) {
                for (int b = 0; b < nb; b++) {
                    counts[s][b] += pc[t][s * nb + b];
                    lag[s][b] += ph[t][s * nb + b];
                    gam[s][b] += pg[t][s * nb + b];
                }
            }
        }
        double[][] mEdges = new double[ns][];
        long[][] mCounts = new long[ns][];
        double[][] mLag = new double[ns][];
        double[][] mGam = new double[ns][];
        double g2 = yScale * yScale;
        for (int s = 0; s < ns; s++) {
            long pairs = 0;
            for (long c : counts[s]) {
                pairs += c;
            }
            if (pairs == 0) {
                throw new IllegalArgumentException("no pair of locations lies within the lags [" + e[0] + ", "
                        + maxLag + "]" + (dirs == null ? "" : " in the sector of direction " + dirs[s] + " degrees")
                        + "; give a larger maximum lag, other bin edges" + (dirs == null ? "" : " or a wider angular"
                        + " tolerance"));
            }
            long min = options.minimumPairs(pairs);
            int[] first = mergeGroups(counts[s], min);
            if (options.automaticMinimumPairs()) {
                // keep at least four bins where the pairs allow (a three-parameter model needs them)
                int nonEmpty = 0;
                for (long c : counts[s]) {
                    nonEmpty += c > 0 ? 1 : 0;
                }
                int want = Math.min(VariogramOptions.FEWEST_BINS, nonEmpty);
                while (first.length - 1 < want && min > 1) {
                    min = Math.max(1, min / 2);
                    first = mergeGroups(counts[s], min);
                }
            }
            int g = first.length - 1;
            mEdges[s] = new double[g + 1];
            mCounts[s] = new long[g];
            mLag[s] = new double[g];
            mGam[s] = new double[g];
            for (int q = 0; q < g; q++) {
                mEdges[s][q] = e[first[q]];
                long c = 0;
                double sh = 0, sg = 0;
                for (int b = first[q]; b < first[q + 1]; b++) {
                    c += counts[s][b];
                    sh += lag[s][b];
                    sg += gam[s][b];
                }
                mCounts[s][q] = c;
                mLag[s][q] = sh / c;
                mGam[s][q] = sg / (2.0 * c) * g2;
                if (!Double.isFinite(mGam[s][q])) {
                    throw new IllegalArgumentException("the squared B2 distances of bin " + q + " overflow a double"
                            + " (centred coordinates up to about " + yScale + "); the densities are too far apart"
                            + " to compare");
                }
            }
            mEdges[s][g] = e[nb];
        }
        VariogramCloud cloud = options.cloudPairs() > 0
                ? cloud(loc, y, k, maxLag, options.cloudPairs(), g2) : null;
        return new EmpiricalVariogram(mEdges, dirs, options.tolerance(), mCounts, mLag, mGam, cloud);
    }

    /**
     * Groups of adjacent bins, scanning from the shortest lag: a group closes when it holds at least
     * min pairs; a remainder (fewer than min pairs, possibly none) joins the last closed group, or
     * forms the only group if none closed. Returns the first bin of each group and, last, the
     * number of bins. Needs at least one pair in all.
     */
    static int[] mergeGroups(long[] counts, long min) {
        int nb = counts.length;
        int[] first = new int[nb + 1];
        int g = 0;
        long acc = 0;
        int start = 0;
        for (int b = 0; b < nb; b++) {
            acc += counts[b];
            if (acc >= min) {
                first[g++] = start;
                start = b + 1;
                acc = 0;
            }
        }
        if (g == 0) {
            first[g++] = 0; // fewer pairs than min in all: one bin
        }
        // a remainder start..nb-1 (if any) joins the last group: nothing to do, it ends at nb
        first[g] = nb;
        return java.util.Arrays.copyOf(first, g + 1);
    }

    /** y minus its column means (a new array; y is not modified). */
    private static double[] centredCopy(double[] y, int n, int k) {
        double[] mean = new double[k];
        for (int i = 0; i < n; i++) {
            for (int c = 0; c < k; c++) {
                mean[c] += y[i * k + c];
            }
        }
        for (int c = 0; c < k; c++) {
            mean[c] /= n;
        }
        double[] out = new double[n * k];
        for (int i = 0; i < n; i++) {
            for (int c = 0; c < k; c++) {
                out[i * k + c] = y[i * k + c] - mean[c];
            }
        }
        return out;
    }

    private static double sq(double v) {
        return v * v;
    }

    /** Upper bound of the largest great-circle distance between the locations (for the default maximum lag). */
    private static double geoDiameterBound(Locations loc) {
        double[] bb = loc.boundingBox();
        return Math.min(Math.PI * Locations.EARTH_RADIUS_KM, loc.distance(bb[0], bb[1], bb[2], bb[3])
                + loc.distance(bb[0], bb[3], bb[2], bb[1]));
    }

    /** Whether explicit edges are equally spaced within 1 % (then {@link #binNear} finds bins directly). */
    static boolean nearlyEqualSpacing(double[] e) {
        double min = Double.POSITIVE_INFINITY;
        double max = 0;
        for (int b = 1; b < e.length; b++) {
            double w = e[b] - e[b - 1];
            min = Math.min(min, w);
            max = Math.max(max, w);
        }
        return e.length > 2 && min > 0 && max <= 1.01 * min;
    }

    /**
     * The same bin as {@link #bin(double[], double)} for nearly equally spaced edges, from the
     * guess ⌊(h − e_0) / w⌋ corrected by comparisons with the neighbouring edges (so the result
     * is exact, not a rounding of the guess); invWidth = B / (e_B − e_0).
     */
    static int binNear(double[] e, double h, double invWidth) {
        int nb = e.length - 1;
        if (h < e[0] || h > e[nb]) {
            return -1;
        }
        int b = Math.max(0, Math.min(nb - 1, (int) ((h - e[0]) * invWidth)));
        while (b < nb - 1 && h > e[b + 1]) {
            b++;
        }
        while (b > 0 && h <= e[b]) {
            b--;
        }
        return b;
    }

    /** Bin of lag h for edges e: (e_b, e_{b+1}], first bin closed at e_0; −1 outside. */
    static int bin(double[] e, double h) {
        if (h < e[0] || h > e[e.length - 1]) {
            return -1;
        }
        int lo = 0, hi = e.length - 1; // find smallest index hi with e[hi] >= h
        while (hi - lo > 1) {
            int mid = (lo + hi) >>> 1;
            if (e[mid] >= h) {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        return hi - 1;
    }

    private static VariogramCloud cloud(Locations loc, double[] y, int k, double maxLag, int limit, double g2) {
        int n = loc.size();
        int cap = Math.min(limit, 1 << 16);
        int[] a = new int[cap];
        int[] b = new int[cap];
        double[] d = new double[cap];
        double[] g = new double[cap];
        int count = 0;
        boolean truncated = false;
        outer:
        for (int i = 0; i < n; i++) {
            for (int j = i + 1; j < n; j++) {
                double h = loc.distance(i, j);
                if (h > maxLag) {
                    continue;
                }
                if (count == limit) {
                    truncated = true;
                    break outer;
                }
                if (count == a.length) {
                    int nc = (int) Math.min(limit, 2L * count);
                    a = Arrays.copyOf(a, nc);
                    b = Arrays.copyOf(b, nc);
                    d = Arrays.copyOf(d, nc);
                    g = Arrays.copyOf(g, nc);
                }
                double s = 0;
                for (int c = 0; c < k; c++) {
                    double t = y[i * k + c] - y[j * k + c];
                    s += t * t;
                }
                a[count] = i;
                b[count] = j;
                d[count] = h;
                g[count] = 0.5 * s * g2;
                if (!Double.isFinite(g[count])) {
                    throw new IllegalArgumentException("the squared B2 distance of locations " + i + " and " + j
                            + " overflows a double; the densities are too far apart to compare");
                }
                count++;
            }
        }
        return new VariogramCloud(Arrays.copyOf(a, count), Arrays.copyOf(b, count), Arrays.copyOf(d, count),
                Arrays.copyOf(g, count), truncated);
    }

    /** Number of bins of the first (or only) sector. */
    public int binCount() {
        return binCount(0);
    }

    /** Number of bins of sector s (bins are merged per sector; see {@link VariogramOptions}). */
    public int binCount(int sector) {
        return edges[checkSector(sector)].length - 1;
    }

    /** Number of sectors (1 when omnidirectional). */
    public int sectorCount() {
        return counts.length;
    }

    /** Bin edges e_0..e_B of the first (or only) sector, after merging sparse bins. */
    public double[] edges() {
        return edges(0);
    }

    /** Bin edges e_0..e_B of sector s, after merging sparse bins. */
    public double[] edges(int sector) {
        return edges[checkSector(sector)].clone();
    }

    /** Sector directions in degrees, or an empty array when omnidirectional. */
    public double[] directions() {
        return directions == null ? new double[0] : directions.clone();
    }

    /** Angular tolerance in degrees (NaN when omnidirectional). */
    public double tolerance() {
        return tolerance;
    }

    /** Pair counts per bin of sector s. */
    public long[] counts(int sector) {
        return counts[checkSector(sector)].clone();
    }

    /** Mean lag per bin of sector s (every bin holds at least one pair). */
    public double[] meanLags(int sector) {
        return meanLag[checkSector(sector)].clone();
    }

    /** γ̂ per bin of sector s (every bin holds at least one pair). */
    public double[] semivariances(int sector) {
        return gamma[checkSector(sector)].clone();
    }

    /** Pair counts of the first (or only) sector. */
    public long[] counts() {
        return counts(0);
    }

    /** Mean lags of the first (or only) sector. */
    public double[] meanLags() {
        return meanLags(0);
    }

    /** γ̂ of the first (or only) sector. */
    public double[] semivariances() {
        return semivariances(0);
    }

    /** The variogram cloud, or null if not requested. */
    public VariogramCloud cloud() {
        return cloud;
    }

    private int checkSector(int s) {
        if (s < 0 || s >= counts.length) {
            throw new IllegalArgumentException("sector " + s + " out of range [0, " + counts.length + ")");
        }
        return s;
    }

    @Override
    public String toString() {
        return "EmpiricalVariogram[bins=" + binCount() + ", sectors=" + sectorCount() + ", maxLag="
                + edges[0][edges[0].length - 1] + "]";
    }
}
