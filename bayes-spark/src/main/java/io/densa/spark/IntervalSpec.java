package io.densa.spark;

import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.uncertainty.PredictiveDistribution;
import io.densa.spatial.uncertainty.UncertaintyOptions;
import java.io.Serializable;
import java.util.Objects;

/**
 * Interval maps for {@link SparkKriging}: the Monte Carlo settings of
 * {@link PredictiveDistribution#summariseTiles} as numbers to broadcast — the seed, the number of
 * draws, the central level and, optionally, the coordinate covariance whose shape the draws use
 * (by default estimated from the kriging data's drift residuals, as
 * {@link PredictiveDistribution#of(Kriging)}). The quantities are those of the {@link GridSpec}: its
 * quantiles, tail probabilities and means, each with a lower and an upper end per cell. A cell's draws
 * depend only on its column and row, so the intervals are bit for bit those of
 * {@link PredictiveDistribution#summariseGrid} on one machine, however the tiles are spread over
 * tasks. Results are in the space's units (an increasing transform such as {@code exp} of a log
 * concentration maps the quantiles and their ends exactly; apply it to the columns).
 *
 * <p>Defaults: 200 draws, 90 % central intervals. Immutable.
 */
public final class IntervalSpec implements Serializable {
    private static final long serialVersionUID = 1L;

    private final long seed;
    private final int draws;
    private final double level;
    private final double[][] covariance;

    private IntervalSpec(long seed, int draws, double level, double[][] covariance) {
        this.seed = seed;
        this.draws = draws;
        this.level = level;
        this.covariance = covariance;
        UncertaintyOptions.withSeed(seed).withDraws(draws).withLevel(level); // Densa's checks, on the driver
    }

    /** 200 draws from the seed, 90 % central intervals, the covariance shape from the data. */
    public static IntervalSpec withSeed(long seed) {
        return new IntervalSpec(seed, 200, 0.90, null);
    }

    /** See {@link UncertaintyOptions#withDraws}. */
    public IntervalSpec withDraws(int count) {
        return new IntervalSpec(seed, count, level, covariance);
    }

    /** See {@link UncertaintyOptions#withLevel}. */
    public IntervalSpec withLevel(double central) {
        return new IntervalSpec(seed, draws, central, covariance);
    }

    /**
     * Draws with the shape of this coordinate covariance (K × K; only Σ/tr Σ is used; checked against
     * the kriging by {@link PredictiveDistribution#of(Kriging, double[][])} when the job starts).
     */
    public IntervalSpec withCovariance(double[][] sigma) {
        Objects.requireNonNull(sigma, "covariance");
        double[][] copy = new double[sigma.length][];
        for (int i = 0; i < sigma.length; i++) {
            copy[i] = Objects.requireNonNull(sigma[i], "covariance row " + i).clone();
        }
        return new IntervalSpec(seed, draws, level, copy);
    }

    /** The seed. */
    public long seed() {
        return seed;
    }

    /** The number of draws per cell. */
    public int draws() {
        return draws;
    }

    /** The central level of the intervals. */
    public double level() {
        return level;
    }

    /**
     * The options for the grid's quantities (not parallel: Spark runs the tiles in parallel).
     *
     * @throws IllegalArgumentException if the grid spec asks for no quantile, tail probability or mean
     */
    UncertaintyOptions options(GridSpec grid) {
        if (grid.probabilities().length == 0 && grid.thresholds().length == 0 && !grid.means()) {
            throw new IllegalArgumentException("intervals need a quantity: ask the grid spec for quantiles, tail"
                    + " probabilities or means");
        }
        return UncertaintyOptions.withSeed(seed).withDraws(draws).withLevel(level)
                .withQuantiles(grid.probabilities()).withExceedances(grid.thresholds()).withMean(grid.means())
                .withParallel(false);
    }

    /** The predictive distribution of the kriging with this spec's covariance shape. */
    PredictiveDistribution predictive(Kriging kriging) {
        return covariance == null ? PredictiveDistribution.of(kriging) : PredictiveDistribution.of(kriging, covariance);
    }

    @Override
    public String toString() {
        return "IntervalSpec[seed " + seed + ", " + draws + " draws, level " + level
                + (covariance == null ? ", shape from the data" : ", given covariance") + "]";
    }
}
