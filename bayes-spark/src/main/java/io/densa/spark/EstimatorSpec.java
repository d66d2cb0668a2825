package io.densa.spark;

import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.SmoothingCriterion;
import io.densa.core.estimate.ZeroTotalPolicy;
import io.densa.io.Bins;
import java.io.Serializable;
import java.util.Objects;

/**
 * The settings of a {@link PenalizedLikelihoodEstimator} and the bin layout of the counts, as
 * primitives to broadcast to Spark executors. The {@code with…} methods mirror the estimator's and
 * are validated by it at once; {@link #estimator()} builds the estimator once per JVM (a transient
 * lazy field) by applying the same methods in the same order to {@code
 * PenalizedLikelihoodEstimator.withDefaults(space)}. The estimator is deterministic and each unit's fit depends
 * only on its own counts, so an executor computes for a unit exactly what the driver computes.
 *
 * <p>Cross-validated smoothing is not offered: its folds depend on a unit's row in the batch. The
 * estimator runs without its own thread pool on executors (Spark runs the tasks in parallel; the
 * library's parallel and serial paths are bit-identical). Immutable.
 */
public final class EstimatorSpec implements Serializable {
    private static final long serialVersionUID = 1L;

    private final SpaceSpec space;
    private final double[] edges;
    private final int penaltyOrder; // 0: default
    private final double smoothing; // NaN: chosen
    private final SmoothingCriterion criterion;
    private final double[] grid; // null: default; lo, hi, step
    private final double priorWeight;
    private final int maxIterations; // 0: default
    private final double tolerance; // NaN: default
    private final int points; // -1: default
    private final ZeroTotalPolicy zeroTotal;
    private final PenalizedLikelihoodEstimator.EmptyEnds emptyEnds; // null: default
    private final PerJvm<PenalizedLikelihoodEstimator> estimator = new PerJvm<>();

    private EstimatorSpec(SpaceSpec space, double[] edges, int penaltyOrder, double smoothing,
            SmoothingCriterion criterion, double[] grid, double priorWeight, int maxIterations, double tolerance,
            int points, ZeroTotalPolicy zeroTotal, PenalizedLikelihoodEstimator.EmptyEnds emptyEnds) {
        this.space = space;
        this.edges = edges;
        this.penaltyOrder = penaltyOrder;
        this.smoothing = smoothing;
        this.criterion = criterion;
        this.grid = grid;
        this.priorWeight = priorWeight;
        this.maxIterations = maxIterations;
        this.tolerance = tolerance;
        this.points = points;
        this.zeroTotal = zeroTotal;
        this.emptyEnds = emptyEnds;
        build(); // validates on the driver
    }

    /**
     * The estimator's defaults for the space, with counts in the given bins.
     *
     * @param space the space
     * @param edges D + 1 strictly increasing bin edges inside the space's domain (copied)
     * @throws IllegalArgumentException naming a bad edge
     */
    public static EstimatorSpec of(SpaceSpec space, double... edges) {
        Objects.requireNonNull(space, "space");
        Objects.requireNonNull(edges, "edges");
        Bins.of(edges).checkAgainst(space.space());
        return new EstimatorSpec(space, edges.clone(), 0, Double.NaN, null, null,
                PenalizedLikelihoodEstimator.DEFAULT_PRIOR_WEIGHT, 0, Double.NaN, -1, null, null);
    }

    private EstimatorSpec copy(int order, double lambda, SmoothingCriterion c, double[] g, double prior, int maxIt,
            double tol, int pts, ZeroTotalPolicy zt) {
        return new EstimatorSpec(space, edges, order, lambda, c, g, prior, maxIt, tol, pts, zt, emptyEnds);
    }

    /** See {@link PenalizedLikelihoodEstimator#withPenaltyOrder}. */
    public EstimatorSpec withPenaltyOrder(int l) {
        return copy(l, smoothing, criterion, grid, priorWeight, maxIterations, tolerance, points, zeroTotal);
    }

    /** See {@link PenalizedLikelihoodEstimator#withSmoothing}. */
    public EstimatorSpec withSmoothing(double lambda) {
        return copy(penaltyOrder, lambda, criterion, grid, priorWeight, maxIterations, tolerance, points, zeroTotal);
    }

    /**
     * See {@link PenalizedLikelihoodEstimator#withCriterion}.
     *
     * @throws IllegalArgumentException for {@link SmoothingCriterion#CROSS_VALIDATION}
     */
    public EstimatorSpec withCriterion(SmoothingCriterion c) {
        Objects.requireNonNull(c, "criterion");
        if (c == SmoothingCriterion.CROSS_VALIDATION) {
            throw new IllegalArgumentException("cross-validated smoothing is not available in Spark jobs (its folds"
                    + " depend on the unit's row in a batch); choose MARGINAL_LIKELIHOOD, AICC, AIC or GCV");
        }
        return copy(penaltyOrder, Double.NaN, c, grid, priorWeight, maxIterations, tolerance, points, zeroTotal);
    }

    /** See {@link PenalizedLikelihoodEstimator#withSmoothingGrid}. */
    public EstimatorSpec withSmoothingGrid(double log10Lo, double log10Hi, double step) {
        return copy(penaltyOrder, smoothing, criterion, new double[] {log10Lo, log10Hi, step}, priorWeight,
                maxIterations, tolerance, points, zeroTotal);
    }

    /** See {@link PenalizedLikelihoodEstimator#withReferencePrior}. */
    public EstimatorSpec withReferencePrior(double observations) {
        return copy(penaltyOrder, smoothing, criterion, grid, observations, maxIterations, tolerance, points, zeroTotal);
    }

    /** See {@link PenalizedLikelihoodEstimator#withMaxIterations}. */
    public EstimatorSpec withMaxIterations(int n) {
        return copy(penaltyOrder, smoothing, criterion, grid, priorWeight, n, tolerance, points, zeroTotal);
    }

    /** See {@link PenalizedLikelihoodEstimator#withTolerance}. */
    public EstimatorSpec withTolerance(double tol) {
        return copy(penaltyOrder, smoothing, criterion, grid, priorWeight, maxIterations, tol, points, zeroTotal);
    }

    /** See {@link PenalizedLikelihoodEstimator#withQuadraturePoints}. */
    public EstimatorSpec withQuadraturePoints(int m) {
        return copy(penaltyOrder, smoothing, criterion, grid, priorWeight, maxIterations, tolerance, m, zeroTotal);
    }

    /** See {@link PenalizedLikelihoodEstimator#withZeroTotal}. */
    public EstimatorSpec withZeroTotal(ZeroTotalPolicy policy) {
        Objects.requireNonNull(policy, "policy");
        return copy(penaltyOrder, smoothing, criterion, grid, priorWeight, maxIterations, tolerance, points, policy);
    }

    /** See {@link PenalizedLikelihoodEstimator#withEmptyEnds}. */
    public EstimatorSpec withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds reading) {
        Objects.requireNonNull(reading, "reading");
        return new EstimatorSpec(space, edges, penaltyOrder, smoothing, criterion, grid, priorWeight, maxIterations,
                tolerance, points, zeroTotal, reading);
    }

    /** The space definition. */
    public SpaceSpec space() {
        return space;
    }

    /** The bin edges (a fresh copy). */
    public double[] edges() {
        return edges.clone();
    }

    /** Number of bins D. */
    public int bins() {
        return edges.length - 1;
    }

    /** The bin layout (for binning values). */
    Bins layout() {
        return Bins.of(edges);
    }

    double[] edgesInternal() {
        return edges;
    }

    /**
     * The estimator, built once per JVM: {@code PenalizedLikelihoodEstimator.withDefaults(space)} with the
     * settings applied, fractional counts allowed (weighted events), no thread pool of its own.
     */
    public PenalizedLikelihoodEstimator estimator() {
        return estimator.get(() -> build());
    }

    private PenalizedLikelihoodEstimator build() {
        PenalizedLikelihoodEstimator e = PenalizedLikelihoodEstimator.withDefaults(space.space());
        if (penaltyOrder > 0) {
            e = e.withPenaltyOrder(penaltyOrder);
        }
        if (criterion != null) {
            e = e.withCriterion(criterion);
        }
        if (!Double.isNaN(smoothing)) {
            e = e.withSmoothing(smoothing);
        }
        if (grid != null) {
            e = e.withSmoothingGrid(grid[0], grid[1], grid[2]);
        }
        if (priorWeight != PenalizedLikelihoodEstimator.DEFAULT_PRIOR_WEIGHT) {
            e = e.withReferencePrior(priorWeight);
        }
        if (maxIterations > 0) {
            e = e.withMaxIterations(maxIterations);
        }
        if (!Double.isNaN(tolerance)) {
            e = e.withTolerance(tolerance);
        }
        if (points >= 0) {
            e = e.withQuadraturePoints(points);
        }
        if (zeroTotal != null) {
            e = e.withZeroTotal(zeroTotal);
        }
        if (emptyEnds != null) {
            e = e.withEmptyEnds(emptyEnds);
        }
        return e.withFractionalCounts(true).withParallel(false);
    }

    @Override
    public String toString() {
        return "EstimatorSpec[" + space + ", " + bins() + " bins]";
    }
}
