package io.densa.spatial.kriging;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.core.ProgressListener;
import io.densa.core.internal.Cholesky;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.ProgressCounter;
import io.densa.spatial.Locations;
import io.densa.spatial.NeighbourIndex;
import io.densa.spatial.internal.GreatCircle;
import io.densa.spatial.internal.Scaling;
import io.densa.spatial.variogram.VariogramModel;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.function.Consumer;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.GeometryFactory;
import org.locationtech.jts.geom.Point;
import org.locationtech.jts.geom.Polygon;
import org.locationtech.jts.geom.prep.PreparedGeometry;
import org.locationtech.jts.geom.prep.PreparedGeometryFactory;

/**
 * Kriging of densities: the predictor X̂(s_0) = ⊕_i λ_i ⊙ X(s_i) has coordinates Σ_i λ_i c_i, so
 * every prediction is a density of the data's space. The weights solve the scalar kriging system
 * of the trace-covariance C(h) = sill − γ(h) of a {@link VariogramModel} (Giraldo, Delicado,
 * Mateu (2011), Ordinary kriging for function-valued spatial data, Environ. Ecol. Stat. 18 — from
 * memory; REFERENCES.md §7):
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

    private static final int STATION_MATRIX_LIMIT = 2500;

    final Type type;
    final Locations loc;
    final NeighbourIndex index;
    final BayesSpace space;
    final double[] y;
    final int n;
    final int k;
    final VariogramModel model;
    /** The model in units of 2^unitExponent (the sills scaled, exact): what the systems use. */
    private final VariogramModel unitModel;
    /** e of the scale 2^e (even) of covariances and variances in the systems. */
    private final int unitExponent;
    final Drift drift;
    final int p;
    private final double[] fRows;
    private final double[] covShift;
    private final double[] covUnit;
    private final double[] covSpread;
    private final double cx;
    private final double cy;
    private final double scale;
    private final double[] centre;
    private final double[] sx;
    private final double[] sy;
    private final double[] diagExtra; // in units of 2^unitExponent
    private final double[] diagExtraRaw; // in the data's units
    private final double[] errorVariances;
    final KrigingOptions options;
    final double c00;
    private final double pseudoSill;
    private volatile double[] stationCov;
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
        double[] ev = options.errorVariances();
        if (ev != null && ev.length != n) {
            throw new IllegalArgumentException("error variances have " + ev.length + " entries but there are " + n
                    + " locations");
        }
        this.errorVariances = ev == null ? new double[n] : ev;
        this.diagExtraRaw = new double[n];
        for (int i = 0; i < n; i++) {
            diagExtraRaw[i] = errorVariances[i] + options.coincidentNugget();
            if (!(diagExtraRaw[i] <= Double.MAX_VALUE)) {
                throw new IllegalArgumentException("the error variance of location " + i + " plus the coincident"
                        + " nugget (" + errorVariances[i] + " + " + options.coincidentNugget() + ") overflows a"
                        + " double; accepted are sums below about 1.8e308");
            }
        }
        this.centre = new double[k];
        if (type == Type.SIMPLE) {
            Objects.requireNonNull(mean, "mean");
            space.requireSame(mean.space(), "the mean density");
            System.arraycopy(mean.coordinates(), 0, centre, 0, k);
        }
        this.index = NeighbourIndex.of(loc);
        this.sx = loc.xs();
        this.sy = loc.ys();
        double[] bb = loc.boundingBox();
        this.cx = 0.5 * (bb[0] + bb[2]);
        this.cy = 0.5 * (bb[1] + bb[3]);
        double s = 0.5 * Math.max(bb[2] - bb[0], bb[3] - bb[1]);
        this.scale = s > 0 ? s : 1;
        double diam = distance(bb[0], bb[1], bb[2], bb[3]);
        double sill = model.bounded() ? model.sill() : 2 * gammaOrInfinity(model, Math.max(diam, 1e-300)) + 1;
        if (!(sill <= Double.MAX_VALUE)) {
            throw new IllegalArgumentException("the variogram " + model + " overflows a double at the largest"
                    + " distance between the data locations (" + diam + "); accepted are power models whose value"
                    + " there stays below about 1e308: rescale the coordinates or the data");
        }
        // an even exponent keeps the Cholesky factor's scale 2^(e/2) a power of two (exact)
        this.unitExponent = Math.getExponent(sill) & ~1;
        this.unitModel = model.scaledBy(-unitExponent);
        this.pseudoSill = Math.scalb(sill, -unitExponent);
        this.c00 = pseudoSill;
        this.diagExtra = new double[n];
        for (int i = 0; i < n; i++) {
            diagExtra[i] = Math.scalb(diagExtraRaw[i], -unitExponent);
            if (!(diagExtra[i] <= Double.MAX_VALUE)) {
                throw new IllegalArgumentException("the error variance of location " + i + " plus the coincident"
                        + " nugget (" + diagExtraRaw[i] + ") is too large beside the variogram's sill " + sill
                        + " (their ratio overflows a double); accepted are ratios below about 1e308");
            }
        }
        this.fRows = new double[n * p];
        int q = p > 0 ? drift.covariateCount() : 0;
        this.covShift = new double[q];
        this.covUnit = new double[q];
        this.covSpread = new double[q];
        standardiseCovariates(q);
        double[] cov = new double[q];
        for (int i = 0; i < n && p > 0; i++) {
            for (int j = 0; j < q; j++) {
                cov[j] = standardised(j, drift.covariate(i, j));
            }
            drift.evaluate((loc.x(i) - cx) / scale, (loc.y(i) - cy) / scale, cov, fRows, i * p);
        }
        if (p > 1) {
            int dep = dependentColumn(fRows, n, p, null);
            if (dep >= 0) {
                throw new IllegalArgumentException(dependentMessage(dep, n));
            }
        }
        checkCoincident();
    }

    /**
     * Drift covariates enter the drift standardised, (c / u − shift) / spread with u the power of two
     * of the column's largest |value| and shift, spread the mean and largest deviation of c / u
     * (columns near 1e300 or 1e-300 neither overflow nor underflow F'C⁻¹F): with the constant term
     * always in the drift this spans the same functions, so predictions are unchanged, and
     * {@link #driftCoefficients()} converts the coefficients back to the covariates' own units.
     *
     * @throws IllegalArgumentException naming a covariate that is constant over the data locations
     */
    private void standardiseCovariates(int q) {
        for (int j = 0; j < q; j++) {
            double max = 0;
            for (int i = 0; i < n; i++) {
                max = Math.max(max, Math.abs(drift.covariate(i, j)));
            }
            double u = max > 0 ? Math.scalb(1.0, Math.getExponent(max)) : 1;
            double mean = 0;
            for (int i = 0; i < n; i++) {
                mean += drift.covariate(i, j) / u;
            }
            mean /= n;
            double spread = 0;
            for (int i = 0; i < n; i++) {
                spread = Math.max(spread, Math.abs(drift.covariate(i, j) / u - mean));
            }
            if (!(spread > 1e-13)) {
                throw new IllegalArgumentException("drift covariate " + j + " is constant over the " + n + " data"
                        + " locations (every value is " + drift.covariate(0, j) + "): it duplicates the constant term"
                        + " of the drift, so its coefficient is not identifiable; drop it");
            }
            covUnit[j] = u;
            covShift[j] = mean;
            covSpread[j] = spread;
        }
    }

    private double standardised(int j, double value) {
        return (value / covUnit[j] - covShift[j]) / covSpread[j];
    }

    /**
     * The first drift column (of the m × p row-major f, rows idx or all) that is a linear combination
     * of the earlier ones, by modified Gram–Schmidt with reorthogonalisation on the columns: column
     * j is dependent when its component orthogonal to the earlier columns has norm at most 10⁻⁹ of
     * its own; −1 if none. The columns are monomials of coordinates scaled to [−1, 1] and
     * standardised covariates, so the threshold is relative to columns of comparable size.
     */
    static int dependentColumn(double[] f, int m, int p, double[] work) {
        double[] qm = work != null && work.length >= m * p ? work : new double[m * p];
        for (int j = 0; j < p; j++) {
            double norm0 = 0;
            for (int r = 0; r < m; r++) {
                double v = f[r * p + j];
                qm[r * p + j] = v;
                norm0 += v * v;
            }
            norm0 = Math.sqrt(norm0);
            for (int pass = 0; pass < 2; pass++) {
                for (int i = 0; i < j; i++) {
                    double d = 0;
                    for (int r = 0; r < m; r++) {
                        d += qm[r * p + i] * qm[r * p + j];
                    }
                    for (int r = 0; r < m; r++) {
                        qm[r * p + j] -= d * qm[r * p + i];
                    }
                }
            }
            double norm = 0;
            for (int r = 0; r < m; r++) {
                norm += qm[r * p + j] * qm[r * p + j];
            }
            norm = Math.sqrt(norm);
            if (!(norm > 1e-9 * norm0)) {
                return j;
            }
            for (int r = 0; r < m; r++) {
                qm[r * p + j] /= norm;
            }
        }
        return -1;
    }

    /** The message for a drift column that the others determine over m locations. */
    String dependentMessage(int col, int m) {
        String name = drift.functionName(col);
        int q = col - drift.monomialCount();
        if (q >= 0) {
            return "drift covariate " + q + " is a linear combination of the earlier drift functions (" + earlier(col)
                    + ") over the " + m + " data locations, so its coefficient is not identifiable; drop it";
        }
        return "drift function " + name + " (column " + col + ") is a linear combination of the earlier drift"
                + " functions (" + earlier(col) + ") over the " + m + " data locations (for instance all of them on a"
                + " line), so its coefficient is not identifiable; use a lower drift degree or more locations";
    }

    private String earlier(int col) {
        StringBuilder sb = new StringBuilder();
        for (int j = 0; j < col; j++) {
            sb.append(j == 0 ? "" : ", ").append(drift.functionName(j));
        }
        return sb.toString();
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

    /**
     * Simple kriging with a known mean density (same space as the data); the model must be bounded.
     */
    public static Kriging simple(Locations locations, DensitySet densities, Density mean, VariogramModel model,
            KrigingOptions options) {
        return new Kriging(Type.SIMPLE, locations, densities, mean, model, null, options);
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

    double conditionLimit() {
        return options.conditionLimit();
    }

    double diagonalExtra(int i) {
        return diagExtra[i];
    }

    double errorVariance(int i) {
        return errorVariances[i];
    }

    void driftRow(int i, double[] out, int off) {
        System.arraycopy(fRows, i * p, out, off, p);
    }

    /** Drift vector at a target into out[0..p). */
    void driftAt(double x, double yy, double[] cov, double[] out) {
        if (p == 0) {
            return;
        }
        int q = drift.covariateCount();
        double[] sc = cov;
        if (q > 0) {
            if (cov == null || cov.length != q) {
                throw new IllegalArgumentException("the drift has " + q + " covariate(s); the target supplies "
                        + (cov == null ? "none" : cov.length));
            }
            sc = new double[q];
            for (int j = 0; j < q; j++) {
                if (!Double.isFinite(cov[j])) {
                    throw new IllegalArgumentException("target covariate " + j + " is not finite: " + cov[j]);
                }
                sc[j] = standardised(j, cov[j]);
            }
        }
        drift.evaluate((x - cx) / scale, (yy - cy) / scale, sc, out, 0);
        for (int j = 0; j < p; j++) {
            if (!Double.isFinite(out[j])) {
                throw new IllegalArgumentException("drift function " + drift.functionName(j) + " is not finite at"
                        + " target (" + x + ", " + yy + ") (" + out[j] + "): the target is too far from the data"
                        + " locations (their centre (" + cx + ", " + cy + "), half-width " + scale + ")");
            }
        }
    }

    /** Distance between two checked points, computed as {@link Locations} computes it. */
    private double distance(double x1, double y1, double x2, double y2) {
        return loc.kind() == Locations.Kind.PLANAR ? Scaling.planarNorm(x1 - x2, y1 - y2)
                : GreatCircle.km(x1, y1, x2, y2);
    }

    /** γ(h) (h &gt; 0), or +∞ where it exceeds the double range (reported by the caller). */
    private static double gammaOrInfinity(VariogramModel model, double h) {
        try {
            return model.gamma(h);
        } catch (IllegalArgumentException overflow) {
            return Double.POSITIVE_INFINITY;
        }
    }

    /** The (pseudo-)covariance at lag h; C(0) at h = 0. */
    double cov(double h) {
        return unitModel.pseudoCovariance(h, pseudoSill);
    }

    /** Distances from (x, y) to stations idx[0..m) (all stations 0..m−1 if idx is null) into out. */
    void distances(int[] idx, int m, double x, double yy, double[] out) {
        if (loc.kind() == Locations.Kind.PLANAR) {
            for (int r = 0; r < m; r++) {
                int i = idx == null ? r : idx[r];
                out[r] = Scaling.planarNorm(sx[i] - x, sy[i] - yy);
            }
        } else {
            for (int r = 0; r < m; r++) {
                int i = idx == null ? r : idx[r];
                out[r] = GreatCircle.km(sx[i], sy[i], x, yy);
            }
        }
    }

    /** Covariances from (x, y) to stations idx[0..m) (all if idx is null) into out; dist is scratch. */
    void targetCovariances(int[] idx, int m, double x, double yy, double[] dist, double[] out) {
        distances(idx, m, x, yy, dist);
        unitModel.pseudoCovariances(dist, m, pseudoSill, out);
    }

    double stationCovariance(int i, int j) {
        double[] sc = stationMatrix();
        return sc != null ? sc[i * n + j] : cov(loc.distance(i, j));
    }

    private double[] stationMatrix() {
        if (n > STATION_MATRIX_LIMIT) {
            return null;
        }
        double[] sc = stationCov;
        if (sc == null) {
            synchronized (this) {
                sc = stationCov;
                if (sc == null) {
                    double[] m = new double[n * n];
                    int blocks = (n + 63) / 64;
                    Kernels.forEachBlock(blocks, options.parallel() && n > 256, b -> {
                        double[] d = new double[n];
                        double[] row = new double[n];
                        for (int i = b * 64; i < Math.min(n, b * 64 + 64); i++) {
                            targetCovariances(null, n, loc.x(i), loc.y(i), d, row);
                            row[i] = c00;
                            System.arraycopy(row, 0, m, i * n, n);
                        }
                    });
                    stationCov = m;
                    sc = m;
                }
            }
        }
        return sc;
    }

    LocalSystem globalSystem() {
        LocalSystem g = global;
        if (g == null) {
            synchronized (this) {
                g = global;
                if (g == null) {
                    int[] all = new int[n];
                    for (int i = 0; i < n; i++) {
                        all[i] = i;
                    }
                    g = LocalSystem.build(this, all);
                    global = g;
                }
            }
        }
        return g;
    }

    /** Neighbour indices (ascending) for a target, leaving out location {@code exclude} (−1 for none). */
    int[] neighbours(double x, double yy, int exclude) {
        Neighbourhood hood = options.neighbourhood();
        int[] nb;
        switch (hood.kind()) {
            case GLOBAL: {
                nb = new int[exclude >= 0 ? n - 1 : n];
                int c = 0;
                for (int i = 0; i < n; i++) {
                    if (i != exclude) {
                        nb[c++] = i;
                    }
                }
                return nb;
            }
            case NEAREST:
                nb = index.nearest(x, yy, exclude >= 0 ? hood.count() + 1 : hood.count());
                break;
            default:
                nb = index.within(x, yy, hood.radius());
                break;
        }
        int[] kept = new int[nb.length];
        int c = 0;
        for (int j : nb) {
            if (j != exclude && c < hood.count()) {
                kept[c++] = j;
            }
        }
        nb = Arrays.copyOf(kept, c);
        int need = Math.max(1, p + 1);
        if (nb.length < Math.min(need, n - (exclude >= 0 ? 1 : 0))) {
            throw new DensaException("only " + nb.length + " data location(s) within radius " + hood.radius()
                    + " of target (" + x + ", " + yy + "); " + type + " kriging needs " + need,
                    new KrigingDiagnostics(nb.length, Double.NaN, nb, "too few neighbours"));
        }
        Arrays.sort(nb);
        return nb;
    }

    LocalSystem systemFor(int[] nb) {
        return options.neighbourhood().isGlobal() && nb.length == n ? globalSystem() : LocalSystem.build(this, nb);
    }

    private void checkTarget(double x, double yy) {
        loc.requirePoint(x, yy, "target");
    }

    private KrigingPrediction predictAt(double x, double yy, double[] covariates, int exclude, boolean withWeights) {
        checkTarget(x, yy);
        double[] f0 = new double[p];
        driftAt(x, yy, covariates, f0);
        int[] nb = neighbours(x, yy, exclude);
        LocalSystem sys = systemFor(nb);
        double[] c0 = new double[nb.length];
        double[] dist = new double[nb.length];
        targetCovariances(nb, nb.length, x, yy, dist, c0);
        double nearest = min(dist, nb.length);
        double[] out = new double[k];
        double[] w = withWeights ? new double[nb.length] : null;
        LocalSystem.Scratch sc = new LocalSystem.Scratch(p);
        double var = sys.predict(c0, f0, c00, centre, out, 0, w, sc);
        checkConstraints(sc.residual, x, yy, sys, nearest);
        if (w != null && p > 0) {
            checkConstraints(weightResidual(nb, w, f0), x, yy, sys, nearest);
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
                    new KrigingDiagnostics(sys.m, sys.condition, sys.idx.clone(), "kriging variance overflow"));
        }
        return v;
    }

    /** The predicted density from its coordinates, or a DensaException naming the target if one overflowed. */
    private Density density(double[] coords, double x, double yy, LocalSystem sys) {
        for (int c = 0; c < coords.length; c++) {
            if (!Double.isFinite(coords[c])) {
                throw new DensaException(String.format(java.util.Locale.ROOT, "%s kriging at target (%s, %s):"
                        + " predicted coordinate %d is %s (the weighted sum of the data's coordinates, up to %.4g in"
                        + " magnitude, overflows); rescale the densities' coordinates", type, x, yy, c, coords[c],
                        maxAbs(y)), new KrigingDiagnostics(sys.m, sys.condition, sys.idx.clone(),
                        "predicted coordinate overflow"));
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

    static double min(double[] a, int m) {
        double v = Double.POSITIVE_INFINITY;
        for (int i = 0; i < m; i++) {
            v = Math.min(v, a[i]);
        }
        return v;
    }

    /** max_j |Σ_r λ_r F_{idx[r], j} − f0_j| / max(1, |f0_j|) for the reported weights. */
    private double weightResidual(int[] idx, double[] w, double[] f0) {
        double worst = 0;
        for (int j = 0; j < p; j++) {
            double s = -f0[j];
            for (int r = 0; r < idx.length; r++) {
                s += fRows[idx[r] * p + j] * w[r];
            }
            worst = Math.max(worst, Math.abs(s) / Math.max(1, Math.abs(f0[j])));
        }
        return Double.isNaN(worst) ? Double.POSITIVE_INFINITY : worst;
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
                type, x, yy, residual, LocalSystem.CONSTRAINT_TOLERANCE, nearest, scale, drift),
                new KrigingDiagnostics(sys.m, sys.condition, sys.idx.clone(), "unbiasedness constraint residual "
                        + residual));
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
        Objects.requireNonNull(polygon, "polygon");
        if (polygon.isEmpty()) {
            throw new IllegalArgumentException("block polygon is empty");
        }
        if (!(spacing > 0) || Double.isInfinite(spacing)) {
            throw new IllegalArgumentException("block discretisation spacing must be finite and > 0, got " + spacing);
        }
        if (drift != null && drift.covariateCount() > 0 && type == Type.UNIVERSAL) {
            throw new IllegalArgumentException("block kriging with external drift covariates is not supported;"
                    + " use a polynomial drift");
        }
        double[][] pts = discretise(polygon, spacing);
        int m = pts.length;
        double nearest = Double.POSITIVE_INFINITY;
        for (double[] u : pts) {
            loc.requirePoint(u[0], u[1], "block point");
            nearest = Math.min(nearest, index.kthDistance(u[0], u[1], 1));
        }
        Point ip = polygon.getInteriorPoint();
        int[] nb = neighbours(ip.getX(), ip.getY(), -1);
        LocalSystem sys = systemFor(nb);
        double[] c0 = new double[nb.length];
        double[] f0 = new double[p];
        double[] fb = new double[p];
        double[] dist = new double[nb.length];
        double[] cu = new double[nb.length];
        for (double[] u : pts) {
            targetCovariances(nb, nb.length, u[0], u[1], dist, cu);
            for (int r = 0; r < nb.length; r++) {
                c0[r] += cu[r];
            }
            driftAt(u[0], u[1], null, fb);
            for (int j = 0; j < p; j++) {
                f0[j] += fb[j];
            }
        }
        for (int r = 0; r < nb.length; r++) {
            c0[r] /= m;
        }
        for (int j = 0; j < p; j++) {
            f0[j] /= m;
        }
        double cvv = 0;
        for (int a = 0; a < m; a++) {
            for (int b = 0; b < m; b++) {
                cvv += a == b ? c00 : cov(distance(pts[a][0], pts[a][1], pts[b][0], pts[b][1]));
            }
        }
        cvv /= (double) m * m;
        double[] out = new double[k];
        double[] w = new double[nb.length];
        LocalSystem.Scratch sc = new LocalSystem.Scratch(p);
        double var = sys.predict(c0, f0, cvv, centre, out, 0, w, sc);
        checkConstraints(sc.residual, ip.getX(), ip.getY(), sys, nearest);
        if (p > 0) {
            checkConstraints(weightResidual(nb, w, f0), ip.getX(), ip.getY(), sys, nearest);
        }
        return new KrigingPrediction(density(out, ip.getX(), ip.getY(), sys), variance(var, ip.getX(), ip.getY(), sys),
                nb, w, nearest);
    }

    /** Centres of a square grid of the given spacing covered by the polygon (package-private for tests). */
    static double[][] discretise(Polygon polygon, double spacing) {
        Envelope env = polygon.getEnvelopeInternal();
        long nx = (long) Math.ceil(env.getWidth() / spacing - 1e-9);
        long ny = (long) Math.ceil(env.getHeight() / spacing - 1e-9);
        nx = Math.max(1, nx);
        ny = Math.max(1, ny);
        if (nx * ny > 1L << 22) {
            throw new IllegalArgumentException("spacing " + spacing + " gives " + nx + " x " + ny
                    + " candidate points; use a coarser spacing");
        }
        PreparedGeometry prep = PreparedGeometryFactory.prepare(polygon);
        GeometryFactory gf = polygon.getFactory();
        double x0 = env.getMinX() + 0.5 * (env.getWidth() - (nx - 1) * spacing);
        double y0 = env.getMinY() + 0.5 * (env.getHeight() - (ny - 1) * spacing);
        List<double[]> pts = new ArrayList<>();
        for (long iy = 0; iy < ny; iy++) {
            for (long ix = 0; ix < nx; ix++) {
                double px = x0 + ix * spacing, py = y0 + iy * spacing;
                if (prep.covers(gf.createPoint(new Coordinate(px, py)))) {
                    pts.add(new double[] {px, py});
                    if (pts.size() > 4096) {
                        throw new IllegalArgumentException("spacing " + spacing + " puts more than 4096 points in"
                                + " the block; use a coarser spacing");
                    }
                }
            }
        }
        if (pts.isEmpty()) {
            Point ip = polygon.getInteriorPoint();
            pts.add(new double[] {ip.getX(), ip.getY()});
        }
        return pts.toArray(new double[0][]);
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
        GridPredictor.run(this, grid, gridOptions, consumer);
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
        GridPredictor.run(this, grid, gridOptions, covariates, t -> t, consumer);
    }

    // ------------------------------------------------------------------ cross-validation

    /**
     * Leave-one-out cross-validation: the fast formulas of Dubrule (1983) for the global
     * neighbourhood ({@link #leaveOneOutFast()}), refitting per location otherwise.
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
        Objects.requireNonNull(listener, "listener");
        ProgressCounter progress = new ProgressCounter(listener, "cross-validation", n);
        if (options.neighbourhood().isGlobal()) {
            CrossValidation cv = leaveOneOutFast();
            progress.advance(n);
            return cv;
        }
        return leaveOneOutBruteForce(progress);
    }

    /**
     * Fast leave-one-out for the global neighbourhood from one inverse of the kriging matrix
     * (Dubrule (1983), Cross validation of kriging in a unique neighborhood, Math. Geol. 15(6) —
     * from memory): with A the (bordered) kriging matrix, B = A⁻¹ and α the dual weights
     * B [Y; 0], the leave-one-out error at i is e_i = α_i / B_ii and the variance of predicting
     * the datum is 1 / B_ii (= σ²_{−i} + v_i). Here B_ii = (C⁻¹)_ii − u_iᵀ S⁻¹ u_i with U = C⁻¹F
     * and S = FᵀC⁻¹F, all from the one Cholesky factor of C.
     *
     * @throws IllegalArgumentException if the neighbourhood is not global
     */
    public CrossValidation leaveOneOutFast() {
        if (!options.neighbourhood().isGlobal()) {
            throw new IllegalArgumentException("fast leave-one-out needs the global neighbourhood"
                    + " (Neighbourhood.global()), got " + options.neighbourhood()
                    + "; use crossValidate() or leaveOneOutBruteForce() for local neighbourhoods");
        }
        if (n < p + 2) {
            throw new IllegalArgumentException("leave-one-out with " + p + " drift function(s) needs at least "
                    + (p + 2) + " locations, got " + n);
        }
        LocalSystem g = globalSystem();
        double[] l = g.l;
        // diag(C^{-1})_i = Σ_r (L^{-1})_{ri}^2 from the triangular inverse
        double[] diag = new double[n];
        double[] linv = new double[n];
        for (int col = 0; col < n; col++) {
            Cholesky.invertLowerColumn(l, n, col, linv);
            double s = 0;
            for (int r = col; r < n; r++) {
                s += linv[r] * linv[r];
            }
            diag[col] = s;
        }
        // U = L^{-T} G (n × p), beta = S^{-1} Gᵀ LY (p × k), alpha = L^{-T}(LY − G beta)
        double[] u = new double[n * p];
        double[] col = new double[n];
        for (int j = 0; j < p; j++) {
            for (int r = 0; r < n; r++) {
                col[r] = g.g[r * p + j];
            }
            Cholesky.backward(l, n, n, col, 0);
            for (int r = 0; r < n; r++) {
                u[r * p + j] = col[r];
            }
        }
        double[] alpha = dualWeights(driftCoefficientsFlat());
        double[][] err = new double[n][k];
        double[] var = new double[n];
        for (int i = 0; i < n; i++) {
            System.arraycopy(alpha, i * k, err[i], 0, k);
        }
        for (int i = 0; i < n; i++) {
            double b = diag[i];
            for (int a = 0; a < p; a++) {
                double s = 0;
                for (int j = 0; j < p; j++) {
                    s += g.sInv[a * p + j] * u[i * p + j];
                }
                b -= u[i * p + a] * s;
            }
            for (int c = 0; c < k; c++) {
                err[i][c] /= b;
            }
            var[i] = Math.scalb(Math.max(0, 1 / b - diagExtra[i]), unitExponent);
        }
        return CrossValidation.of(err, var, diagExtraRaw.clone());
    }

    /**
     * Leave-one-out by refitting: for each location, kriging from the others (within this
     * neighbourhood) at its position. Locations are processed in parallel, each writing its own row.
     */
    public CrossValidation leaveOneOutBruteForce() {
        return leaveOneOutBruteForce(new ProgressCounter(ProgressListener.NONE, "cross-validation", n));
    }

    private CrossValidation leaveOneOutBruteForce(ProgressCounter progress) {
        if (n < p + 2) {
            throw new IllegalArgumentException("leave-one-out with " + p + " drift function(s) needs at least "
                    + (p + 2) + " locations, got " + n);
        }
        double[][] err = new double[n][k];
        double[] var = new double[n];
        int q = drift == null ? 0 : drift.covariateCount();
        Kernels.forEachBlock(n, options.parallel() && n >= 32, i -> {
            double[] cov = new double[q];
            for (int j = 0; j < q; j++) {
                cov[j] = drift.covariate(i, j);
            }
            KrigingPrediction pr = predictAt(loc.x(i), loc.y(i), q > 0 ? cov : null, i, false);
            double[] c = pr.density().coordinates();
            for (int j = 0; j < k; j++) {
                err[i][j] = y[i * k + j] - c[j];
            }
            var[i] = pr.variance();
            progress.advance(1);
        });
        return CrossValidation.of(err, var, diagExtraRaw.clone());
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
        double[] flat = driftCoefficientsFlat();
        double[][] beta = new double[p][k];
        for (int j = 0; j < p; j++) {
            System.arraycopy(flat, j * k, beta[j], 0, k);
        }
        int mono = p - covUnit.length;
        for (int j = 0; j < covUnit.length; j++) {
            for (int c = 0; c < k; c++) {
                double b = beta[mono + j][c] / covSpread[j];
                beta[0][c] -= b * covShift[j];
                beta[mono + j][c] = b / covUnit[j];
                if (!Double.isFinite(beta[mono + j][c]) || !Double.isFinite(beta[0][c])) {
                    throw new DensaException("the coefficient of drift covariate " + j + " overflows a double in the"
                            + " covariate's units (values up to " + covUnit[j] + ")",
                            new KrigingDiagnostics(n, Double.NaN, new int[0], "drift coefficient overflow"));
                }
            }
        }
        return beta;
    }

    /** β̂ = S⁻¹ Gᵀ L⁻¹Y, row-major p × K. */
    double[] driftCoefficientsFlat() {
        LocalSystem g = globalSystem();
        double[] gty = new double[p * k];
        for (int r = 0; r < n; r++) {
            for (int j = 0; j < p; j++) {
                double gj = g.g[r * p + j];
                for (int c = 0; c < k; c++) {
                    gty[j * k + c] += gj * g.ly[r * k + c];
                }
            }
        }
        double[] beta = new double[p * k];
        for (int i = 0; i < p; i++) {
            for (int j = 0; j < p; j++) {
                double si = g.sInv[i * p + j];
                for (int c = 0; c < k; c++) {
                    beta[i * k + c] += si * gty[j * k + c];
                }
            }
        }
        return beta;
    }

    /**
     * Dual weights α = C⁻¹(Y − m − Fβ̂) = L⁻ᵀ(L⁻¹Y − Gβ̂) (row-major n × K) of the global system, so
     * that the prediction at s_0 is m + c0ᵀα + f0ᵀβ̂.
     */
    double[] dualWeights(double[] beta) {
        LocalSystem g = globalSystem();
        double[] a = new double[n * k];
        double[] col = new double[n];
        for (int c = 0; c < k; c++) {
            for (int r = 0; r < n; r++) {
                double s = g.ly[r * k + c];
                for (int j = 0; j < p; j++) {
                    s -= g.g[r * p + j] * beta[j * k + c];
                }
                col[r] = s;
            }
            Cholesky.backward(g.l, n, n, col, 0);
            for (int r = 0; r < n; r++) {
                a[r * k + c] = col[r];
            }
        }
        return a;
    }

    /** Drift residuals Y − F β̂ (row-major n × K) of the GLS drift, for re-estimating the residual variogram. */
    double[] driftResiduals() {
        double[] beta = driftCoefficientsFlat();
        double[] r = y.clone();
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < p; j++) {
                double f = fRows[i * p + j];
                for (int c = 0; c < k; c++) {
                    r[i * k + c] -= f * beta[j * k + c];
                }
            }
        }
        return r;
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
