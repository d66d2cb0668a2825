package io.densa.spatial.kriging;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import io.densa.core.internal.Cholesky;
import io.densa.core.internal.ProgressCounter;
import io.densa.spatial.Locations;
import io.densa.spatial.NeighbourIndex;
import io.densa.spatial.variogram.VariogramModel;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.function.Consumer;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Polygon;

/**
 * Kriging of densities: the predictor X̂(s_0) = ⊕_i λ_i ⊙ X(s_i) has coordinates Σ_i λ_i c_i, so
 * every prediction is a density of the data's space. The weights solve the scalar kriging system
 * of the trace-covariance C(h) = sill − γ(h) of a {@link VariogramModel} (Giraldo, Delicado,
 * Mateu (2011), Ordinary kriging for function-valued spatial data, Environ. Ecol. Stat. 18 — from
 * memory):
 * <ul>
 * <li>simple kriging (known mean density m): C λ = c0, X̂ = m ⊕ ⊕ λ_i ⊙ (X_i ⊖ m),
 *     σ² = C(0) − λᵀc0;</li>
 * <li>ordinary kriging: C λ + μ1 = c0, Σ λ_i = 1, σ² = C(0) − λᵀc0 − μ;</li>
 * <li>universal kriging with drift functions F: C λ + F μ = c0, Fᵀλ = f0,
 *     σ² = C(0) − λᵀc0 − μᵀf0 ("A Universal Kriging predictor for spatially dependent functional
 *     data of a Hilbert Space", Electron. J. Statist. 7 (2013), doi:10.1214/13-EJS843 — from
 *     memory).</li>
 * </ul>
 * σ² is the kriging variance E‖X(s_0) ⊖ X̂(s_0)‖²_B in B2 norm squared. An unbounded (power)
 * variogram is used through the pseudo-covariance A − γ(h) with a constant A; ordinary and
 * universal weights and variances do not depend on A because the weights sum to one; simple
 * kriging needs a bounded model. Measurement-error variances follow the convention of
 * {@link KrigingOptions}. With geographic locations the lag is the great-circle distance in km;
 * not every model stays positive definite on the sphere with that distance (the exponential and
 * spherical do, the Gaussian does not: Gneiting (2013), Strictly and non-strictly positive
 * definite functions on spheres, Bernoulli 19(4) — from memory); a failure shows as a Cholesky
 * breakdown ({@link DensaException}).
 *
 * <p><b>Numerical safeguards.</b> Drift monomials are evaluated on coordinates centred and scaled
 * by the data's bounding box, drift covariates standardised (see {@link #driftCoefficients()});
 * a drift function that the data locations cannot identify (a constant covariate, a covariate
 * that is a combination of the monomials, y on locations along a horizontal line) is named: an
 * {@link IllegalArgumentException} at construction, a {@link DensaException} for a local
 * neighbourhood. After each solve the unbiasedness constraints Fᵀλ = f(s_0) are checked; when
 * their relative residual exceeds 10⁻⁶ after one step of iterative refinement (a polynomial drift
 * extrapolated far outside the data), the prediction throws a {@link DensaException} naming the
 * target, the residual and the distance to the nearest station. Every prediction reports that
 * distance ({@link KrigingPrediction#nearestStationDistance()}), so a caller can tell
 * extrapolation; grids can report it per cell ({@link GridOptions#withNearestDistances}).
 * The system is solved in units of the sill: covariances, error variances and the variance are
 * divided by an even power of two 2^e near the (pseudo-)sill, which is exact (weights and
 * predictions are bit-identical to the unscaled solve) and keeps sills near 1e-300 or 1e300 from
 * under- or overflowing the system; a kriging variance that still exceeds the double range
 * (a sill near 1.8e308) throws a {@link DensaException} naming the target.
 *
 * <p>Immutable after construction and safe to share between threads; factorisations are computed
 * lazily (the global one once).
 */
public final class Kriging {
    /** The kriging variant. */
    public enum Type {
        /** Known mean density. */
        SIMPLE,
        /** Unknown constant mean. */
        ORDINARY,
        /** Unknown drift Σ f_l(s) β_l. */
        UNIVERSAL
    }

    private final Type type;
    private final Locations loc;
    private final NeighbourIndex index;
    private final BayesSpace space;
    private final double[] y;
    private final int n;
    private final int k;
    private final VariogramModel model;
    /** e of the scale 2^e (even) of covariances and variances in the systems. */
    private final int unitExponent;
    private final Drift drift;
    private final int p;
    private final DriftDesign design;
    private final double[] centre;
    /** y − centre row by row (y itself when the centre is 0: ordinary and universal kriging). */
    private final double[] centred;
    private final double[] diagExtra; // in units of 2^unitExponent
    private final double[] diagExtraRaw; // in the data's units
    private final KrigingOptions options;
    private final double c00;
    private final StationCovariances covariances;
    /** 0, 1, …, n − 1: the neighbours of every target in the global neighbourhood. */
    private final int[] allStations;
    private volatile LocalSystem global;

    private Kriging(Type type, Locations loc, DensitySet data, Density mean, VariogramModel model, Drift drift,
            KrigingOptions options) {
        Objects.requireNonNull(loc, "locations");
        Objects.requireNonNull(data, "densities");
        Objects.requireNonNull(model, "model");
        Objects.requireNonNull(options, "options");
        this.type = type;
        this.loc = loc;
        this.n = loc.size();
        if (data.size() != n) {
            throw new IllegalArgumentException("locations (" + n + ") and densities (" + data.size()
                    + ") differ in number");
        }
        this.space = data.space();
        this.k = data.dimension();
        this.y = data.coordinatesRowMajor();
        this.model = model;
        this.drift = drift;
        this.options = options;
        this.p = type == Type.SIMPLE ? 0 : drift.size();
        int need = p + 1;
        if (n < Math.max(1, need)) {
            throw new IllegalArgumentException(type + " kriging with " + p + " drift function(s) needs at least "
                    + need + " locations, got " + n);
        }
        Neighbourhood hood = options.neighbourhood();
        if (!hood.isGlobal() && hood.count() < need) {
            throw new IllegalArgumentException("a neighbourhood of at most " + hood.count() + " locations cannot"
                    + " support " + type + " kriging with " + p + " drift function(s); need at least " + need);
        }
        if (type == Type.SIMPLE && !model.bounded()) {
            throw new IllegalArgumentException("simple kriging needs a bounded variogram model, got " + model);
        }
        if (drift != null && drift.covariateCount() > 0 && drift.covariateRows() != n) {
            throw new IllegalArgumentException("drift covariates have " + drift.covariateRows() + " rows but there are "
                    + n + " locations");
        }
        this.diagExtraRaw = options.diagonalExtras(n);
        this.centre = new double[k];
        if (type == Type.SIMPLE) {
            Objects.requireNonNull(mean, "mean");
            space.requireSame(mean.space(), "the mean density");
            System.arraycopy(mean.coordinates(), 0, centre, 0, k);
            centred = new double[n * k];
            for (int i = 0; i < n; i++) {
                for (int c = 0; c < k; c++) {
                    centred[i * k + c] = y[i * k + c] - centre[c];
                }
            }
        } else {
            centred = y; // y − 0 = y, bit for bit
        }
        this.index = NeighbourIndex.of(loc);
        this.allStations = new int[n];
        for (int i = 0; i < n; i++) {
            allStations[i] = i;
        }
        double[] bb = loc.boundingBox();
        this.design = new DriftDesign(drift, p, loc, bb);
        this.covariances = new StationCovariances(loc, model, bb, options.parallel());
        double sill = covariances.sill();
        this.unitExponent = covariances.unitExponent();
        this.c00 = covariances.pseudoSill();
        this.diagExtra = new double[n];
        for (int i = 0; i < n; i++) {
            diagExtra[i] = Math.scalb(diagExtraRaw[i], -unitExponent);
            if (!(diagExtra[i] <= Double.MAX_VALUE)) {
                throw new IllegalArgumentException("the error variance of location " + i + " plus the coincident"
                        + " nugget (" + diagExtraRaw[i] + ") is too large beside the variogram's sill " + sill
                        + " (their ratio overflows a double); accepted are ratios below about 1e308");
            }
        }
        design.evaluateRows(loc);
        checkCoincident();
    }

    private void checkCoincident() {
        int[][] pairs = index.pairsWithin(0);
        for (int[] pr : pairs) {
            if (diagExtra[pr[0]] > 0 || diagExtra[pr[1]] > 0) {
                continue;
            }
            throw new IllegalArgumentException("locations " + pr[0] + " and " + pr[1] + " coincide at (" + loc.x(pr[0])
                    + ", " + loc.y(pr[0]) + ") (" + pairs.length + " coincident pair(s) in total): merge them, give"
                    + " error variances, or use KrigingOptions.withCoincidentNugget");
        }
    }

    /**
     * Ordinary kriging (unknown constant mean density).
     *
     * @throws IllegalArgumentException on mismatched sizes, fewer than 2 locations, coincident
     *                                  locations (unless allowed by the options) or invalid options
     */
    public static Kriging ordinary(Locations locations, DensitySet densities, VariogramModel model,
            KrigingOptions options) {
        return new Kriging(Type.ORDINARY, locations, densities, null, model, Drift.constant(), options);
    }

    /** Ordinary kriging with {@link KrigingOptions#withDefaults()}. */
    public static Kriging ordinary(Locations locations, DensitySet densities, VariogramModel model) {
        return ordinary(locations, densities, model, KrigingOptions.withDefaults());
    }

    /**
     * Simple kriging with a known mean density (same space as the data); the model must be bounded.
     */
    public static Kriging simple(Locations locations, DensitySet densities, Density mean, VariogramModel model,
            KrigingOptions options) {
        return new Kriging(Type.SIMPLE, locations, densities, mean, model, null, options);
    }

    /** Simple kriging with {@link KrigingOptions#withDefaults()}. */
    public static Kriging simple(Locations locations, DensitySet densities, Density mean, VariogramModel model) {
        return simple(locations, densities, mean, model, KrigingOptions.withDefaults());
    }

    /**
     * Universal kriging with the given drift (monomials in the coordinates and optional external
     * covariates; a drift of degree 0 without covariates is ordinary kriging).
     *
     * @throws IllegalArgumentException as {@link #ordinary}, and naming a drift function (a
     *                                  constant covariate, or one that is a linear combination of
     *                                  the earlier drift functions over the data locations)
     */
    public static Kriging universal(Locations locations, DensitySet densities, Drift drift, VariogramModel model,
            KrigingOptions options) {
        Objects.requireNonNull(drift, "drift");
        return new Kriging(Type.UNIVERSAL, locations, densities, null, model, drift, options);
    }

    /** Universal kriging with {@link KrigingOptions#withDefaults()}. */
    public static Kriging universal(Locations locations, DensitySet densities, Drift drift, VariogramModel model) {
        return universal(locations, densities, drift, model, KrigingOptions.withDefaults());
    }

    // ------------------------------------------------------------------ internals used by systems

    int driftSize() {
        return p;
    }

    /** K, the number of coordinates of the data's densities. */
    public int dimension() {
        return k;
    }

    double[] centre() {
        return centre;
    }

    double diagonalExtra(int i) {
        return diagExtra[i];
    }

    /** Error variance plus coincident nugget of every location, in the data's units (a copy). */
    double[] errorAndNuggetVariances() {
        return diagExtraRaw.clone();
    }

    /** A variance of the systems (in units of 2^unitExponent) in the data's units, without checks. */
    double inDataUnits(double unitVariance) {
        return Math.scalb(unitVariance, unitExponent);
    }

    /** The data coordinates (a new n × K row-major array). */
    double[] dataCoordinates() {
        return y.clone();
    }

    /** The neighbour index of the data locations. */
    NeighbourIndex index() {
        return index;
    }

    /** Covariances between stations and targets in the systems' units. */
    StationCovariances covariances() {
        return covariances;
    }

    /** The drift functions as the systems evaluate them. */
    DriftDesign design() {
        return design;
    }

    LocalSystem globalSystem() {
        LocalSystem g = global;
        if (g == null) {
            synchronized (this) {
                g = global;
                if (g == null) {
                    g = system(allStations);
                    global = g;
                }
            }
        }
        return g;
    }

    /** Neighbour indices (ascending) for a target, leaving out location {@code exclude} (−1 for none). */
    int[] neighbours(double x, double yy, int exclude) {
        if (exclude < 0 && options.neighbourhood().isGlobal()) {
            return allStations; // shared, never modified: systems and predictions copy what they keep
        }
        return options.neighbourhood().select(index, n, Math.max(1, p + 1), type, x, yy, exclude);
    }

    LocalSystem systemFor(int[] nb) {
        return options.neighbourhood().isGlobal() && nb.length == n ? globalSystem() : system(nb);
    }

    /**
     * The factorised system of stations idx: the covariance block (with the diagonal extras), the
     * drift rows and the centred data rows, handed to {@link LocalSystem#factor}.
     */
    LocalSystem system(int[] idx) {
        int m = idx.length;
        double[] a = new double[m * m];
        covariances.block(idx, m, a);
        for (int r = 0; r < m; r++) {
            a[r * m + r] += diagExtra[idx[r]];
        }
        double[] f = new double[m * p];
        for (int r = 0; r < m; r++) {
            design.driftRow(idx[r], f, r * p);
        }
        double[] ly = new double[m * k];
        for (int r = 0; r < m; r++) {
            System.arraycopy(centred, idx[r] * k, ly, r * k, k);
        }
        return LocalSystem.factor(idx, a, f, ly, p, k, options.conditionLimit(), dep -> design.dependentMessage(dep, m));
    }

    KrigingPrediction predictAt(double x, double yy, double[] covariates, int exclude, boolean withWeights) {
        loc.requirePoint(x, yy, "target");
        double[] f0 = new double[p];
        design.driftAt(x, yy, covariates, f0);
        int[] nb = neighbours(x, yy, exclude);
        LocalSystem sys = systemFor(nb);
        double[] c0 = new double[nb.length];
        double[] dist = new double[nb.length];
        covariances.targets(nb, nb.length, x, yy, dist, c0);
        double nearest = StationCovariances.nearest(dist, nb.length);
        double[] out = new double[k];
        double[] w = withWeights ? new double[nb.length] : null;
        LocalSystem.Scratch sc = new LocalSystem.Scratch(p);
        double var = sys.predict(c0, f0, c00, centre, out, 0, w, sc);
        checkConstraints(sc.residual, x, yy, sys, nearest);
        if (w != null && p > 0) {
            checkConstraints(design.weightResidual(nb, w, f0), x, yy, sys, nearest);
        }
        return new KrigingPrediction(density(out, x, yy, sys), variance(var, x, yy, sys), nb, w, nearest);
    }

    /**
     * A variance of the system (in units of 2^unitExponent) in the data's units.
     *
     * @throws DensaException naming the target when it exceeds the double range
     */
    double variance(double unitVariance, double x, double yy, LocalSystem sys) {
        double v = Math.scalb(unitVariance, unitExponent);
        if (!(v <= Double.MAX_VALUE)) {
            throw new DensaException(String.format(java.util.Locale.ROOT, "%s kriging at target (%s, %s): the kriging"
                    + " variance %.6g x 2^%d exceeds the double range; the variogram's sill (%s) leaves no room for"
                    + " it: rescale the data", type, x, yy, unitVariance, unitExponent, model),
                    sys.diagnostics("kriging variance overflow"));
        }
        return v;
    }

    /** The predicted density from its coordinates, or a DensaException naming the target if one overflowed. */
    Density density(double[] coords, double x, double yy, LocalSystem sys) {
        for (int c = 0; c < coords.length; c++) {
            if (!Double.isFinite(coords[c])) {
                throw new DensaException(String.format(java.util.Locale.ROOT, "%s kriging at target (%s, %s):"
                        + " predicted coordinate %d is %s (the weighted sum of the data's coordinates, up to %.4g in"
                        + " magnitude, overflows); rescale the densities' coordinates", type, x, yy, c, coords[c],
                        maxAbs(y)), sys.diagnostics("predicted coordinate overflow"));
            }
        }
        return space.density(coords);
    }

    private static double maxAbs(double[] a) {
        double m = 0;
        for (double v : a) {
            m = Math.max(m, Math.abs(v));
        }
        return m;
    }

    /**
     * Throws when the unbiasedness constraints Fᵀλ = f(s_0) hold only to a relative residual above
     * {@link LocalSystem#CONSTRAINT_TOLERANCE}: the system is too ill-conditioned at this target
     * (typically a polynomial drift extrapolated far outside the data).
     */
    void checkConstraints(double residual, double x, double yy, LocalSystem sys, double nearest) {
        if (residual <= LocalSystem.CONSTRAINT_TOLERANCE) {
            return;
        }
        throw new DensaException(String.format(java.util.Locale.ROOT, "%s kriging at target (%s, %s) is numerically"
                + " unreliable: its weights satisfy the unbiasedness constraints F'lambda = f(s0) only to a relative"
                + " residual of %.3g (accepted: %.0e; the weights should sum to 1). The target is %.4g from the"
                + " nearest data location, while the data span a half-width of %.4g, so the drift (%s) is"
                + " extrapolated far beyond the data; predict closer to the data or use a lower drift degree",
                type, x, yy, residual, LocalSystem.CONSTRAINT_TOLERANCE, nearest, design.scale(), drift),
                sys.diagnostics("unbiasedness constraint residual " + residual));
    }

    // ------------------------------------------------------------------ public prediction API

    /**
     * Predicts the density at a target (no external covariates).
     *
     * @throws IllegalArgumentException if the target is not finite or the drift needs covariates
     * @throws DensaException           if the system is singular or ill-conditioned (diagnostics
     *                                  in a {@link KrigingDiagnostics})
     */
    public KrigingPrediction predict(double x, double y) {
        return predictAt(x, y, null, -1, false);
    }

    /** Predicts at a target with the drift's external covariates there. */
    public KrigingPrediction predict(double x, double y, double[] covariates) {
        return predictAt(x, y, covariates, -1, false);
    }

    /** Predicts at a target and reports the weights λ_i of the neighbours. */
    public KrigingPrediction predictWithWeights(double x, double y) {
        return predictAt(x, y, null, -1, true);
    }

    /** Predicts at a target with covariates and reports the weights. */
    public KrigingPrediction predictWithWeights(double x, double y, double[] covariates) {
        return predictAt(x, y, covariates, -1, true);
    }

    /**
     * Block kriging of the mean density of a polygon: the polygon is discretised into the centres
     * of a square grid of the given spacing lying inside it (its interior point if none does), and
     * the point covariances are averaged: c̄_i = mean_b C(s_i − u_b), C̄(V, V) = mean_{b,b'} C(u_b −
     * u_b') with C(0) on the diagonal, f̄ = mean_b f(u_b) (Journel &amp; Huijbregts (1978), Mining
     * Geostatistics, ch. V — from memory). The block's neighbours are those of its interior point.
     * Coordinates (and spacing) are in the locations' system (degrees for geographic).
     *
     * @throws IllegalArgumentException for an empty polygon, a spacing that gives more than 4096
     *                                  points, or a drift with external covariates
     */
    public KrigingPrediction predictBlock(Polygon polygon, double spacing) {
        return BlockKriging.predict(this, polygon, spacing);
    }

    /**
     * Predicts a regular grid tile by tile into the consumer; see {@link GridOptions} for the
     * per-cell quantities computed in the same pass. Tiles are computed in parallel (in batches)
     * and delivered in tile order from the calling thread, so the consumer need not be thread-safe
     * and at most a batch of tiles is held in memory. Tiles with no cell inside the mask are skipped.
     *
     * <p>Cost: local neighbourhoods factorise each distinct neighbour set once per tile. With the
     * global neighbourhood and the variance off, the dual form costs O(nK) per cell after one
     * factorisation; with the variance on, each cell needs a triangular solve of order n (O(n²)),
     * which is only sensible for small grids.
     *
     * @throws IllegalArgumentException for a universal drift with external covariates (use
     *                                  {@link #predictGrid(Grid, CovariateGrid, GridOptions, Consumer)})
     */
    public void predictGrid(Grid grid, GridOptions gridOptions, Consumer<GridTile> consumer) {
        GridTiles.run(this, grid, gridOptions, consumer);
    }

    /**
     * Kriging with an external drift on a grid: as {@link #predictGrid(Grid, GridOptions, Consumer)},
     * with the drift's covariates at every cell from the covariate grid (standardised as at the
     * data locations, see {@link #driftCoefficients()}).
     *
     * @throws IllegalArgumentException if the drift has no external covariates, the covariate grid
     *                                  does not match the grid or the drift's covariate count, or a
     *                                  cell's covariate is not finite (naming the cell)
     */
    public void predictGrid(Grid grid, CovariateGrid covariates, GridOptions gridOptions,
            Consumer<GridTile> consumer) {
        Objects.requireNonNull(covariates, "covariates");
        GridTiles.run(this, grid, gridOptions, covariates, t -> t, consumer);
    }

    // ------------------------------------------------------------------ cross-validation

    /**
     * Leave-one-out cross-validation: the fast formulas of Dubrule (1983) for the global
     * neighbourhood ({@link LeaveOneOut#fast}), refitting per location otherwise.
     */
    public CrossValidation crossValidate() {
        return crossValidate(ProgressListener.NONE);
    }

    /**
     * {@link #crossValidate()} with a listener that receives its progress: task
     * {@code "cross-validation"}, done = locations left out so far, total = number of locations
     * (the fast formulas report once, at the end). Calls may come from worker threads (they are
     * serialised, and done is non-decreasing). The listener does not change any result.
     *
     * @param listener a thread-safe listener, or {@link ProgressListener#NONE}
     */
    public CrossValidation crossValidate(ProgressListener listener) {
        return LeaveOneOut.crossValidate(this, listener);
    }

    /**
     * Cross-validates each candidate model with the same data and options (model comparison by
     * cross-validation); results in the order of the models.
     */
    public static List<CrossValidation> compareModels(Locations locations, DensitySet densities,
            List<VariogramModel> models, KrigingOptions options) {
        List<CrossValidation> out = new ArrayList<>();
        for (VariogramModel m : models) {
            out.add(ordinary(locations, densities, m, options).crossValidate());
        }
        return out;
    }

    /**
     * Generalised-least-squares drift coefficients β̂ = (FᵀC⁻¹F)⁻¹FᵀC⁻¹Y from the global system
     * (p × K; p = 0 for simple kriging), of the drift functions as {@link Drift} defines them:
     * monomials of the centred and scaled coordinates, then the covariates in their own units.
     *
     * @throws DensaException if a covariate's coefficient in the covariate's own units overflows a
     *                        double (covariate values far below 1e-300)
     */
    public double[][] driftCoefficients() {
        return design.inOwnUnits(globalSystem().driftCoefficients(), k, n);
    }

    /** Drift residuals Y − F β̂ (row-major n × K) of the GLS drift, for re-estimating the residual variogram. */
    double[] driftResiduals() {
        return design.residuals(y, globalSystem().driftCoefficients(), n, k);
    }

    // ------------------------------------------------------------------ accessors

    /** The kriging variant. */
    public Type type() {
        return type;
    }

    /** The variogram model. */
    public VariogramModel model() {
        return model;
    }

    /** The data locations. */
    public Locations locations() {
        return loc;
    }

    /** The data's space. */
    public BayesSpace space() {
        return space;
    }

    /** Number of data locations. */
    public int size() {
        return n;
    }

    /** The data densities (without ids; the space's coordinates as given, fresh copies). */
    public DensitySet densities() {
        return DensitySet.ofRowMajor(space, y.clone(), n, null);
    }

    /** The known mean density of simple kriging, or null for ordinary and universal kriging. */
    public Density mean() {
        return type == Type.SIMPLE ? space.density(centre.clone()) : null;
    }

    /** The options. */
    public KrigingOptions options() {
        return options;
    }

    /** The drift (null for simple kriging). */
    public Drift drift() {
        return drift;
    }

    @Override
    public String toString() {
        return "Kriging[" + type + ", n=" + n + ", " + model + ", " + options.neighbourhood() + "]";
    }
}
