package io.densa.spatial.uncertainty;

import java.util.Objects;
import java.util.function.DoubleUnaryOperator;

/**
 * Immutable options of the Monte Carlo summaries of a {@link PredictiveDistribution}: the number of
 * draws, the seed, the level of the central intervals, the quantities summarised and how each
 * draw is evaluated.
 *
 * <p>Quantities, each summarised per location or grid cell by a {@link DerivedInterval}:
 * <ul>
 * <li>quantiles of X for probabilities in (0, 1) ({@link #withQuantiles}; 0.5 is the median, 0.99
 *     a high percentile of daily values);</li>
 * <li>exceedance probabilities P(X &gt; t) for thresholds t ({@link #withExceedances}); t is a
 *     value of the space's variable (for densities of a log concentration, the log of the
 *     limit); {@link DerivedInterval#scaled} turns P into expected counts such as days per
 *     year above the limit;</li>
 * <li>the mean E[u(X)] ({@link #withMean}); on a periodic space the circular mean
 * ({@link io.densa.core.Density#circularMean()}) in the space's own units, its draws unrolled
 * around the estimate (within half a period of it), so that an interval may cross the cut point
 * and extend below lower() or beyond lower() + P.</li>
 * </ul>
 * With {@link #withDataUnits} an increasing function u maps the space's variable to the units in
 * which results are reported (for example {@code Math::exp} for log concentrations): quantiles
 * are reported as u(quantile) (exact, because u is increasing) and the mean as E[u(X)].
 *
 * <p>Defaults: 200 draws, 90 % central intervals, no quantities (add at least one), identity
 * units, the node rule of {@link Evaluation#NODE_RULE}, parallel. The seed has no default: every
 * random procedure states its seed.
 */
public final class UncertaintyOptions {
    /** How each Monte Carlo draw (a density) is turned into the summarised quantities. */
    public enum Evaluation {
        /**
         * The fast rule: the draw's clr on a fixed set of Gauss–Legendre nodes (the space's
         * breakpoints and the thresholds are panel edges), normalising constant and tail masses by
         * the panel sums, quantiles by inverting the panel's interpolated cumulative mass with one
         * exact Newton step; draws whose estimated rule error exceeds 10⁻⁴ of the total mass are
         * evaluated on the rule with its panels cut into 4, then 16, and only those that fail there
         * too {@link #EXACT}ly (see {@link PredictiveDistribution} for the error). On a Fourier
         * space, whose clr is not piecewise polynomial, every draw is evaluated exactly.
         */
        NODE_RULE,
        /**
         * Every draw through {@link io.densa.core.Density#quantile}, {@link
         * io.densa.core.Density#tailProbability} and {@link io.densa.core.Density#mean} (the space's
         * adaptive quadrature): about a hundred times slower; the reference for the node rule.
         */
        EXACT
    }

    private final int draws;
    private final long seed;
    private final double level;
    private final double[] probabilities;
    private final double[] thresholds;
    private final boolean mean;
    private final DoubleUnaryOperator units;
    private final Evaluation evaluation;
    private final boolean parallel;

    private UncertaintyOptions(int draws, long seed, double level, double[] probabilities, double[] thresholds,
            boolean mean, DoubleUnaryOperator units, Evaluation evaluation, boolean parallel) {
        this.draws = draws;
        this.seed = seed;
        this.level = level;
        this.probabilities = probabilities;
        this.thresholds = thresholds;
        this.mean = mean;
        this.units = units;
        this.evaluation = evaluation;
        this.parallel = parallel;
    }

    /**
     * The defaults with this seed (per-location and per-cell random streams are derived from it).
     */
    public static UncertaintyOptions withSeed(long seed) {
        return new UncertaintyOptions(200, seed, 0.9, new double[0], new double[0], false, null,
                Evaluation.NODE_RULE, true);
    }

    /**
     * Number of Monte Carlo draws per location, in [10, 100000].
     */
    public UncertaintyOptions withDraws(int count) {
        if (count < 10 || count > 100_000) {
            throw new IllegalArgumentException("number of draws must be in [10, 100000], got " + count);
        }
        return new UncertaintyOptions(count, seed, level, probabilities, thresholds, mean, units, evaluation,
                parallel);
    }

    /** Level of the central intervals, in (0, 1) (0.9: from the 5 % to the 95 % point of the draws). */
    public UncertaintyOptions withLevel(double central) {
        if (!(central > 0 && central < 1)) {
            throw new IllegalArgumentException("interval level must be in (0, 1), got " + central);
        }
        return new UncertaintyOptions(draws, seed, central, probabilities, thresholds, mean, units, evaluation,
                parallel);
    }

    /** Quantiles to summarise, one per probability in (0, 1) (copied; replaces earlier ones). */
    public UncertaintyOptions withQuantiles(double... probs) {
        Objects.requireNonNull(probs, "probabilities");
        for (int i = 0; i < probs.length; i++) {
            if (!(probs[i] > 0 && probs[i] < 1)) {
                throw new IllegalArgumentException("quantile probability " + i + " must be in (0, 1), got "
                        + probs[i]);
            }
        }
        return new UncertaintyOptions(draws, seed, level, probs.clone(), thresholds, mean, units, evaluation,
                parallel);
    }

    /**
     * Exceedance probabilities P(X &gt; t) to summarise, one per finite threshold t in the space's
     * variable (copied; replaces earlier ones).
     */
    public UncertaintyOptions withExceedances(double... t) {
        Objects.requireNonNull(t, "thresholds");
        for (int i = 0; i < t.length; i++) {
            if (!Double.isFinite(t[i])) {
                throw new IllegalArgumentException("threshold " + i + " is not finite: " + t[i]);
            }
        }
        return new UncertaintyOptions(draws, seed, level, probabilities, t.clone(), mean, units, evaluation,
                parallel);
    }

    /**
     * Whether to summarise the mean E[u(X)] (u from {@link #withDataUnits}, the identity by default);
     * on a periodic space the circular mean (see the class documentation).
     */
    public UncertaintyOptions withMean(boolean m) {
        return new UncertaintyOptions(draws, seed, level, probabilities, thresholds, m, units, evaluation, parallel);
    }

    /**
     * Reports quantiles and means in the units of u, an increasing function finite on the domain
     * (checked on a fine grid of the domain when the summaries start); it is called from worker
     * threads and must be thread-safe.
     */
    public UncertaintyOptions withDataUnits(DoubleUnaryOperator increasing) {
        Objects.requireNonNull(increasing, "units");
        return new UncertaintyOptions(draws, seed, level, probabilities, thresholds, mean, increasing, evaluation,
                parallel);
    }

    /** How draws are evaluated. */
    public UncertaintyOptions withEvaluation(Evaluation e) {
        Objects.requireNonNull(e, "evaluation");
        return new UncertaintyOptions(draws, seed, level, probabilities, thresholds, mean, units, e, parallel);
    }

    /** Whether locations and tiles are processed on the common ForkJoin pool (results are identical). */
    public UncertaintyOptions withParallel(boolean p) {
        return new UncertaintyOptions(draws, seed, level, probabilities, thresholds, mean, units, evaluation, p);
    }

    /** Number of draws. */
    public int draws() {
        return draws;
    }

    /** The seed. */
    public long seed() {
        return seed;
    }

    /** Central interval level. */
    public double level() {
        return level;
    }

    /** Quantile probabilities (copy). */
    public double[] quantiles() {
        return probabilities.clone();
    }

    /** Thresholds of the exceedance probabilities (copy). */
    public double[] exceedances() {
        return thresholds.clone();
    }

    /** Whether the mean is summarised. */
    public boolean mean() {
        return mean;
    }

    /** The data-units function, or null for the identity. */
    public DoubleUnaryOperator dataUnits() {
        return units;
    }

    /** The evaluation of draws. */
    public Evaluation evaluation() {
        return evaluation;
    }

    /** Whether parallel. */
    public boolean parallel() {
        return parallel;
    }

    int quantityCount() {
        return probabilities.length + thresholds.length + (mean ? 1 : 0);
    }

    double[] probabilitiesInternal() {
        return probabilities;
    }

    double[] thresholdsInternal() {
        return thresholds;
    }

    @Override
    public String toString() {
        return "UncertaintyOptions[draws=" + draws + ", seed=" + seed + ", level=" + level + ", quantiles="
                + java.util.Arrays.toString(probabilities) + ", exceedances=" + java.util.Arrays.toString(thresholds)
                + ", mean=" + mean + ", " + evaluation + "]";
    }
}
