package io.densa.spatial.kriging;

import io.densa.core.ProgressListener;
import java.util.ArrayList;
import java.util.Collections;
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
 */
public final class GridOptions {
    private final int tileSize;
    private final boolean variance;
    private final double[] thresholds;
    private final double[] probabilities;
    private final boolean means;
    private final List<ToDoubleFunction<double[]>> functions;
    private final boolean parallel;
    private final ProgressListener listener;
    private final boolean nearest;

    private GridOptions(int tileSize, boolean variance, double[] thresholds, double[] probabilities, boolean means,
            List<ToDoubleFunction<double[]>> functions, boolean parallel, ProgressListener listener) {
        this(tileSize, variance, thresholds, probabilities, means, functions, parallel, listener, false);
    }

    private GridOptions(int tileSize, boolean variance, double[] thresholds, double[] probabilities, boolean means,
            List<ToDoubleFunction<double[]>> functions, boolean parallel, ProgressListener listener, boolean nearest) {
        this.nearest = nearest;
        this.tileSize = tileSize;
        this.variance = variance;
        this.thresholds = thresholds;
        this.probabilities = probabilities;
        this.means = means;
        this.functions = functions;
        this.parallel = parallel;
        this.listener = listener;
    }

    /** The defaults described above. */
    public static GridOptions withDefaults() {
        return new GridOptions(64, true, new double[0], new double[0], false, List.of(), true, ProgressListener.NONE);
    }

    /** Tile edge in cells (tiles are tileSize × tileSize), in [1, 1024]. */
    public GridOptions withTileSize(int cells) {
        if (cells < 1 || cells > 1024) {
            throw new IllegalArgumentException("tile size must be in [1, 1024], got " + cells);
        }
        return new GridOptions(cells, variance, thresholds, probabilities, means, functions, parallel, listener, nearest);
    }

    /** Whether to compute the kriging variance per cell. */
    public GridOptions withVariance(boolean v) {
        return new GridOptions(tileSize, v, thresholds, probabilities, means, functions, parallel, listener, nearest);
    }

    /** Tail probabilities P(X &gt; t) per cell for each threshold t (finite). */
    public GridOptions withTailProbabilities(double... t) {
        Objects.requireNonNull(t, "thresholds");
        for (int i = 0; i < t.length; i++) {
            if (!Double.isFinite(t[i])) {
                throw new IllegalArgumentException("threshold " + i + " is not finite: " + t[i]);
            }
        }
        return new GridOptions(tileSize, variance, t.clone(), probabilities, means, functions, parallel, listener, nearest);
    }

    /** Quantiles per cell for each probability in (0, 1). */
    public GridOptions withQuantiles(double... probs) {
        Objects.requireNonNull(probs, "probabilities");
        for (int i = 0; i < probs.length; i++) {
            if (!(probs[i] > 0 && probs[i] < 1)) {
                throw new IllegalArgumentException("quantile probability " + i + " must be in (0, 1), got " + probs[i]);
            }
        }
        return new GridOptions(tileSize, variance, thresholds, probs.clone(), means, functions, parallel, listener, nearest);
    }

    /** Whether to compute the mean E[X] of each predicted density. */
    public GridOptions withMeans(boolean m) {
        return new GridOptions(tileSize, variance, thresholds, probabilities, m, functions, parallel, listener, nearest);
    }

    /**
     * Adds a caller function of the predicted coordinates (K values, a scratch array the function
     * must not keep); it is called from worker threads and must be thread-safe.
     */
    public GridOptions withCellFunction(ToDoubleFunction<double[]> f) {
        Objects.requireNonNull(f, "function");
        List<ToDoubleFunction<double[]>> l = new ArrayList<>(functions);
        l.add(f);
        return new GridOptions(tileSize, variance, thresholds, probabilities, means, Collections.unmodifiableList(l),
                parallel, listener, nearest);
    }

    /** Whether tiles are computed on the common ForkJoin pool (results are identical either way). */
    public GridOptions withParallel(boolean p) {
        return new GridOptions(tileSize, variance, thresholds, probabilities, means, functions, p, listener, nearest);
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
                Objects.requireNonNull(l, "listener"), nearest);
    }

    /**
     * Whether to report, per cell, the distance to the nearest data location
     * ({@link GridTile#nearestDistances()}), in the locations' units: cells far from every station
     * are extrapolations. The distances are a by-product of the prediction (no extra search).
     */
    public GridOptions withNearestDistances(boolean n) {
        return new GridOptions(tileSize, variance, thresholds, probabilities, means, functions, parallel, listener, n);
    }

    boolean nearestDistances() {
        return nearest;
    }

    int tileSize() {
        return tileSize;
    }

    boolean variance() {
        return variance;
    }

    double[] thresholds() {
        return thresholds;
    }

    double[] probabilities() {
        return probabilities;
    }

    boolean means() {
        return means;
    }

    List<ToDoubleFunction<double[]>> functions() {
        return functions;
    }

    boolean parallel() {
        return parallel;
    }

    ProgressListener listener() {
        return listener;
    }

    @Override
    public String toString() {
        return "GridOptions[tileSize=" + tileSize + ", variance=" + variance + ", thresholds="
                + java.util.Arrays.toString(thresholds) + ", probabilities=" + java.util.Arrays.toString(probabilities)
                + ", means=" + means + ", functions=" + functions.size() + ", nearestDistances=" + nearest
                + ", parallel=" + parallel + "]";
    }
}
