package io.densa.spatial.kriging;

import java.util.Objects;

/**
 * Values of external drift covariates at every cell of a {@link Grid}, for universal kriging with
 * an external drift ({@link Drift#withCovariates}): the covariates known at the data locations
 * (for example the distance to a major road) must also be known at each predicted cell, typically
 * from a raster aligned with the grid.
 *
 * <p>Cells are addressed like the grid's: column c has centre x(c), row r has centre y(r), and row
 * 0 is the row of the smallest y (a north-up raster whose first row is the northernmost must be
 * flipped). Values are read when the cell is predicted; a value that is not finite fails the
 * prediction with an {@link IllegalArgumentException} naming the cell and the covariate.
 *
 * <p>Immutable; layers are copied. The function form must be thread-safe (cells are read from
 * worker threads).
 */
public final class CovariateGrid {
    /** Covariate values by cell. */
    @FunctionalInterface
    public interface CellFunction {
        /**
         * The value of covariate j at cell (column, row).
         *
         * @param column the grid column
         * @param row    the grid row (0 at the smallest y)
         * @param j      the covariate index, in the order of the drift's covariate columns
         */
        double value(int column, int row, int j);
    }

    private final int columns;
    private final int rows;
    private final int count;
    private final double[][] layers;
    private final CellFunction function;

    private CovariateGrid(int columns, int rows, int count, double[][] layers, CellFunction function) {
        this.columns = columns;
        this.rows = rows;
        this.count = count;
        this.layers = layers;
        this.function = function;
    }

    /**
     * Covariates from row-major layers aligned with the grid: layer j holds covariate j, value of
     * cell (c, r) at index r · columns + c (copied).
     *
     * @throws IllegalArgumentException if there is no layer, a layer has the wrong length, or the
     *                                  sizes are not positive
     */
    public static CovariateGrid ofLayers(int columns, int rows, double[]... layers) {
        Objects.requireNonNull(layers, "layers");
        checkSize(columns, rows);
        if (layers.length == 0) {
            throw new IllegalArgumentException("at least one covariate layer is needed");
        }
        long cells = (long) columns * rows;
        double[][] copy = new double[layers.length][];
        for (int j = 0; j < layers.length; j++) {
            if (layers[j] == null || layers[j].length != cells) {
                throw new IllegalArgumentException("covariate layer " + j + " must hold " + cells + " values ("
                        + columns + " columns x " + rows + " rows, row-major), got "
                        + (layers[j] == null ? "null" : layers[j].length));
            }
            copy[j] = layers[j].clone();
        }
        return new CovariateGrid(columns, rows, layers.length, copy, null);
    }

    /**
     * Covariates computed per cell by a function (for example a distance to a line, or a lookup in
     * a caller's raster).
     *
     * @param count number of covariates, ≥ 1
     */
    public static CovariateGrid of(int columns, int rows, int count, CellFunction function) {
        Objects.requireNonNull(function, "function");
        checkSize(columns, rows);
        if (count < 1) {
            throw new IllegalArgumentException("covariate count must be >= 1, got " + count);
        }
        return new CovariateGrid(columns, rows, count, null, function);
    }

    private static void checkSize(int columns, int rows) {
        if (columns < 1 || rows < 1) {
            throw new IllegalArgumentException("a covariate grid needs at least 1 x 1 cells, got " + columns + " x "
                    + rows);
        }
    }

    /** Number of columns. */
    public int columns() {
        return columns;
    }

    /** Number of rows. */
    public int rows() {
        return rows;
    }

    /** Number of covariates. */
    public int count() {
        return count;
    }

    /** Checks that this grid matches the prediction grid and the drift. */
    void requireMatches(Grid grid, int drifts) {
        if (grid.columns() != columns || grid.rows() != rows) {
            throw new IllegalArgumentException("the covariate grid has " + columns + " x " + rows + " cells but the"
                    + " prediction grid has " + grid.columns() + " x " + grid.rows());
        }
        if (drifts != count) {
            throw new IllegalArgumentException("the covariate grid has " + count + " covariate(s) but the drift has "
                    + drifts);
        }
    }

    /** The covariates of cell (column, row) into out[0..count). */
    void values(int column, int row, double[] out) {
        for (int j = 0; j < count; j++) {
            double v = layers != null ? layers[j][row * columns + column] : function.value(column, row, j);
            if (!Double.isFinite(v)) {
                throw new IllegalArgumentException("drift covariate " + j + " at grid cell (column " + column
                        + ", row " + row + ") is not finite: " + v);
            }
            out[j] = v;
        }
    }

    @Override
    public String toString() {
        return "CovariateGrid[" + columns + " x " + rows + ", " + count + " covariate(s)]";
    }
}
