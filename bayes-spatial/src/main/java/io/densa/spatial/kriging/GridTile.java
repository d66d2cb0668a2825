package io.densa.spatial.kriging;

import io.densa.core.DensitySet;

/**
 * One predicted tile of a {@link Grid}: the cells of the tile that lie inside the mask, in row-major
 * order within the tile, with their predictions and per-cell quantities.
 *
 * <p><b>A per-tile buffer, not a copied value.</b> Unlike the other result records, a tile does not
 * copy its arrays (a grid delivers millions of cells, and copying each tile's arrays in and out
 * would double the memory traffic of prediction): the accessors return the record's own arrays.
 * They are freshly allocated for each tile and never touched by the library after the tile is
 * passed to the consumer, so they belong to the consumer, who may keep, modify or reuse them;
 * code that shares a tile with others must copy what it needs first. For the same reason
 * {@code equals} and {@code hashCode} are the record defaults (array components by reference).
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
 * @param nearestDistances  distance from each cell to the nearest data location (locations' units),
 *                          or null if not requested ({@link GridOptions#withNearestDistances})
 */
public record GridTile(int tileColumn, int tileRow, int[] columns, int[] rows, DensitySet predictions,
        double[] variances, double[][] tailProbabilities, double[][] quantiles, double[] means,
        double[][] cellValues, double[] nearestDistances) {
    /** Number of cells in the tile (after masking). */
    public int size() {
        return columns.length;
    }

    /** Tile position, cell count and which per-cell quantities it holds (not the arrays). */
    @Override
    public String toString() {
        return "GridTile[tile (" + tileColumn + ", " + tileRow + "), " + columns.length + " cells, K="
                + predictions.dimension() + (variances != null ? ", variances" : "") + ", " + tailProbabilities.length
                + " tail probabilities, " + quantiles.length + " quantiles" + (means != null ? ", means" : "")
                + (cellValues.length > 0 ? ", " + cellValues.length + " cell functions" : "")
                + (nearestDistances != null ? ", nearest distances" : "") + "]";
    }
}
