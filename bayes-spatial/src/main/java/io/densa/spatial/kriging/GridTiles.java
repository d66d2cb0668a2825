package io.densa.spatial.kriging;

import java.util.Objects;
import java.util.function.Consumer;
import java.util.function.Function;

/**
 * Grid prediction of a range of tiles, for splitting {@link Kriging#predictGrid} over threads,
 * processes or machines: the tiles of a grid are numbered row-major, tile t at tile column
 * t mod {@link #tilesAcross} and tile row t / tilesAcross, and {@link #predict} delivers tiles
 * [from, to) exactly as {@code predictGrid} delivers them (the same code computes each tile, and a
 * tile does not depend on which other tiles are computed), so the union of disjoint ranges is the
 * whole grid, cell for cell and bit for bit.
 *
 * <p>Stateless; the kriging is shared read-only (it is safe to share between threads).
 */
public final class GridTiles {
    private GridTiles() {
    }

    /** Number of tiles of the grid with the options' tile size s: ⌈columns / s⌉ × ⌈rows / s⌉. */
    public static int tileCount(Grid grid, GridOptions options) {
        Objects.requireNonNull(options, "options");
        return GridPredictor.tileCount(grid, options);
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
        GridPredictor.runRange(kriging, grid, options, from, to, consumer);
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
        GridPredictor.run(kriging, grid, options, covariates, work, consumer);
    }
}
