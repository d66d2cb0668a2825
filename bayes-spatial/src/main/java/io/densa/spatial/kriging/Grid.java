package io.densa.spatial.kriging;

import java.util.Objects;
import org.locationtech.jts.geom.Polygon;
import org.locationtech.jts.geom.prep.PreparedGeometry;
import org.locationtech.jts.geom.prep.PreparedGeometryFactory;

/**
 * A regular grid of nx × ny cells over a bounding box, optionally masked by a polygon: cell
 * (column i, row j) has centre (minX + (i + ½)Δx, minY + (j + ½)Δy) with Δx = (maxX − minX)/nx,
 * Δy = (maxY − minY)/ny; with a mask only cells whose centre the polygon covers are predicted.
 *
 * <p>Immutable; the mask is prepared once (JTS {@link PreparedGeometry}) and safe to query from
 * several threads.
 */
public final class Grid {
    private final double minX;
    private final double minY;
    private final double maxX;
    private final double maxY;
    private final int nx;
    private final int ny;
    private final Polygon mask;
    private final PreparedGeometry prepared;

    private Grid(double minX, double minY, double maxX, double maxY, int nx, int ny, Polygon mask) {
        this.minX = minX;
        this.minY = minY;
        this.maxX = maxX;
        this.maxY = maxY;
        this.nx = nx;
        this.ny = ny;
        this.mask = mask;
        this.prepared = mask == null ? null : PreparedGeometryFactory.prepare(mask);
    }

    /**
     * A grid of nx × ny cells over [minX, maxX] × [minY, maxY].
     *
     * @throws IllegalArgumentException unless the bounds are finite with min &lt; max and nx, ny ≥ 1
     */
    public static Grid over(double minX, double minY, double maxX, double maxY, int nx, int ny) {
        if (!Double.isFinite(minX) || !Double.isFinite(minY) || !Double.isFinite(maxX) || !Double.isFinite(maxY)
                || !(minX < maxX) || !(minY < maxY)) {
            throw new IllegalArgumentException("grid box must be finite with min < max, got [" + minX + ", " + maxX
                    + "] x [" + minY + ", " + maxY + "]");
        }
        if (nx < 1 || ny < 1) {
            throw new IllegalArgumentException("grid needs at least 1 x 1 cells, got " + nx + " x " + ny);
        }
        return new Grid(minX, minY, maxX, maxY, nx, ny, null);
    }

    /** The same grid masked by a polygon (cells whose centre it covers). */
    public Grid withMask(Polygon polygon) {
        Objects.requireNonNull(polygon, "polygon");
        if (polygon.isEmpty()) {
            throw new IllegalArgumentException("mask polygon is empty");
        }
        return new Grid(minX, minY, maxX, maxY, nx, ny, polygon);
    }

    /** Columns. */
    public int columns() {
        return nx;
    }

    /** Rows. */
    public int rows() {
        return ny;
    }

    /** Centre x of column i. */
    public double x(int i) {
        return minX + (i + 0.5) * (maxX - minX) / nx;
    }

    /** Centre y of row j. */
    public double y(int j) {
        return minY + (j + 0.5) * (maxY - minY) / ny;
    }

    /** Cell width Δx. */
    public double cellWidth() {
        return (maxX - minX) / nx;
    }

    /** Cell height Δy. */
    public double cellHeight() {
        return (maxY - minY) / ny;
    }

    /** The mask, or null. */
    public Polygon mask() {
        return mask;
    }

    PreparedGeometry prepared() {
        return prepared;
    }

    @Override
    public String toString() {
        return "Grid[" + nx + " x " + ny + " over [" + minX + ", " + maxX + "] x [" + minY + ", " + maxY + "]"
                + (mask != null ? ", masked" : "") + "]";
    }
}
