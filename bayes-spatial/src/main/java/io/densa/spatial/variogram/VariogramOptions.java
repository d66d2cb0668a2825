package io.densa.spatial.variogram;

import io.densa.core.ProgressListener;
import java.util.Arrays;
import java.util.Objects;

/**
 * Immutable options of the empirical trace-variogram: distance bins (a count, a width or explicit
 * edges), maximum lag, optional direction sectors, optional variogram cloud, parallelism.
 *
 * <p>Defaults: 15 equal bins up to half the diagonal of the locations' bounding box (a common
 * practice rule of thumb), merged where they hold too few pairs (below), omnidirectional, no
 * cloud, parallel, no progress reports ({@link ProgressListener#NONE}).
 *
 * <p><b>Pairs per bin.</b> A bin's γ̂ is a mean over its pairs, and a bin with a handful of pairs
 * is mostly noise (an empty one has no value at all). After the pairs are counted, adjacent bins
 * are therefore merged, scanning from the shortest lags: a merged bin closes as soon as it holds
 * at least m pairs, and a remainder at the long-lag end joins the last closed bin. With the
 * default binning m = min(30, max(1, ⌊P/8⌋)) where P is the number of pairs within the maximum
 * lag: at least 30 pairs per bin (the usual rule of thumb, common practice; often attributed to
 * Journel &amp; Huijbregts (1978), Mining Geostatistics, Academic Press — from memory), lowered
 * for small networks so that about eight bins remain (12 stations give about 45 pairs within half
 * the diagonal, which 30-pair bins would reduce to one), and halved, down to 1, while fewer than
 * four bins would remain of at least four non-empty ones (a model with a nugget has three
 * parameters to fit; clustered locations put most pairs in few bins). With explicit bins (a count, a width or
 * edges) m = 1: only empty bins are merged into a neighbour, which changes no γ̂, mean lag or
 * count. {@link #withMinimumPairs} sets m for any binning. So no bin of a result is empty and no
 * NaN reaches it; the merged edges are those the result reports (per sector with directions).
 *
 * <p>Directions are angles in degrees measured counter-clockwise from the first coordinate axis,
 * taken modulo 180° (a pair and its reverse are the same pair); a pair belongs to a sector when the
 * angle between its separation vector and the sector direction is at most the tolerance.
 * Directions are only defined for planar locations.
 */
public final class VariogramOptions {
    private final int binCount;
    private final double binWidth;
    private final double[] edges;
    private final double maxLag;
    private final double[] directions;
    private final double tolerance;
    private final int cloudPairs;
    private final boolean parallel;
    private final ProgressListener progress;
    private final boolean defaultBins;
    private final int minPairs; // 0: automatic

    private VariogramOptions(int binCount, double binWidth, double[] edges, double maxLag, double[] directions,
            double tolerance, int cloudPairs, boolean parallel, ProgressListener progress, boolean defaultBins,
            int minPairs) {
        this.defaultBins = defaultBins;
        this.minPairs = minPairs;
        this.binCount = binCount;
        this.binWidth = binWidth;
        this.edges = edges;
        this.maxLag = maxLag;
        this.directions = directions;
        this.tolerance = tolerance;
        this.cloudPairs = cloudPairs;
        this.parallel = parallel;
        this.progress = progress;
    }

    /** The defaults described above. */
    public static VariogramOptions withDefaults() {
        return new VariogramOptions(15, Double.NaN, null, Double.NaN, null, Double.NaN, 0, true, ProgressListener.NONE,
                true, 0);
    }

    /** The default pairs-per-bin target (common practice; see the class comment). */
    static final int DEFAULT_MIN_PAIRS = 30;

    /** With the default binning, at least this many bins are kept when pairs are few. */
    static final int SMALL_NETWORK_BINS = 8;

    /**
     * Merge adjacent bins until each holds at least this many pairs (see the class comment); 1
     * merges only empty bins.
     *
     * @throws IllegalArgumentException unless count ≥ 1
     */
    public VariogramOptions withMinimumPairs(int count) {
        if (count < 1) {
            throw new IllegalArgumentException("minimum pairs per bin must be >= 1, got " + count);
        }
        return new VariogramOptions(binCount, binWidth, edges, maxLag, directions, tolerance, cloudPairs, parallel,
                progress, defaultBins, count);
    }

    /** With the automatic minimum, m is halved while fewer bins than this would remain. */
    static final int FEWEST_BINS = 4;

    /** Whether m is the automatic one (default binning, no {@link #withMinimumPairs}). */
    boolean automaticMinimumPairs() {
        return minPairs == 0 && defaultBins;
    }

    /** The pairs-per-bin minimum m for a sector with the given number of pairs within the maximum lag. */
    long minimumPairs(long pairs) {
        if (minPairs > 0) {
            return minPairs;
        }
        return defaultBins ? Math.min(DEFAULT_MIN_PAIRS, Math.max(1, pairs / SMALL_NETWORK_BINS)) : 1;
    }

    /** Equal-width bins of this number between 0 and the maximum lag. */
    public VariogramOptions withBinCount(int count) {
        if (count < 1 || count > 100_000) {
            throw new IllegalArgumentException("bin count must be in [1, 100000], got " + count);
        }
        return new VariogramOptions(count, Double.NaN, null, maxLag, directions, tolerance, cloudPairs, parallel,
                progress, false, minPairs);
    }

    /** Equal-width bins of this width between 0 and the maximum lag. */
    public VariogramOptions withBinWidth(double width) {
        if (!(width > 0) || Double.isInfinite(width)) {
            throw new IllegalArgumentException("bin width must be finite and > 0, got " + width);
        }
        return new VariogramOptions(0, width, null, maxLag, directions, tolerance, cloudPairs, parallel,
                progress, false, minPairs);
    }

    /**
     * Explicit bin edges e_0 &lt; e_1 &lt; … &lt; e_B (at least two, e_0 ≥ 0); bin b holds lags in
     * (e_b, e_{b+1}] (the first bin also holds lag e_0); the maximum lag becomes e_B.
     */
    public VariogramOptions withEdges(double... binEdges) {
        if (binEdges == null || binEdges.length < 2) {
            throw new IllegalArgumentException("need at least two bin edges");
        }
        for (int i = 0; i < binEdges.length; i++) {
            if (!Double.isFinite(binEdges[i]) || binEdges[i] < 0 || (i > 0 && !(binEdges[i] > binEdges[i - 1]))) {
                throw new IllegalArgumentException("bin edges must be finite, >= 0 and strictly increasing; edge " + i
                        + " = " + binEdges[i]);
            }
        }
        double[] e = binEdges.clone();
        return new VariogramOptions(0, Double.NaN, e, e[e.length - 1], directions, tolerance, cloudPairs, parallel,
                progress, false, minPairs);
    }

    /** Maximum lag (ignored with explicit edges). */
    public VariogramOptions withMaxLag(double lag) {
        if (!(lag > 0) || Double.isInfinite(lag)) {
            throw new IllegalArgumentException("maximum lag must be finite and > 0, got " + lag);
        }
        return new VariogramOptions(binCount, binWidth, edges, edges != null ? maxLag : lag, directions, tolerance,
                cloudPairs, parallel, progress, defaultBins, minPairs);
    }

    /**
     * Direction sectors: one variogram per direction (degrees, counter-clockwise from the first
     * axis), with angular tolerance in (0, 90] degrees.
     */
    public VariogramOptions withDirections(double toleranceDegrees, double... directionsDegrees) {
        if (!(toleranceDegrees > 0 && toleranceDegrees <= 90)) {
            throw new IllegalArgumentException("angular tolerance must be in (0, 90] degrees, got " + toleranceDegrees);
        }
        if (directionsDegrees == null || directionsDegrees.length == 0) {
            throw new IllegalArgumentException("need at least one direction");
        }
        for (int i = 0; i < directionsDegrees.length; i++) {
            if (!Double.isFinite(directionsDegrees[i])) {
                throw new IllegalArgumentException("direction " + i + " is not finite: " + directionsDegrees[i]);
            }
        }
        return new VariogramOptions(binCount, binWidth, edges, maxLag, directionsDegrees.clone(), toleranceDegrees,
                cloudPairs, parallel, progress, defaultBins, minPairs);
    }

    /** Also return the variogram cloud: the first maxPairs pairs within the maximum lag, in (i, j) order. */
    public VariogramOptions withCloud(int maxPairs) {
        if (maxPairs < 1) {
            throw new IllegalArgumentException("cloud pair limit must be >= 1, got " + maxPairs);
        }
        return new VariogramOptions(binCount, binWidth, edges, maxLag, directions, tolerance, maxPairs, parallel,
                progress, defaultBins, minPairs);
    }

    /** Whether to use the common ForkJoin pool (results are identical either way). */
    public VariogramOptions withParallel(boolean p) {
        return new VariogramOptions(binCount, binWidth, edges, maxLag, directions, tolerance, cloudPairs, p,
                progress, defaultBins, minPairs);
    }

    /**
     * With a listener that receives the progress of the estimation: task {@code "variogram tiles"},
     * done = tiles of 64 locations whose pairs are binned, total = number of such tiles. Calls may
     * come from worker threads (they are serialised, and done is non-decreasing). The listener does
     * not change any result.
     *
     * @param listener a thread-safe listener, or {@link ProgressListener#NONE}
     */
    public VariogramOptions withProgressListener(ProgressListener listener) {
        return new VariogramOptions(binCount, binWidth, edges, maxLag, directions, tolerance, cloudPairs, parallel,
                Objects.requireNonNull(listener, "listener"), defaultBins, minPairs);
    }

    /** The progress listener ({@link ProgressListener#NONE} by default). */
    public ProgressListener progressListener() {
        return progress;
    }

    /** Resolved bin edges for a given default maximum lag. */
    double[] resolveEdges(double defaultMaxLag) {
        if (edges != null) {
            return edges.clone();
        }
        double m = Double.isNaN(maxLag) ? defaultMaxLag : maxLag;
        if (!(m > 0)) {
            throw new IllegalArgumentException("maximum lag resolves to " + m + "; the locations may all coincide");
        }
        int b = binCount > 0 ? binCount : (int) Math.ceil(m / binWidth - 1e-12);
        if (b > 100_000) {
            throw new IllegalArgumentException("bin width " + binWidth + " gives " + b + " bins; at most 100000");
        }
        double w = binCount > 0 ? m / b : binWidth;
        double[] e = new double[b + 1];
        for (int i = 0; i <= b; i++) {
            e[i] = Math.min(m, i * w);
        }
        e[b] = m;
        return e;
    }

    /** Whether bins are of equal width starting at 0. */
    boolean uniformBins() {
        return edges == null;
    }

    /** The sector directions in degrees (a copy), or null for an omnidirectional variogram. */
    public double[] directions() {
        return directions == null ? null : directions.clone();
    }

    double tolerance() {
        return tolerance;
    }

    int cloudPairs() {
        return cloudPairs;
    }

    /** Whether pairs are computed in parallel. */
    public boolean parallel() {
        return parallel;
    }

    @Override
    public String toString() {
        return "VariogramOptions[bins=" + (edges != null ? Arrays.toString(edges) : binCount > 0 ? binCount
                : "width " + binWidth) + ", maxLag=" + maxLag + ", directions=" + Arrays.toString(directions) + ", minimumPairs="
                + (minPairs > 0 ? String.valueOf(minPairs) : defaultBins ? "automatic" : "1") + "]";
    }
}
