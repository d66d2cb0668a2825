package io.densa.io.raster;

import io.densa.spatial.kriging.Grid;
import java.util.List;
import java.util.Objects;

/**
 * The georeferenced shape of a raster: columns × rows cells of width × height, the north-west corner
 * (minX, maxY), the CRS and one name per band. Rows are counted as in {@link Grid}: row 0 is the
 * southernmost (cell centres at minY + (j + ½) height); files store rows north to south.
 *
 * @param columns    cells across, ≥ 1
 * @param rows       cells down, ≥ 1
 * @param minX       west edge
 * @param maxY       north edge
 * @param cellWidth  cell width, finite and positive
 * @param cellHeight cell height, finite and positive
 * @param crs        coordinate reference system
 * @param bands      band names (1 to 1,000, printable ASCII), written as the bands' descriptions
 */
public record RasterLayout(int columns, int rows, double minX, double maxY, double cellWidth, double cellHeight,
        Crs crs, List<String> bands) {

    /** Checks the values. */
    public RasterLayout {
        Objects.requireNonNull(crs, "crs");
        bands = List.copyOf(Objects.requireNonNull(bands, "bands"));
        if (columns < 1 || rows < 1) {
            throw new IllegalArgumentException("a raster needs at least 1 x 1 cells, got " + columns + " x " + rows);
        }
        if (!(Double.isFinite(minX) && Double.isFinite(maxY) && cellWidth > 0 && cellHeight > 0
                && Double.isFinite(cellWidth) && Double.isFinite(cellHeight))) {
            throw new IllegalArgumentException("raster origin must be finite and cell sizes finite and positive, got ("
                    + minX + ", " + maxY + "), " + cellWidth + " x " + cellHeight);
        }
        if (bands.isEmpty() || bands.size() > 1000) {
            throw new IllegalArgumentException("a raster needs 1 to 1000 bands, got " + bands.size());
        }
        for (int b = 0; b < bands.size(); b++) {
            String n = bands.get(b);
            if (n.isEmpty() || n.length() > 200 || !n.chars().allMatch(ch -> ch >= 32 && ch < 127)) {
                throw new IllegalArgumentException("band " + b + " name '" + n + "' must be 1-200 printable ASCII"
                        + " characters");
            }
        }
    }

    /**
     * The layout of a prediction grid: the grid's columns, rows and cell size, its west edge
     * x(0) − width/2 and north edge y(rows − 1) + height/2.
     */
    public static RasterLayout of(Grid grid, Crs crs, List<String> bands) {
        Objects.requireNonNull(grid, "grid");
        double w = grid.cellWidth(), h = grid.cellHeight();
        return new RasterLayout(grid.columns(), grid.rows(), grid.x(0) - 0.5 * w, grid.y(grid.rows() - 1) + 0.5 * h,
                w, h, crs, bands);
    }

    /** Number of cells. */
    public long cells() {
        return (long) columns * rows;
    }
}
