package io.densa.spatial.uncertainty;

import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.GridTile;
import java.util.List;

/**
 * One tile of {@link PredictiveDistribution#summariseGrid}: the kriged tile (predictions and
 * kriging variances per cell, plus whatever the {@link GridOptions} asked for) and, per
 * quantity, the cells' Monte Carlo summaries. A per-tile buffer like {@link GridTile}: arrays are
 * not copied, belong to the consumer, and equality is by reference.
 *
 * @param tile        the kriged tile
 * @param quantiles   one layer per quantile probability, in the order of the options
 * @param exceedances one layer per threshold, in the order of the options
 * @param mean        the layer of E[u(X)], or null when not requested
 * @param exactDraws  per cell, the draws evaluated exactly (see {@link LocationUncertainty#exactDraws()})
 */
public record UncertaintyTile(GridTile tile, List<IntervalLayer> quantiles, List<IntervalLayer> exceedances,
        IntervalLayer mean, int[] exactDraws) {

    /** Number of cells. */
    public int size() {
        return tile.size();
    }

    /** Tile position, cell count and layer counts (not the arrays). */
    @Override
    public String toString() {
        return "UncertaintyTile[tile (" + tile.tileColumn() + ", " + tile.tileRow() + "), " + size() + " cells, "
                + quantiles.size() + " quantile layers, " + exceedances.size() + " exceedance layers"
                + (mean != null ? ", mean" : "") + "]";
    }
}
