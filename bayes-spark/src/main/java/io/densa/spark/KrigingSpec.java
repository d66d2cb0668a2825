package io.densa.spark;

import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.spatial.kriging.Drift;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.VariogramModel;
import java.io.Serializable;
import java.util.List;
import java.util.Objects;

/**
 * A kriging model as the numbers it is built from — the data ({@link LocationData}), the type
 * (ordinary, simple with its mean coordinates, universal with a polynomial drift), the variogram
 * model's structures and the options — to broadcast to executors. {@link #kriging()} builds the
 * {@link Kriging} once per JVM through the same public factory; building is deterministic (the
 * global system is factorised the same way), so every executor predicts each cell exactly as the
 * driver would. The factories check on the driver that the rebuilt variogram model equals the given
 * one. External drift covariates (which have no values at grid cells) are not offered.
 *
 * <p>Immutable.
 */
public final class KrigingSpec implements Serializable {
    private static final long serialVersionUID = 1L;

    private final LocationData data;
    private final Kriging.Type type;
    private final double[] mean;
    private final int driftDegree;
    private final int[] families;
    private final double[] sills;
    private final double[] ranges;
    private final double[] smoothness;
    private final int neighbourKind; // 0 global, 1 nearest, 2 radius
    private final int neighbourCount;
    private final double neighbourRadius;
    private final double[] errorVariances;
    private final double coincidentNugget;
    private final double conditionLimit;
    private final PerJvm<Kriging> kriging = new PerJvm<>();

    private KrigingSpec(LocationData data, Kriging.Type type, double[] mean, int driftDegree, VariogramModel model,
            KrigingOptions options) {
        this.data = data;
        this.type = type;
        this.mean = mean;
        this.driftDegree = driftDegree;
        List<VariogramModel.Structure> st = model.structures();
        families = new int[st.size()];
        sills = new double[st.size()];
        ranges = new double[st.size()];
        smoothness = new double[st.size()];
        for (int i = 0; i < st.size(); i++) {
            families[i] = st.get(i).family().ordinal();
            sills[i] = st.get(i).partialSill();
            ranges[i] = st.get(i).range();
            smoothness[i] = st.get(i).smoothness();
        }
        Neighbourhood nb = options.neighbourhood();
        neighbourKind = nb.isGlobal() ? 0 : Double.isInfinite(nb.radius()) ? 1 : 2;
        neighbourCount = nb.count();
        neighbourRadius = nb.radius();
        errorVariances = options.errorVariances();
        coincidentNugget = options.coincidentNugget();
        conditionLimit = options.conditionLimit();
        if (!model().equals(model)) {
            throw new IllegalStateException("the variogram model rebuilt from its structures (" + model()
                    + ") differs from " + model);
        }
        kriging(); // fails on the driver for bad input
    }

    /** Ordinary kriging ({@link Kriging#ordinary}). */
    public static KrigingSpec ordinary(LocationData data, VariogramModel model, KrigingOptions options) {
        return new KrigingSpec(Objects.requireNonNull(data, "data"), Kriging.Type.ORDINARY, null, 0,
                Objects.requireNonNull(model, "model"), Objects.requireNonNull(options, "options"));
    }

    /** Simple kriging with a known mean ({@link Kriging#simple}). */
    public static KrigingSpec simple(LocationData data, Density mean, VariogramModel model, KrigingOptions options) {
        Objects.requireNonNull(mean, "mean");
        return new KrigingSpec(Objects.requireNonNull(data, "data"), Kriging.Type.SIMPLE, mean.coordinates(), 0,
                Objects.requireNonNull(model, "model"), Objects.requireNonNull(options, "options"));
    }

    /** Universal kriging with a polynomial drift of the given degree ({@link Kriging#universal}). */
    public static KrigingSpec universal(LocationData data, int driftDegree, VariogramModel model,
            KrigingOptions options) {
        Drift.polynomial(driftDegree);
        return new KrigingSpec(Objects.requireNonNull(data, "data"), Kriging.Type.UNIVERSAL, null, driftDegree,
                Objects.requireNonNull(model, "model"), Objects.requireNonNull(options, "options"));
    }

    /** The data. */
    public LocationData data() {
        return data;
    }

    /** The variogram model rebuilt from its structures. */
    public VariogramModel model() {
        VariogramModel m = null;
        for (int i = 0; i < families.length; i++) {
            VariogramModel.Family f = VariogramModel.Family.values()[families[i]];
            VariogramModel s;
            switch (f) {
                case NUGGET:
                    s = VariogramModel.nugget(sills[i]);
                    break;
                case SPHERICAL:
                    s = VariogramModel.spherical(sills[i], ranges[i]);
                    break;
                case EXPONENTIAL:
                    s = VariogramModel.exponential(sills[i], ranges[i]);
                    break;
                case GAUSSIAN:
                    s = VariogramModel.gaussian(sills[i], ranges[i]);
                    break;
                case MATERN:
                    s = VariogramModel.matern(sills[i], ranges[i], smoothness[i]);
                    break;
                default:
                    s = VariogramModel.power(sills[i], ranges[i]);
                    break;
            }
            m = m == null ? s : m.plus(s);
        }
        return m;
    }

    /** The options rebuilt from their numbers (single-threaded: Spark runs the tiles in parallel). */
    public KrigingOptions options() {
        Neighbourhood nb = neighbourKind == 0 ? Neighbourhood.global() : neighbourKind == 1
                ? Neighbourhood.nearest(neighbourCount) : Neighbourhood.radius(neighbourRadius, neighbourCount);
        KrigingOptions o = KrigingOptions.withDefaults().withNeighbourhood(nb).withCoincidentNugget(coincidentNugget)
                .withConditionLimit(conditionLimit).withParallel(false);
        return errorVariances == null ? o : o.withErrorVariances(errorVariances);
    }

    /** The kriging (built once per JVM). */
    public Kriging kriging() {
        return kriging.get(() -> build());
    }

    private Kriging build() {
        Locations loc = data.locations();
        DensitySet d = data.densities();
        switch (type) {
            case SIMPLE:
                return Kriging.simple(loc, d, d.space().density(mean), model(), options());
            case UNIVERSAL:
                return Kriging.universal(loc, d, Drift.polynomial(driftDegree), model(), options());
            default:
                return Kriging.ordinary(loc, d, model(), options());
        }
    }

    @Override
    public String toString() {
        return "KrigingSpec[" + type + ", " + data.size() + " locations, " + model() + "]";
    }
}
