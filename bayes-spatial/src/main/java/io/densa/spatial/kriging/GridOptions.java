package io.densa.spatial.kriging;

import io.densa.core.ProgressListener;
import io.densa.core.internal.RecordArrays;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import java.util.function.ToDoubleFunction;

/**
 * Immutable options of grid prediction: tile size, whether to compute the kriging variance, and
 * the per-cell quantities derived in the same pass from each predicted density — tail
 * probabilities P(X &gt; t), quantiles, means (computed with the space's quadrature through
 * {@link io.densa.core.DensitySet} batches of one tile) and caller functions of the predicted
 * coordinates.
 *
 * <p>Defaults: tiles of 64 × 64 cells, variance on, no derived quantities, no nearest-station
 * distances, parallel, no progress reports ({@link ProgressListener#NONE}).
 *
 * <p>A record: the canonical constructor checks every component (as the with-methods do) and copies
 * the arrays and the list; the array accessors return copies.
 *
 * @param tileSize         tile edge in cells, in [1, 1024]
 * @param variance         whether to compute the kriging variance per cell
 * @param thresholds       thresholds t of the tail probabilities P(X &gt; t) per cell (finite)
 * @param probabilities    probabilities in (0, 1) of the quantiles per cell
 * @param means            whether to compute the mean of each predicted density
 * @param functions        caller functions of the predicted coordinates (thread-safe)
 * @param parallel         whether tiles are computed on the common ForkJoin pool
 * @param listener         the progress listener
 * @param nearestDistances whether to report each cell's distance to the nearest data location
 */
public record GridOptions(int tileSize, boolean variance, double[] thresholds, double[] probabilities, boolean means,
        List<ToDoubleFunction<double[]>> functions, boolean parallel, ProgressListener listener,
        boolean nearestDistances) {

    /** Checks every component and copies the arrays and the list (the caller keeps its own). */
    public GridOptions {
        if (tileSize < 1 || tileSize > 1024) {
            throw new IllegalArgumentException("tile size must be in [1, 1024], got " + tileSize);
        }
        Objects.requireNonNull(thresholds, "thresholds");
        for (int i = 0; i < thresholds.length; i++) {
            if (!Double.isFinite(thresholds[i])) {
                throw new IllegalArgumentException("threshold " + i + " is not finite: " + thresholds[i]);
            }
        }
        Objects.requireNonNull(probabilities, "probabilities");
        for (int i = 0; i < probabilities.length; i++) {
            if (!(probabilities[i] > 0 && probabilities[i] < 1)) {
                throw new IllegalArgumentException("quantile probability " + i + " must be in (0, 1), got "
                        + probabilities[i]);
            }
        }
        thresholds = thresholds.clone();
        probabilities = probabilities.clone();
        functions = List.copyOf(Objects.requireNonNull(functions, "functions"));
        Objects.requireNonNull(listener, "listener");
    }

    /** The defaults described above. */
    public static GridOptions withDefaults() {
        return new GridOptions(64, true, new double[0], new double[0], false, List.of(), true, ProgressListener.NONE,
                false);
    }

    /** Tile edge in cells (tiles are tileSize × tileSize), in [1, 1024]. */
    public GridOptions withTileSize(int cells) {
        return new GridOptions(cells, variance, thresholds, probabilities, means, functions, parallel, listener,
                nearestDistances);
    }

    /** Whether to compute the kriging variance per cell. */
    public GridOptions withVariance(boolean v) {
        return new GridOptions(tileSize, v, thresholds, probabilities, means, functions, parallel, listener,
                nearestDistances);
    }

    /** Tail probabilities P(X &gt; t) per cell for each threshold t (finite). */
    public GridOptions withTailProbabilities(double... t) {
        return new GridOptions(tileSize, variance, t, probabilities, means, functions, parallel, listener,
                nearestDistances);
    }

    /** Quantiles per cell for each probability in (0, 1). */
    public GridOptions withQuantiles(double... probs) {
        return new GridOptions(tileSize, variance, thresholds, probs, means, functions, parallel, listener,
                nearestDistances);
    }

    /** Whether to compute the mean E[X] of each predicted density. */
    public GridOptions withMeans(boolean m) {
        return new GridOptions(tileSize, variance, thresholds, probabilities, m, functions, parallel, listener,
                nearestDistances);
    }

    /**
     * Adds a caller function of the predicted coordinates (K values, a scratch array the function
     * must not keep); it is called from worker threads and must be thread-safe.
     */
    public GridOptions withCellFunction(ToDoubleFunction<double[]> f) {
        Objects.requireNonNull(f, "function");
        List<ToDoubleFunction<double[]>> l = new ArrayList<>(functions);
        l.add(f);
        return new GridOptions(tileSize, variance, thresholds, probabilities, means, l, parallel, listener,
                nearestDistances);
    }

    /** Whether tiles are computed on the common ForkJoin pool (results are identical either way). */
    public GridOptions withParallel(boolean p) {
        return new GridOptions(tileSize, variance, thresholds, probabilities, means, functions, p, listener,
                nearestDistances);
    }

    /**
     * With a listener that receives the progress of grid prediction: task {@code "grid tiles"},
     * done = tiles delivered so far (empty and masked-out tiles included), total = tiles in the grid.
     * It is called from the thread that called predictGrid, after each batch of 16 tiles (a fixed
     * number, whatever the machine) and once at the end, after the consumer has received the tiles
     * counted. The listener does not change any result.
     *
     * @param l a listener, or {@link ProgressListener#NONE}
     */
    public GridOptions withProgressListener(ProgressListener l) {
        return new GridOptions(tileSize, variance, thresholds, probabilities, means, functions, parallel,
                Objects.requireNonNull(l, "listener"), nearestDistances);
    }

    /**
     * Whether to report, per cell, the distance to the nearest data location
     * ({@link GridTile#nearestDistances()}), in the locations' units: cells far from every station
     * are extrapolations. The distances are a by-product of the prediction (no extra search).
     */
    public GridOptions withNearestDistances(boolean n) {
        return new GridOptions(tileSize, variance, thresholds, probabilities, means, functions, parallel, listener, n);
    }

    /** The thresholds of the tail probabilities (a copy). */
    @Override
    public double[] thresholds() {
        return thresholds.clone();
    }

    /** The probabilities of the quantiles (a copy). */
    @Override
    public double[] probabilities() {
        return probabilities.clone();
    }

    /** Equality by content of every component (arrays element by element). */
    @Override
    public boolean equals(Object o) {
        return RecordArrays.equal(this, o);
    }

    /** Hash of the content of every component. */
    @Override
    public int hashCode() {
        return RecordArrays.hash(this);
    }

    @Override
    public String toString() {
        return "GridOptions[tileSize=" + tileSize + ", variance=" + variance + ", thresholds="
                + java.util.Arrays.toString(thresholds) + ", probabilities=" + java.util.Arrays.toString(probabilities)
                + ", means=" + means + ", functions=" + functions.size() + ", nearestDistances=" + nearestDistances
                + ", parallel=" + parallel + "]";
    }
}
