package io.densa.spatial;

import io.densa.core.DensitySet;

/**
 * One predicted tile of a {@link Grid}: the cells of the tile that lie inside the mask, in row-major
 * order within the tile, with their predictions and per-cell quantities. Arrays are owned by the
 * record (fresh for each tile).
 *
 * @param tileColumn        tile column index
 * @param tileRow           tile row index
 * @param columns           grid column of each cell
 * @param rows              grid row of each cell
 * @param predictions       the predicted densities, one per cell
 * @param variances         kriging variance per cell, or null if not requested
 * @param tailProbabilities [threshold][cell] P(X &gt; t), in the order the thresholds were given
 * @param quantiles         [probability][cell] quantiles, in the order given
 * @param means             E[X] per cell, or null if not requested
 * @param cellValues        [function][cell] values of the caller functions, in the order added
 */
public record GridTile(int tileColumn, int tileRow, int[] columns, int[] rows, DensitySet predictions,
        double[] variances, double[][] tailProbabilities, double[][] quantiles, double[] means,
        double[][] cellValues) {
    /** Number of cells in the tile (after masking). */
    public int size() {
        return columns.length;
    }
}
