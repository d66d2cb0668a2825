package io.densa.spatial.kriging;

import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import io.densa.core.internal.Kernels;
import io.densa.spatial.Locations;
import io.densa.spatial.NeighbourIndex;
import io.densa.spatial.internal.NearestHeap;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.function.Consumer;
import java.util.function.Function;
import java.util.function.ToDoubleFunction;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.prep.PreparedGeometry;

/**
 * Grid prediction of a range of tiles, for splitting {@link Kriging#predictGrid} over threads,
 * processes or machines: the tiles of a grid are numbered row-major, tile t at tile column
 * t mod {@link #tilesAcross} and tile row t / tilesAcross, and {@link #predict} delivers tiles
 * [from, to) exactly as {@code predictGrid} delivers them (the same code computes each tile, and a
 * tile does not depend on which other tiles are computed), so the union of disjoint ranges is the
 * whole grid, cell for cell and bit for bit.
 *
 * <p>The same engine serves {@link Kriging#predictGrid}. Local neighbourhoods: for a block of cells
 * with centre t and half-diagonal δ, the k nearest data locations of any cell c lie within
 * d_k(t) + 2δ of t (triangle inequality: d_k(c) ≤ d_k(t) + δ), so one radius query per 16 × 16
 * sub-block of a tile gives a candidate list, and each cell selects its k nearest from it exactly (ties by index, as {@link NeighbourIndex#nearest}). Factorised systems are kept per
 * tile in a cache of 512 neighbour sets (direct-mapped by an order-free hash of the set, each hit
 * confirmed station by station), so adjacent cells that share their neighbours share one
 * factorisation and memory stays bounded by the tile; a system depends only on its set, so the
 * cache changes the work done, never a result;
 * station–station covariances come from the kriging's station matrix. Global neighbourhood
 * without variance uses the dual form: predictions = C0 α + F0 β for the tile's m × n covariance
 * block C0, with α, β from one factorisation (O(nK) per cell after the covariances).
 *
 * <p>Stateless; the kriging is shared read-only (it is safe to share between threads).
 */
public final class GridTiles {
    /** Slots of a tile's cache of factorised systems (a power of two). */
    private static final int CACHE_SLOTS = 512;
    /**
     * Tiles computed (in parallel) before they are handed to the consumer in order: fixed, so that
     * the memory held and the progress granularity do not depend on the machine (16 tiles keep a
     * few dozen worker threads busy; common practice).
     */
    static final int TILE_BATCH = 16;

    private GridTiles() {
    }

    static void run(Kriging kr, Grid grid, GridOptions opt, Consumer<GridTile> consumer) {
        run(kr, grid, opt, null, t -> t, consumer);
    }

    /**
     * As {@link #run(Kriging, Grid, GridOptions, Consumer)}, with per-tile work applied to each
     * predicted tile on the worker thread that computed it; the results reach the consumer in tile
     * order from the calling thread.
     */
    static <T> void run(Kriging kr, Grid grid, GridOptions opt, CovariateGrid cg, Function<GridTile, T> work,
            Consumer<T> consumer) {
        Objects.requireNonNull(opt, "options");
        runRange(kr, grid, opt, cg, work, 0, tileCount(grid, opt), consumer);
    }

    /**
     * Predicts tiles [from, to) of the grid (tile t at tile column t mod tilesX, tile row t / tilesX)
     * into the consumer, in tile order; each tile is computed exactly as by {@link #run}.
     */
    static void runRange(Kriging kr, Grid grid, GridOptions opt, int from, int to, Consumer<GridTile> consumer) {
        runRange(kr, grid, opt, null, t -> t, from, to, consumer);
    }

    private static <T> void runRange(Kriging kr, Grid grid, GridOptions opt, CovariateGrid cg,
            Function<GridTile, T> work, int from, int to, Consumer<T> consumer) {
        Objects.requireNonNull(grid, "grid");
        Objects.requireNonNull(opt, "options");
        Objects.requireNonNull(consumer, "consumer");
        int q = kr.drift() != null && kr.type() == Kriging.Type.UNIVERSAL ? kr.drift().covariateCount() : 0;
        if (q > 0 && cg == null) {
            throw new IllegalArgumentException("the drift has " + q + " external covariate(s): give their values at"
                    + " every cell with predictGrid(grid, covariateGrid, options, consumer)");
        }
        if (cg != null) {
            if (q == 0) {
                throw new IllegalArgumentException("a covariate grid was given but the kriging's drift has no external"
                        + " covariates (" + kr.drift() + ")");
            }
            cg.requireMatches(grid, q);
        }
        // the corners bound every cell (geographic ranges; planar distances to the data)
        for (int cc : new int[] {0, grid.columns() - 1}) {
            for (int rr : new int[] {0, grid.rows() - 1}) {
                kr.locations().requirePoint(grid.x(cc), grid.y(rr), "grid corner");
            }
        }
        int ts = opt.tileSize();
        int tilesX = (grid.columns() + ts - 1) / ts;
        int total = tileCount(grid, opt);
        if (from < 0 || to > total || from > to) {
            throw new IllegalArgumentException("tile range [" + from + ", " + to + ") outside the grid's " + total
                    + " tiles");
        }
        boolean dual = kr.options().neighbourhood().isGlobal() && !opt.variance();
        Dual d = dual ? new Dual(kr) : null;
        if (kr.options().neighbourhood().isGlobal()) {
            kr.globalSystem();
        }
        int batch = TILE_BATCH;
        Object[] out = new Object[batch];
        for (int start = from; start < to; start += batch) {
            int count = Math.min(batch, to - start);
            final int s0 = start;
            Kernels.forEachBlock(count, opt.parallel(), b -> {
                int t = s0 + b;
                GridTile tile = tile(kr, grid, opt, t % tilesX, t / tilesX, d, cg);
                out[b] = tile == null ? null : work.apply(tile);
            });
            for (int b = 0; b < count; b++) {
                if (out[b] != null) {
                    @SuppressWarnings("unchecked")
                    T done = (T) out[b];
                    consumer.accept(done);
                }
                out[b] = null;
            }
            if (opt.listener() != ProgressListener.NONE) {
                opt.listener().progress("grid tiles", start - from + count, to - from);
            }
        }
    }

    /** Dual-form weights for the global neighbourhood: α = C⁻¹(Y − Fβ) (n × K), β (p × K). */
    static final class Dual {
        final double[] alpha;
        final double[] beta;

        Dual(Kriging kr) {
            LocalSystem g = kr.globalSystem();
            beta = g.driftCoefficients();
            alpha = g.dualWeights(beta);
        }
    }

    private static GridTile tile(Kriging kr, Grid grid, GridOptions opt, int tx, int ty, Dual dual,
            CovariateGrid cg) {
        int ts = opt.tileSize();
        int c0 = tx * ts, c1 = Math.min(grid.columns(), c0 + ts);
        int r0 = ty * ts, r1 = Math.min(grid.rows(), r0 + ts);
        int cap = (c1 - c0) * (r1 - r0);
        int[] cols = new int[cap];
        int[] rows = new int[cap];
        PreparedGeometry mask = grid.prepared();
        boolean all = true;
        boolean none = false;
        if (mask != null) {
            Envelope env = new Envelope(grid.x(c0), grid.x(c1 - 1), grid.y(r0), grid.y(r1 - 1));
            GeometryFactory gf = grid.mask().getFactory();
            org.locationtech.jts.geom.Geometry box = gf.toGeometry(env);
            all = mask.covers(box);
            none = !all && mask.disjoint(box);
        }
        if (none) {
            return null;
        }
        int m = 0;
        GeometryFactory gf = mask == null ? null : grid.mask().getFactory();
        for (int r = r0; r < r1; r++) {
            for (int c = c0; c < c1; c++) {
                if (all || mask.covers(gf.createPoint(new Coordinate(grid.x(c), grid.y(r))))) {
                    cols[m] = c;
                    rows[m] = r;
                    m++;
                }
            }
        }
        if (m == 0) {
            return null;
        }
        cols = Arrays.copyOf(cols, m);
        rows = Arrays.copyOf(rows, m);
        int k = kr.dimension();
        double[] coords = new double[m * k];
        double[] var = opt.variance() ? new double[m] : null;
        double[] near = opt.nearestDistances() ? new double[m] : null;
        if (dual != null) {
            dualTile(kr, grid, cols, rows, coords, dual, near, cg);
        } else if (kr.options().neighbourhood().isGlobal()) {
            LocalSystem g = kr.globalSystem();
            double[] cv = new double[kr.size()];
            double[] dist = new double[kr.size()];
            double[] f0 = new double[kr.driftSize()];
            LocalSystem.Scratch sc = new LocalSystem.Scratch(kr.driftSize());
            double[] cov = cg == null ? null : new double[cg.count()];
            for (int q = 0; q < m; q++) {
                double x = grid.x(cols[q]), y = grid.y(rows[q]);
                kr.covariances().targets(null, kr.size(), x, y, dist, cv);
                kr.design().driftAt(x, y, covariates(cg, cols[q], rows[q], cov), f0);
                double v = g.predict(cv, f0, kr.covariances().pseudoSill(), kr.centre(), coords, q * k, null, sc);
                if (sc.residual > LocalSystem.CONSTRAINT_TOLERANCE) {
                    kr.checkConstraints(sc.residual, x, y, g, StationCovariances.nearest(dist, kr.size()));
                }
                if (var != null) {
                    var[q] = kr.variance(v, x, y, g);
                }
                if (near != null) {
                    near[q] = StationCovariances.nearest(dist, kr.size());
                }
            }
        } else {
            localTile(kr, grid, cols, rows, coords, var, near, cg);
        }
        DensitySet set = DensitySet.ofRowMajor(kr.space(), coords, m, null);
        double[] t = opt.thresholds();
        double[][] tails = new double[t.length][];
        for (int i = 0; i < t.length; i++) {
            tails[i] = set.tailProbability(t[i]);
        }
        double[] pr = opt.probabilities();
        double[][] qs = new double[pr.length][];
        for (int i = 0; i < pr.length; i++) {
            qs[i] = set.quantiles(pr[i]);
        }
        double[] means = opt.means() ? set.means() : null;
        List<ToDoubleFunction<double[]>> fs = opt.functions();
        double[][] vals = new double[fs.size()][m];
        if (!fs.isEmpty()) {
            double[] row = new double[k];
            for (int q = 0; q < m; q++) {
                for (int f = 0; f < fs.size(); f++) {
                    System.arraycopy(coords, q * k, row, 0, k);
                    vals[f][q] = fs.get(f).applyAsDouble(row);
                }
            }
        }
        return new GridTile(tx, ty, cols, rows, set, var, tails, qs, means, vals, near);
    }

    private static void dualTile(Kriging kr, Grid grid, int[] cols, int[] rows, double[] coords, Dual d,
            double[] near, CovariateGrid cg) {
        int m = cols.length, n = kr.size(), k = kr.dimension(), p = kr.driftSize();
        int chunk = 64;
        double[] c0 = new double[chunk * n];
        double[] part = new double[chunk * k];
        double[] f0 = new double[p];
        double[] dist = new double[n];
        double[] row = new double[n];
        double[] cov = cg == null ? null : new double[cg.count()];
        for (int q0 = 0; q0 < m; q0 += chunk) {
            int len = Math.min(chunk, m - q0);
            for (int q = 0; q < len; q++) {
                double x = grid.x(cols[q0 + q]), y = grid.y(rows[q0 + q]);
                kr.covariances().targets(null, n, x, y, dist, row);
                System.arraycopy(row, 0, c0, q * n, n);
                if (near != null) {
                    near[q0 + q] = StationCovariances.nearest(dist, n);
                }
            }
            Kernels.multiply(c0, len, n, d.alpha, k, part, false);
            for (int q = 0; q < len; q++) {
                double x = grid.x(cols[q0 + q]), y = grid.y(rows[q0 + q]);
                kr.design().driftAt(x, y, covariates(cg, cols[q0 + q], rows[q0 + q], cov), f0);
                int o = (q0 + q) * k;
                double[] centre = kr.centre();
                for (int c = 0; c < k; c++) {
                    double s = centre[c] + part[q * k + c];
                    for (int j = 0; j < p; j++) {
                        s += f0[j] * d.beta[j * k + c];
                    }
                    coords[o + c] = s;
                }
            }
        }
    }

    /** The drift covariates of a cell into buf, or null without a covariate grid. */
    private static double[] covariates(CovariateGrid cg, int column, int row, double[] buf) {
        if (cg == null) {
            return null;
        }
        cg.values(column, row, buf);
        return buf;
    }

    /** Cells per side of the sub-blocks that share one candidate query. */
    private static final int SUB = 16;

    private static void localTile(Kriging kr, Grid grid, int[] cols, int[] rows, double[] coords, double[] var,
            double[] near, CovariateGrid cg) {
        int m = cols.length;
        int cmin = Integer.MAX_VALUE, rmin = Integer.MAX_VALUE, cmax = 0;
        for (int q = 0; q < m; q++) {
            cmin = Math.min(cmin, cols[q]);
            rmin = Math.min(rmin, rows[q]);
            cmax = Math.max(cmax, cols[q]);
        }
        int nsx = (cmax - cmin) / SUB + 1;
        // group cells by sub-block (counting sort keeps the cells' order inside each group)
        int[] sub = new int[m];
        int groups = 0;
        for (int q = 0; q < m; q++) {
            sub[q] = ((rows[q] - rmin) / SUB) * nsx + (cols[q] - cmin) / SUB;
            groups = Math.max(groups, sub[q] + 1);
        }
        int[] start = new int[groups + 1];
        for (int q = 0; q < m; q++) {
            start[sub[q] + 1]++;
        }
        for (int gI = 0; gI < groups; gI++) {
            start[gI + 1] += start[gI];
        }
        int[] order = new int[m];
        int[] fill = start.clone();
        for (int q = 0; q < m; q++) {
            order[fill[sub[q]]++] = q;
        }
        SystemCache cache = new SystemCache();
        int[] candidatePosition = new int[kr.size()];
        LocalSystem.Scratch sc = new LocalSystem.Scratch(kr.driftSize());
        for (int gI = 0; gI < groups; gI++) {
            if (start[gI + 1] > start[gI]) {
                localCells(kr, grid, cols, rows, order, start[gI], start[gI + 1], coords, var, near, cache, sc,
                        cg, candidatePosition);
            }
        }
    }

    /**
     * Predicts the cells order[from..to) sharing one candidate query; candidatePosition is scratch
     * indexed by station (one entry per station, filled for the group's candidates).
     */
    private static void localCells(Kriging kr, Grid grid, int[] cols, int[] rows, int[] order, int from, int to,
            double[] coords, double[] var, double[] near, SystemCache cache, LocalSystem.Scratch sc,
            CovariateGrid cg, int[] candidatePosition) {
        int k = kr.dimension(), p = kr.driftSize();
        Neighbourhood hood = kr.options().neighbourhood();
        // centre and half-diagonal of the group's cells
        int q0 = order[from];
        double xa = grid.x(cols[q0]), xb = xa, ya = grid.y(rows[q0]), yb = ya;
        for (int o = from; o < to; o++) {
            int q = order[o];
            xa = Math.min(xa, grid.x(cols[q]));
            xb = Math.max(xb, grid.x(cols[q]));
            ya = Math.min(ya, grid.y(rows[q]));
            yb = Math.max(yb, grid.y(rows[q]));
        }
        double cx = 0.5 * (xa + xb), cy = 0.5 * (ya + yb);
        Locations loc = kr.locations();
        double delta = Math.max(Math.max(loc.distance(cx, cy, xa, ya), loc.distance(cx, cy, xb, yb)),
                Math.max(loc.distance(cx, cy, xa, yb), loc.distance(cx, cy, xb, ya)));
        int want = Math.min(hood.count(), kr.size());
        int[] cand;
        if (hood.kind() == Neighbourhood.Kind.NEAREST) {
            double rk = kr.index().kthDistance(cx, cy, want);
            cand = kr.index().within(cx, cy, (rk + 2 * delta) * (1 + 1e-12) + 1e-300);
        } else {
            cand = kr.index().within(cx, cy, hood.radius() + delta);
        }
        int nc = cand.length;
        double[] dist = new double[nc];
        boolean planar = kr.locations().kind() == Locations.Kind.PLANAR;
        double[] candX = planar ? new double[nc] : null, candY = planar ? new double[nc] : null;
        double[] sq = planar ? new double[nc] : null;
        if (planar) {
            kr.covariances().gather(cand, nc, candX, candY);
        }
        NearestHeap heap = new NearestHeap(want);
        double[] f0 = new double[p];
        int need = Math.max(1, p + 1);
        double[] c0 = new double[want];
        double[] nd = new double[want];
        double[] cov = cg == null ? null : new double[cg.count()];
        // k nearest: the last cell's system, with its stations' positions among the candidates
        boolean nearest = hood.kind() == Neighbourhood.Kind.NEAREST;
        LocalSystem last = null;
        double[] inside = nearest ? new double[nc] : null, outside = nearest ? new double[nc] : null;
        int[] lastPos = nearest ? new int[want] : null;
        if (nearest) {
            Arrays.fill(inside, Double.NEGATIVE_INFINITY);
            for (int a = 0; a < nc; a++) {
                candidatePosition[cand[a]] = a;
            }
        }
        for (int o = from; o < to; o++) {
            int q = order[o];
            double x = grid.x(cols[q]), y = grid.y(rows[q]);
            if (planar) {
                StationCovariances.planarDistances(candX, candY, nc, x, y, sq, dist);
            } else {
                kr.covariances().distances(cand, nc, x, y, dist);
            }
            LocalSystem sys;
            int mm;
            double[] dv;
            if (last != null && separates(dist, inside, outside, nc)) {
                // every station of the last cell's set is strictly nearer than every other
                // candidate: the heap would select the same set (most neighbouring cells)
                sys = last;
                mm = sys.size();
                dv = mm == nd.length ? nd : new double[mm];
                for (int t = 0; t < mm; t++) {
                    dv[t] = dist[lastPos[t]];
                }
            } else {
                heap.clear();
                for (int a = 0; a < nc; a++) {
                    double dd = dist[a];
                    if (hood.kind() == Neighbourhood.Kind.RADIUS && dd > hood.radius()) {
                        continue;
                    }
                    heap.offer(dd, cand[a]);
                }
                mm = heap.size();
                if (mm < Math.min(need, kr.size())) {
                    // fall back to the exact per-target path, which reports the failure with diagnostics
                    kr.neighbours(x, y, -1);
                }
                // the set, not its order, names the system: look it up by an order-free hash and
                // check it station by station; only a new set is sorted (the system's canonical order)
                dv = mm == nd.length ? nd : new double[mm];
                long key = heap.indexSet();
                sys = cache.get(key);
                if (sys == null || !heap.distancesInOrderOf(sys.stationsView(), sys.size(), dv)) {
                    sys = kr.system(heap.sortedIndices());
                    cache.put(key, sys);
                    heap.distancesInOrderOf(sys.stationsView(), sys.size(), dv);
                }
                if (nearest && sys != last) {
                    if (last != null) {
                        for (int t = 0; t < last.size(); t++) {
                            inside[lastPos[t]] = Double.NEGATIVE_INFINITY;
                            outside[lastPos[t]] = 0.0;
                        }
                    }
                    int[] st = sys.stationsView();
                    for (int t = 0; t < sys.size(); t++) {
                        lastPos[t] = candidatePosition[st[t]];
                        inside[lastPos[t]] = 0.0;
                        outside[lastPos[t]] = Double.POSITIVE_INFINITY;
                    }
                    last = sys;
                }
            }
            double[] cv = mm == c0.length ? c0 : new double[mm];
            kr.covariances().atDistances(dv, mm, cv);
            kr.design().driftAt(x, y, covariates(cg, cols[q], rows[q], cov), f0);
            double v = sys.predict(cv, f0, kr.covariances().pseudoSill(), kr.centre(), coords, q * k, null, sc);
            if (sc.residual > LocalSystem.CONSTRAINT_TOLERANCE) {
                kr.checkConstraints(sc.residual, x, y, sys, StationCovariances.nearest(dv, mm));
            }
            if (var != null) {
                var[q] = kr.variance(v, x, y, sys);
            }
            if (near != null) {
                near[q] = StationCovariances.nearest(dv, mm);
            }
        }
    }

    /**
     * Whether the marked candidates are all strictly nearer than all the others (NaN fails): then
     * they are the nearest ones whatever the ties among the others. A candidate is marked by
     * inside[a] = 0, outside[a] = +∞ (otherwise −∞ and 0): two reductions without branches.
     */
    private static boolean separates(double[] dist, double[] inside, double[] outside, int nc) {
        double farthestIn = Double.NEGATIVE_INFINITY;
        for (int a = 0; a < nc; a++) {
            farthestIn = Math.max(farthestIn, dist[a] + inside[a]);
        }
        double nearestOut = Double.POSITIVE_INFINITY;
        for (int a = 0; a < nc; a++) {
            nearestOut = Math.min(nearestOut, dist[a] + outside[a]);
        }
        return farthestIn < nearestOut;
    }

    /** Direct-mapped cache of factorised systems by the hash of their station set. */
    private static final class SystemCache {
        private final long[] keys = new long[CACHE_SLOTS];
        private final LocalSystem[] systems = new LocalSystem[CACHE_SLOTS];

        /** The system stored under this hash, or null (another hash may have taken its slot). */
        LocalSystem get(long key) {
            int s = (int) key & (CACHE_SLOTS - 1);
            return systems[s] != null && keys[s] == key ? systems[s] : null;
        }

        void put(long key, LocalSystem sys) {
            int s = (int) key & (CACHE_SLOTS - 1);
            keys[s] = key;
            systems[s] = sys;
        }
    }

    /** Number of tiles of the grid with the options' tile size s: ⌈columns / s⌉ × ⌈rows / s⌉. */
    public static int tileCount(Grid grid, GridOptions options) {
        Objects.requireNonNull(options, "options");
        GridOptions opt = options;
        Objects.requireNonNull(grid, "grid");
        int ts = opt.tileSize();
        long count = (long) ((grid.columns() + ts - 1) / ts) * ((grid.rows() + ts - 1) / ts);
        if (count > Integer.MAX_VALUE) {
            throw new IllegalArgumentException("grid " + grid.columns() + " x " + grid.rows() + " has " + count
                    + " tiles of " + ts + " x " + ts + " cells; at most " + Integer.MAX_VALUE + " are supported: use"
                    + " larger tiles");
        }
        return (int) count;
    }

    /** Tiles across the grid: ⌈columns / s⌉. */
    public static int tilesAcross(Grid grid, GridOptions options) {
        Objects.requireNonNull(grid, "grid");
        Objects.requireNonNull(options, "options");
        return (grid.columns() + options.tileSize() - 1) / options.tileSize();
    }

    /** The tile edge in cells of the options. */
    public static int tileSize(GridOptions options) {
        return Objects.requireNonNull(options, "options").tileSize();
    }

    /**
     * Predicts tiles [from, to) into the consumer, in tile order; tiles with no cell inside the mask
     * are skipped, as by {@link Kriging#predictGrid}. The options' progress listener sees the tiles of
     * the range.
     *
     * @throws IllegalArgumentException if the range is not within [0, {@link #tileCount}), or as
     *                                  {@link Kriging#predictGrid}
     */
    public static void predict(Kriging kriging, Grid grid, GridOptions options, int from, int to,
            Consumer<GridTile> consumer) {
        Objects.requireNonNull(kriging, "kriging");
        runRange(kriging, grid, options, from, to, consumer);
    }

    /**
     * Predicts the whole grid as {@link Kriging#predictGrid(Grid, GridOptions, Consumer)} (or, with a
     * covariate grid, {@link Kriging#predictGrid(Grid, CovariateGrid, GridOptions, Consumer)}) and
     * applies {@code work} to each predicted tile on the worker thread that computed it; the
     * results reach the consumer in tile order from the calling thread. {@code work} must be
     * thread-safe; a tile it receives is the same object {@code predictGrid} would deliver.
     *
     * @param covariates the drift's covariates at every cell, or null when the drift has none
     * @throws IllegalArgumentException as {@link Kriging#predictGrid}
     */
    public static <T> void map(Kriging kriging, Grid grid, CovariateGrid covariates, GridOptions options,
            Function<GridTile, T> work, Consumer<T> consumer) {
        Objects.requireNonNull(kriging, "kriging");
        Objects.requireNonNull(work, "work");
        run(kriging, grid, options, covariates, work, consumer);
    }

    /**
     * {@link #map(Kriging, Grid, CovariateGrid, GridOptions, Function, Consumer)} for tiles [from, to)
     * only (numbered as by {@link #predict}); each tile is the one the whole-grid call computes.
     *
     * @throws IllegalArgumentException if the range is not within [0, {@link #tileCount}), or as
     *                                  {@link Kriging#predictGrid}
     */
    public static <T> void map(Kriging kriging, Grid grid, CovariateGrid covariates, GridOptions options, int from,
            int to, Function<GridTile, T> work, Consumer<T> consumer) {
        Objects.requireNonNull(kriging, "kriging");
        Objects.requireNonNull(work, "work");
        runRange(kriging, grid, options, covariates, work, from, to, consumer);
    }
}
