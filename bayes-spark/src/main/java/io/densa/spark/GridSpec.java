package io.densa.spark;

import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import java.io.Serializable;
import java.util.Objects;
import org.locationtech.jts.geom.Polygon;
import org.locationtech.jts.io.ParseException;
import org.locationtech.jts.io.WKBReader;
import org.locationtech.jts.io.WKBWriter;

/**
 * A prediction grid and the per-cell quantities to derive, as primitives to broadcast: the box, the
 * number of columns and rows, an optional mask polygon (as WKB, ISO 13249-3 / OGC Simple Features), the
 * tile size and the derived maps (kriging variance, means, quantiles, tail probabilities, distance to
 * the nearest station). {@link #grid()} and {@link #options()} rebuild {@link Grid} and
 * {@link GridOptions} once per JVM from the same numbers (single-threaded: Spark runs the tiles in
 * parallel), so cell centres and predictions are those of the driver. Caller cell functions are not
 * offered (they are not numbers). Immutable.
 */
public final class GridSpec implements Serializable {
    private static final long serialVersionUID = 1L;

    private final double minX;
    private final double minY;
    private final double maxX;
    private final double maxY;
    private final int nx;
    private final int ny;
    private final byte[] mask;
    private final int tileSize;
    private final boolean variance;
    private final double[] thresholds;
    private final double[] probabilities;
    private final boolean means;
    private final boolean nearest;
    private final PerJvm<Grid> grid = new PerJvm<>();
    private final PerJvm<GridOptions> options = new PerJvm<>();

    private GridSpec(double minX, double minY, double maxX, double maxY, int nx, int ny, byte[] mask, int tileSize,
            boolean variance, double[] thresholds, double[] probabilities, boolean means, boolean nearest) {
        this.minX = minX;
        this.minY = minY;
        this.maxX = maxX;
        this.maxY = maxY;
        this.nx = nx;
        this.ny = ny;
        this.mask = mask;
        this.tileSize = tileSize;
        this.variance = variance;
        this.thresholds = thresholds;
        this.probabilities = probabilities;
        this.means = means;
        this.nearest = nearest;
        grid();
        options();
    }

    /**
     * A grid of nx × ny cells over the box ({@link Grid#over}) with tiles of 64 × 64 cells, the kriging
     * variance and no other derived map.
     */
    public static GridSpec over(double minX, double minY, double maxX, double maxY, int nx, int ny) {
        return new GridSpec(minX, minY, maxX, maxY, nx, ny, null, 64, true, new double[0], new double[0], false, false);
    }

    /** The same grid masked by a polygon ({@link Grid#withMask}). */
    public GridSpec withMask(Polygon polygon) {
        Objects.requireNonNull(polygon, "polygon");
        return new GridSpec(minX, minY, maxX, maxY, nx, ny, new WKBWriter().write(polygon), tileSize, variance,
                thresholds, probabilities, means, nearest);
    }

    /** See {@link GridOptions#withTileSize}. */
    public GridSpec withTileSize(int cells) {
        return new GridSpec(minX, minY, maxX, maxY, nx, ny, mask, cells, variance, thresholds, probabilities, means,
                nearest);
    }

    /** See {@link GridOptions#withVariance}. */
    public GridSpec withVariance(boolean v) {
        return new GridSpec(minX, minY, maxX, maxY, nx, ny, mask, tileSize, v, thresholds, probabilities, means,
                nearest);
    }

    /** See {@link GridOptions#withTailProbabilities}. */
    public GridSpec withTailProbabilities(double... t) {
        return new GridSpec(minX, minY, maxX, maxY, nx, ny, mask, tileSize, variance, t.clone(), probabilities, means,
                nearest);
    }

    /** See {@link GridOptions#withQuantiles}. */
    public GridSpec withQuantiles(double... probs) {
        return new GridSpec(minX, minY, maxX, maxY, nx, ny, mask, tileSize, variance, thresholds, probs.clone(), means,
                nearest);
    }

    /** See {@link GridOptions#withMeans}. */
    public GridSpec withMeans(boolean m) {
        return new GridSpec(minX, minY, maxX, maxY, nx, ny, mask, tileSize, variance, thresholds, probabilities, m,
                nearest);
    }

    /** See {@link GridOptions#withNearestDistances}. */
    public GridSpec withNearestDistances(boolean n) {
        return new GridSpec(minX, minY, maxX, maxY, nx, ny, mask, tileSize, variance, thresholds, probabilities, means,
                n);
    }

    /** The grid (built once per JVM). */
    public Grid grid() {
        return grid.get(() -> {
            Grid g = Grid.over(minX, minY, maxX, maxY, nx, ny);
            if (mask != null) {
                try {
                    g = g.withMask((Polygon) new WKBReader().read(mask));
                } catch (ParseException e) {
                    throw new IllegalStateException("the mask's WKB does not parse: " + e.getMessage(), e);
                }
            }
            return g;
        });
    }

    /** The grid options (built once per JVM). */
    public GridOptions options() {
        return options.get(() -> GridOptions.withDefaults().withTileSize(tileSize).withVariance(variance)
                    .withTailProbabilities(thresholds).withQuantiles(probabilities).withMeans(means)
                    .withNearestDistances(nearest).withParallel(false));
    }

    boolean variance() {
        return variance;
    }

    double[] thresholds() {
        return thresholds.clone();
    }

    double[] probabilities() {
        return probabilities.clone();
    }

    boolean means() {
        return means;
    }

    boolean nearest() {
        return nearest;
    }

    @Override
    public String toString() {
        return "GridSpec[" + grid() + ", tiles " + tileSize + "]";
    }
}
