package io.densa.spatial.spacetime;

import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramModel;
import java.util.Objects;

/**
 * Options of {@link SpaceTimeFitting}: the criterion, the marginal families of the separable and
 * product-sum models (each a single structure: spherical, exponential, Gaussian or Matérn with a
 * fixed smoothness), the fixed shapes γ and α of the Gneiting class, and the optimiser's budget.
 * Defaults: Cressie's weighted least squares, exponential margins, γ = α = ½, 4000 evaluations
 * per start.
 *
 * <p>Immutable; every {@code with…} returns a new object.
 */
public final class SpaceTimeFitOptions {
    private final VariogramFitOptions.Method method;
    private final VariogramModel.Family spatialFamily;
    private final VariogramModel.Family temporalFamily;
    private final double spatialSmoothness;
    private final double temporalSmoothness;
    private final double spatialShape;
    private final double temporalShape;
    private final int maxEvaluations;
    private final boolean spatialNugget;

    private SpaceTimeFitOptions(VariogramFitOptions.Method method, VariogramModel.Family spatialFamily,
            VariogramModel.Family temporalFamily, double spatialSmoothness, double temporalSmoothness,
            double spatialShape, double temporalShape, int maxEvaluations, boolean spatialNugget) {
        this.spatialNugget = spatialNugget;
        this.method = method;
        this.spatialFamily = spatialFamily;
        this.temporalFamily = temporalFamily;
        this.spatialSmoothness = spatialSmoothness;
        this.temporalSmoothness = temporalSmoothness;
        this.spatialShape = spatialShape;
        this.temporalShape = temporalShape;
        this.maxEvaluations = maxEvaluations;
    }

    /** The defaults described above. */
    public static SpaceTimeFitOptions withDefaults() {
        return new SpaceTimeFitOptions(VariogramFitOptions.Method.WEIGHTED_CRESSIE, VariogramModel.Family.EXPONENTIAL,
                VariogramModel.Family.EXPONENTIAL, Double.NaN, Double.NaN, 0.5, 0.5, 4000, false);
    }

    /**
     * Whether the separable and product-sum fits add a nugget to the spatial margin (default off):
     * γ_s(h) = n_s + structured for h &gt; 0, a jump between distinct locations that persists in
     * time, as when each unit (a district, a monitor) carries an effect of its own that lasts from
     * period to period. The space–time nugget c0 is noise at (0, 0) only; without n_s a fit to
     * such data must put the jump into c0, and then γ(0, u) = c0 + … overstates how much a unit
     * changes from one period to the next, so that space–time kriging underuses a unit's own other
     * periods. The Gneiting class has no separate spatial margin and ignores the flag.
     */
    public SpaceTimeFitOptions withSpatialNugget(boolean fit) {
        return new SpaceTimeFitOptions(method, spatialFamily, temporalFamily, spatialSmoothness, temporalSmoothness,
                spatialShape, temporalShape, maxEvaluations, fit);
    }

    /** Whether the spatial margin gets a nugget of its own (see {@link #withSpatialNugget}). */
    public boolean spatialNugget() {
        return spatialNugget;
    }

    /** The criterion (Cressie's weighted or ordinary least squares). */
    public SpaceTimeFitOptions withMethod(VariogramFitOptions.Method m) {
        Objects.requireNonNull(m, "method");
        return new SpaceTimeFitOptions(m, spatialFamily, temporalFamily, spatialSmoothness, temporalSmoothness,
                spatialShape, temporalShape, maxEvaluations, spatialNugget);
    }

    private static void family(VariogramModel.Family f, double nu, String what) {
        Objects.requireNonNull(f, what + " family");
        if (f == VariogramModel.Family.NUGGET || f == VariogramModel.Family.POWER) {
            throw new IllegalArgumentException("the " + what + " family must be spherical, exponential, Gaussian or"
                    + " Matern, got " + f);
        }
        if (f == VariogramModel.Family.MATERN && !(nu > 0 && nu <= 50)) {
            throw new IllegalArgumentException("a Matern " + what + " family needs a smoothness in (0, 50], got " + nu);
        }
    }

    /**
     * The spatial family and its Matérn smoothness (ignored for the other families).
     *
     * @throws IllegalArgumentException for the nugget or power family, or a Matérn smoothness
     *                                  outside (0, 50]
     */
    public SpaceTimeFitOptions withSpatialFamily(VariogramModel.Family f, double smoothness) {
        family(f, smoothness, "spatial");
        return new SpaceTimeFitOptions(method, f, temporalFamily, smoothness, temporalSmoothness, spatialShape,
                temporalShape, maxEvaluations, spatialNugget);
    }

    /** The temporal family and its Matérn smoothness, as {@link #withSpatialFamily}. */
    public SpaceTimeFitOptions withTemporalFamily(VariogramModel.Family f, double smoothness) {
        family(f, smoothness, "temporal");
        return new SpaceTimeFitOptions(method, spatialFamily, f, spatialSmoothness, smoothness, spatialShape,
                temporalShape, maxEvaluations, spatialNugget);
    }

    /**
     * The Gneiting shapes γ (space) and α (time), both in (0, 1].
     *
     * @throws IllegalArgumentException naming the shape outside (0, 1]
     */
    public SpaceTimeFitOptions withGneitingShapes(double gamma, double alpha) {
        if (!(gamma > 0 && gamma <= 1)) {
            throw new IllegalArgumentException("spatial shape gamma must be in (0, 1], got " + gamma);
        }
        if (!(alpha > 0 && alpha <= 1)) {
            throw new IllegalArgumentException("temporal shape alpha must be in (0, 1], got " + alpha);
        }
        return new SpaceTimeFitOptions(method, spatialFamily, temporalFamily, spatialSmoothness, temporalSmoothness,
                gamma, alpha, maxEvaluations, spatialNugget);
    }

    /**
     * The optimiser's evaluation budget per starting point.
     *
     * @throws IllegalArgumentException unless count ≥ 100
     */
    public SpaceTimeFitOptions withMaxEvaluations(int count) {
        if (count < 100) {
            throw new IllegalArgumentException("evaluation budget must be at least 100, got " + count);
        }
        return new SpaceTimeFitOptions(method, spatialFamily, temporalFamily, spatialSmoothness, temporalSmoothness,
                spatialShape, temporalShape, count, spatialNugget);
    }

    /** The criterion. */
    public VariogramFitOptions.Method method() {
        return method;
    }

    /** The spatial marginal family. */
    public VariogramModel.Family spatialFamily() {
        return spatialFamily;
    }

    /** The temporal marginal family. */
    public VariogramModel.Family temporalFamily() {
        return temporalFamily;
    }

    /** Matérn smoothness of the spatial margin (NaN unless set). */
    public double spatialSmoothness() {
        return spatialSmoothness;
    }

    /** Matérn smoothness of the temporal margin (NaN unless set). */
    public double temporalSmoothness() {
        return temporalSmoothness;
    }

    /** Gneiting's spatial shape γ. */
    public double spatialShape() {
        return spatialShape;
    }

    /** Gneiting's temporal shape α. */
    public double temporalShape() {
        return temporalShape;
    }

    /** Evaluation budget per start. */
    public int maxEvaluations() {
        return maxEvaluations;
    }

    @Override
    public String toString() {
        return "SpaceTimeFitOptions[" + method + ", spatial " + spatialFamily + ", temporal " + temporalFamily
                + ", gamma " + spatialShape + ", alpha " + temporalShape + ", maxEvaluations " + maxEvaluations
                + (spatialNugget ? ", spatial nugget" : "") + "]";
    }
}
