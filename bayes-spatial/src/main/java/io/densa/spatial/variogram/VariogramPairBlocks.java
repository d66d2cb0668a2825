package io.densa.spatial.variogram;

import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import java.util.List;
import java.util.Objects;

/**
 * The empirical trace-semivariogram ({@link EmpiricalVariogram}) split into independent blocks of
 * location pairs, for computing the blocks in other threads, processes or machines and merging their
 * partial sums: block b holds the pairs (i, j), j &gt; i, with i in [64b, 64b + 64), and its
 * {@link BlockSums} are the per-bin totals of squared B2 distances, lags and pair counts before
 * bins are merged. {@link #merge} adds the totals in block order and finishes exactly as
 * {@link EmpiricalVariogram#of} does (it runs the same code), so the result is bit-identical to
 * the single-call estimate for the same locations, densities and options, whichever order the
 * blocks were computed in.
 *
 * <p>Preparation (centring and scaling the coordinates, resolving the bins) is deterministic: two
 * instances built from equal inputs compute bit-identical block sums, so a worker may build its
 * own instance from the same arrays instead of receiving this one.
 *
 * <p>The variogram cloud ({@link VariogramOptions#withCloud}) is not available through blocks.
 * Immutable after construction; {@link #block} may be called from several threads.
 */
public final class VariogramPairBlocks {
    private final Locations locations;
    private final VariogramOptions options;
    private final EmpiricalVariogram.Prepared prepared;

    private VariogramPairBlocks(Locations locations, VariogramOptions options, EmpiricalVariogram.Prepared prepared) {
        this.locations = locations;
        this.options = options;
        this.prepared = prepared;
    }

    /**
     * Prepares the blocks of the variogram of the densities at the locations.
     *
     * @throws IllegalArgumentException as {@link EmpiricalVariogram#of}, or if the options ask for a
     *                                  variogram cloud
     */
    public static VariogramPairBlocks of(Locations locations, DensitySet densities, VariogramOptions options) {
        Objects.requireNonNull(locations, "locations");
        Objects.requireNonNull(densities, "densities");
        Objects.requireNonNull(options, "options");
        EmpiricalVariogram.checkSizes(locations, densities);
        if (options.cloudPairs() > 0) {
            throw new IllegalArgumentException("the variogram cloud is not computed by pair blocks; estimate it with"
                    + " EmpiricalVariogram.of on a sample of the locations, or drop VariogramOptions.withCloud");
        }
        return new VariogramPairBlocks(locations, options,
                EmpiricalVariogram.prepare(locations, densities.coordinatesRowMajor(), densities.dimension(), options));
    }

    /** Number of blocks: ⌈n / 64⌉ for n locations. */
    public int blockCount() {
        return prepared.tiles();
    }

    /** Number of locations. */
    public int size() {
        return prepared.n();
    }

    /**
     * Entries of each block's arrays: sectors × bins, bins before merging (sector-major).
     */
    public int binSlots() {
        return prepared.stride();
    }

    /**
     * Pairs in block b: Σ_{i in block} (n − 1 − i), the work of the block (before the maximum-lag
     * filter), for balancing blocks over workers.
     */
    public long pairCount(int block) {
        checkBlock(block);
        int n = prepared.n();
        long s = 0;
        int i1 = Math.min(n, (block + 1) * EmpiricalVariogram.TILE_LOCATIONS);
        for (int i = block * EmpiricalVariogram.TILE_LOCATIONS; i < i1; i++) {
            s += n - 1 - i;
        }
        return s;
    }

    /** Computes the totals of block b (fresh arrays). */
    public BlockSums block(int block) {
        checkBlock(block);
        VariogramPass.TileSums t = prepared.tile(block);
        int m = prepared.stride();
        return new BlockSums(block, java.util.Arrays.copyOf(t.gamma(), m), java.util.Arrays.copyOf(t.lag(), m),
                java.util.Arrays.copyOf(t.count(), m));
    }

    /**
     * Merges the totals of every block, given in any order, each block exactly once, into the
     * variogram: totals are added in block order, sparse bins merged and γ̂ scaled back, as
     * {@link EmpiricalVariogram#of}.
     *
     * @throws IllegalArgumentException if a block is missing, repeated, out of range or has arrays of
     *                                  the wrong length, or as {@link EmpiricalVariogram#of} (no pair
     *                                  within the lags, overflow)
     */
    public EmpiricalVariogram merge(List<BlockSums> sums) {
        Objects.requireNonNull(sums, "sums");
        int tiles = prepared.tiles();
        int m = prepared.stride();
        double[][] pg = new double[tiles][];
        double[][] ph = new double[tiles][];
        long[][] pc = new long[tiles][];
        for (BlockSums s : sums) {
            Objects.requireNonNull(s, "block sums");
            int b = s.block();
            if (b < 0 || b >= tiles) {
                throw new IllegalArgumentException("block " + b + " outside [0, " + tiles + ")");
            }
            if (pg[b] != null) {
                throw new IllegalArgumentException("block " + b + " is given twice");
            }
            if (s.squaredDistances().length != m || s.lags().length != m || s.counts().length != m) {
                throw new IllegalArgumentException("block " + b + " has arrays of length " + s.squaredDistances().length
                        + ", " + s.lags().length + ", " + s.counts().length + "; " + m + " (sectors x bins) expected");
            }
            pg[b] = s.squaredDistances();
            ph[b] = s.lags();
            pc[b] = s.counts();
        }
        for (int b = 0; b < tiles; b++) {
            if (pg[b] == null) {
                throw new IllegalArgumentException("block " + b + " of " + tiles + " is missing");
            }
        }
        return EmpiricalVariogram.finish(prepared, options, pg, ph, pc, locations);
    }

    private void checkBlock(int block) {
        if (block < 0 || block >= prepared.tiles()) {
            throw new IllegalArgumentException("block " + block + " outside [0, " + prepared.tiles() + ")");
        }
    }

    /**
     * Totals of one block, per bin slot (sector-major, bins before merging), in the scaled coordinates
     * the estimation works in (see {@link EmpiricalVariogram}); only {@link #merge} interprets them.
     * The arrays are the record's own (not copied).
     *
     * @param block            block index
     * @param squaredDistances sums of scaled squared B2 distances per slot
     * @param lags             sums of lags per slot
     * @param counts           pair counts per slot
     */
    public record BlockSums(int block, double[] squaredDistances, double[] lags, long[] counts) {
        /** Checks that no array is null. */
        public BlockSums {
            Objects.requireNonNull(squaredDistances, "squaredDistances");
            Objects.requireNonNull(lags, "lags");
            Objects.requireNonNull(counts, "counts");
        }
    }

    @Override
    public String toString() {
        return "VariogramPairBlocks[" + prepared.n() + " locations, " + prepared.tiles() + " blocks]";
    }
}
