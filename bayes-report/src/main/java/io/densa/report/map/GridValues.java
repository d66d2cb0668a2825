package io.densa.report.map;

import io.densa.spatial.kriging.Grid;
import java.util.Objects;

/**
 * Values on a regular grid of nx × ny cells covering [minX, maxX] × [minY, maxY] (planar
 * coordinates), row-major from the south: cell (column i, row j) is {@code values[j * nx + i]}.
 * NaN marks cells without a value (outside a mask); they stay transparent on a map.
 *
 * <p>Immutable; the array is copied in and out.
 */
public final class GridValues {
    private final double minX;
    private final double minY;
    private final double maxX;
    private final double maxY;
    private final int nx;
    private final int ny;
    private final double[] values;

    private GridValues(double minX, double minY, double maxX, double maxY, int nx, int ny, double[] values) {
        this.minX = minX;
        this.minY = minY;
        this.maxX = maxX;
        this.maxY = maxY;
        this.nx = nx;
        this.ny = ny;
        this.values = values;
    }

    /**
     * Grid values over a box.
     *
     * @throws IllegalArgumentException if the box is not finite with min &lt; max, a size is below 1,
     *                                  the array length is not nx · ny, or a value is infinite
     */
    public static GridValues of(double minX, double minY, double maxX, double maxY, int nx, int ny,
            double[] values) {
        Objects.requireNonNull(values, "values");
        if (!(Double.isFinite(minX) && Double.isFinite(minY) && Double.isFinite(maxX) && Double.isFinite(maxY)
                && minX < maxX && minY < maxY)) {
            throw new IllegalArgumentException("grid box must be finite with min < max, got [" + minX + ", " + maxX
                    + "] x [" + minY + ", " + maxY + "]");
        }
        if (nx < 1 || ny < 1 || (long) nx * ny != values.length) {
            throw new IllegalArgumentException("grid of " + nx + " x " + ny + " cells needs " + (long) nx * ny
                    + " values, got " + values.length);
        }
        for (int k = 0; k < values.length; k++) {
            if (Double.isInfinite(values[k])) {
                throw new IllegalArgumentException("grid cell (column " + k % nx + ", row " + k / nx + ") is "
                        + values[k] + "; give a finite value or NaN for none");
            }
        }
        return new GridValues(minX, minY, maxX, maxY, nx, ny, values.clone());
    }

    /** Values on the cells of a Densa {@link Grid} (its box and size). */
    public static GridValues of(Grid grid, double[] values) {
        Objects.requireNonNull(grid, "grid");
        double hx = grid.cellWidth() / 2;
        double hy = grid.cellHeight() / 2;
        return of(grid.x(0) - hx, grid.y(0) - hy, grid.x(grid.columns() - 1) + hx, grid.y(grid.rows() - 1) + hy,
                grid.columns(), grid.rows(), values);
    }

    /** Western edge. */
    public double minX() {
        return minX;
    }

    /** Southern edge. */
    public double minY() {
        return minY;
    }

    /** Eastern edge. */
    public double maxX() {
        return maxX;
    }

    /** Northern edge. */
    public double maxY() {
        return maxY;
    }

    /** Columns. */
    public int columns() {
        return nx;
    }

    /** Rows. */
    public int rows() {
        return ny;
    }

    /** The values (a copy). */
    public double[] values() {
        return values.clone();
    }

    double value(int column, int row) {
        return values[row * nx + column];
    }
}
