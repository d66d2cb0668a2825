package io.densa.spatial.uncertainty;

import io.densa.spatial.kriging.CovariateGrid;
import io.densa.spatial.kriging.FieldSimulator;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.GridTiles;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.KrigingPrediction;
import io.densa.spatial.variogram.VariogramOptions;
import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.Seeds;
import java.util.List;
import java.util.Objects;
import java.util.function.Consumer;
import java.util.function.ToDoubleFunction;

/**
 * The predictive distribution of the densities kriged by a {@link Kriging}: a Gaussian law of the
 * coordinates at every location, and Monte Carlo summaries (central intervals, means, standard
 * deviations) of the quantities an analyst reads off a density — quantiles, exceedance
 * probabilities, means — at locations and on grids.
 *
 * <h2>Model</h2>
 * The kriging variance σ²(s₀) = E‖X(s₀) ⊖ X̂(s₀)‖²_B is the trace of the error's coordinate
 * covariance; the covariance itself is identifiable under the <b>proportional covariance</b>
 * (intrinsic coregionalisation) model, in which all K coordinates share one spatial correlation:
 * Cov(X_a(s), X_b(s + h)) = Σ_ab ρ(h), or in variogram form γ_ab(h) = Σ_ab g(h), with Σ the
 * K × K covariance of the coordinates (Wackernagel (2003), Multivariate Geostatistics, 3rd ed.,
 * Springer, the intrinsic correlation model — from memory). The trace-variogram is then
 * γ(h) = tr Σ · g(h), the trace-kriging weights of Giraldo, Delicado &amp; Mateu (2011), Ordinary
 * kriging for function-valued spatial data, Environ. Ecol. Stat. 18 (from memory) are the kriging
 * weights of every coordinate (and cokriging reduces to them), and the prediction error e has
 * covariance
 * <pre>  Cov(e) = σ²(s₀) · Σ / tr Σ.</pre>
 * Measurement-error variances ({@link KrigingOptions#withErrorVariances}) are assumed proportional
 * to Σ as well. With a Gaussian field, X(s₀) given the data is N(X̂(s₀), σ² Σ/tr Σ) in coordinates
 * (exactly for simple kriging with known covariance; for ordinary and universal kriging this is
 * the predictive law with the drift coefficients integrated out under a flat prior, the usual
 * reading of the kriging variance). The shape Σ/tr Σ is estimated by RᵀR/tr(RᵀR) from the drift
 * residuals R (ordinary least squares; the data minus the known mean for simple kriging), which
 * is unbiased up to scale under the model, or given by the caller. {@link #checkProportionality}
 * tests the model on the data.
 *
 * <h2>Monte Carlo summaries</h2>
 * Draw d at a location is the density with coordinates X̂ + σ F z_d (F Fᵀ = Σ/tr Σ, z_d standard
 * normal); each quantity of {@link UncertaintyOptions} is evaluated on every draw and summarised
 * by a {@link DerivedInterval}: the plug-in value at X̂, the mean and standard deviation over the
 * draws and the central interval between their (1 ∓ level)/2 sample quantiles. The normals of
 * location i of {@link #summarise(double[], double[], double[][], UncertaintyOptions)} come from
 * stream i of the seed (io.densa.core.internal.Seeds), those of grid cell (column c, row r) from
 * stream r·columns + c, so results depend neither on threads nor on tiling.
 *
 * <p><b>Evaluation error.</b> With {@link UncertaintyOptions.Evaluation#NODE_RULE} (the default)
 * each draw is evaluated on a fixed Gauss–Legendre node set whose panels end at the basis
 * breakpoints and at the thresholds; a draw whose estimated rule error exceeds 10⁻⁴ of its mass
 * is evaluated again with every panel cut into 4, then 16 (the error of a q-point panel falls as
 * the (2q+1)-th power of its width), and only a draw that fails those too with the space's exact
 * methods, about a hundred times slower (counted in {@link LocationUncertainty#exactDraws()}; with
 * peaked predictions — K = 11 cubic splines, kriged clr ranging over ten and more — the refined
 * rules made a grid 7.9 times faster, and at a prediction spread of 5 B2 units on study 2's space
 * they left 23 of 1,020 draws to the exact methods, against 549 with the rule alone). Measured
 * against the exact methods on the same draws
 * (cubic splines with 8 and 29 interior knots, quadratic splines, polynomials, steps, uniform and
 * normal references; kriging standard deviations up to 5 B2 units; see the tests), quantiles
 * agreed to within 10⁻⁴ of the domain's length and exceedance probabilities and means to within
 * 10⁻⁵ (of the length for means): far below the Monte Carlo error of a few hundred draws (an end
 * of a 90 % interval from 200 draws has a standard error of about 0.15 predictive standard
 * deviations: √(0.05 · 0.95 / 200) / φ(1.645)).
 *
 * <p>Immutable and thread-safe.
 */
public final class PredictiveDistribution {
    private final Kriging kriging;
    private final double[] shape;
    private final double[] eigenvalues;
    private final double[] factor;
    private final int rank;

    private PredictiveDistribution(Kriging kriging, double[] shape) {
        this.kriging = kriging;
        this.shape = shape;
        int k = kriging.dimension();
        SymmetricEigen eig = SymmetricEigen.of(shape, k);
        this.eigenvalues = eig.values();
        double[] f = eig.factor();
        this.rank = f.length / k;
        this.factor = f;
    }

    /**
     * The predictive distribution with the coordinate covariance shape estimated from the data's
     * drift residuals (see the class comment).
     *
     * @throws IllegalArgumentException if the residuals are all zero (the coordinates do not vary
     *                                  around the drift)
     */
    public static PredictiveDistribution of(Kriging kriging) {
        Objects.requireNonNull(kriging, "kriging");
        FieldSimulator sim = FieldSimulator.of(kriging);
        double[] s = SymmetricEigen.shape(sim.dataResiduals(), kriging.size(), kriging.dimension());
        if (s == null) {
            throw new IllegalArgumentException("the coordinates' drift residuals are all zero (or overflow): the"
                    + " coordinate covariance shape cannot be estimated; give it with of(kriging, covariance)");
        }
        return new PredictiveDistribution(kriging, s);
    }

    /**
     * The predictive distribution with a given coordinate covariance Σ (any positive scale; only
     * Σ/tr Σ is used).
     *
     * @throws IllegalArgumentException unless Σ is K × K, finite, symmetric (to 10⁻¹⁰ of its
     *                                  largest entry), positive semi-definite and of positive trace
     */
    public static PredictiveDistribution of(Kriging kriging, double[][] covariance) {
        Objects.requireNonNull(kriging, "kriging");
        Objects.requireNonNull(covariance, "covariance");
        int k = kriging.dimension();
        if (covariance.length != k) {
            throw new IllegalArgumentException("coordinate covariance must be " + k + " x " + k + ", got "
                    + covariance.length + " rows");
        }
        double[] s = new double[k * k];
        double big = 0;
        for (int i = 0; i < k; i++) {
            if (covariance[i] == null || covariance[i].length != k) {
                throw new IllegalArgumentException("coordinate covariance row " + i + " must have " + k + " entries");
            }
            for (int j = 0; j < k; j++) {
                double v = covariance[i][j];
                if (!Double.isFinite(v)) {
                    throw new IllegalArgumentException("coordinate covariance entry (" + i + ", " + j
                            + ") is not finite: " + v);
                }
                s[i * k + j] = v;
                big = Math.max(big, Math.abs(v));
            }
        }
        double tr = 0;
        for (int i = 0; i < k; i++) {
            tr += s[i * k + i];
            for (int j = 0; j < i; j++) {
                if (Math.abs(s[i * k + j] - s[j * k + i]) > 1e-10 * big) {
                    throw new IllegalArgumentException("coordinate covariance is not symmetric: entries (" + i + ", "
                            + j + ") and (" + j + ", " + i + ") are " + s[i * k + j] + " and " + s[j * k + i]);
                }
            }
        }
        if (!(tr > 0) || Double.isInfinite(tr)) {
            throw new IllegalArgumentException("coordinate covariance must have a finite positive trace, got " + tr);
        }
        for (int i = 0; i < s.length; i++) {
            s[i] /= tr;
        }
        SymmetricEigen eig = SymmetricEigen.of(s, k);
        double low = eig.values()[k - 1];
        if (low < -1e-10 * eig.values()[0]) {
            throw new IllegalArgumentException("coordinate covariance is not positive semi-definite (its smallest"
                    + " eigenvalue relative to the trace is " + low + ")");
        }
        return new PredictiveDistribution(kriging, s);
    }

    /** The kriging predictor. */
    public Kriging kriging() {
        return kriging;
    }

    /** The shape Σ/tr Σ of the coordinate covariance (K × K, trace 1; a copy). */
    public double[][] shape() {
        int k = kriging.dimension();
        double[][] out = new double[k][k];
        for (int i = 0; i < k; i++) {
            System.arraycopy(shape, i * k, out[i], 0, k);
        }
        return out;
    }

    /** Eigenvalues of the shape, decreasing (shares of the trace along its principal directions). */
    public double[] shapeEigenvalues() {
        return eigenvalues.clone();
    }

    /**
     * Number r of principal directions the draws use: all but the trailing ones that together hold
     * at most 10⁻⁶ of the trace (their omission changes the predictive covariance by at most 10⁻⁶
     * of the kriging variance).
     */
    public int rank() {
        return rank;
    }

    /** The Gaussian law of the coordinates at a target (no external covariates). */
    public CoordinateLaw at(double x, double y) {
        return law(kriging.predict(x, y));
    }

    /** The Gaussian law of the coordinates at a target with the drift's covariates there. */
    public CoordinateLaw at(double x, double y, double[] covariates) {
        return law(kriging.predict(x, y, covariates));
    }

    private CoordinateLaw law(KrigingPrediction pr) {
        int k = kriging.dimension();
        double[][] cov = new double[k][k];
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                cov[i][j] = pr.variance() * shape[i * k + j];
            }
        }
        return new CoordinateLaw(pr, cov);
    }

    /** Summaries at one target (stream 0 of the seed; no external covariates). */
    public LocationUncertainty summarise(double x, double y, UncertaintyOptions options) {
        return summarise(new double[] {x}, new double[] {y}, null, options).get(0);
    }

    /** Summaries at one target with the drift's covariates there (stream 0 of the seed). */
    public LocationUncertainty summarise(double x, double y, double[] covariates, UncertaintyOptions options) {
        Objects.requireNonNull(covariates, "covariates");
        return summarise(new double[] {x}, new double[] {y}, new double[][] {covariates}, options).get(0);
    }

    /**
     * Summaries at many targets, location i with stream i of the seed; locations are processed in
     * parallel (in blocks, results identical to the serial run) when the options allow.
     *
     * @param covariates per location the drift's covariates, or null when the drift has none
     * @throws IllegalArgumentException on mismatched lengths, a target that is not finite, or no
     *                                  quantity in the options
     * @throws DensaException           naming the location when kriging or a draw's evaluation fails
     */
    public List<LocationUncertainty> summarise(double[] xs, double[] ys, double[][] covariates,
            UncertaintyOptions options) {
        Objects.requireNonNull(xs, "xs");
        Objects.requireNonNull(ys, "ys");
        Objects.requireNonNull(options, "options");
        if (xs.length != ys.length || (covariates != null && covariates.length != xs.length)) {
            throw new IllegalArgumentException("xs (" + xs.length + "), ys (" + ys.length + ")"
                    + (covariates == null ? "" : " and covariates (" + covariates.length + ")") + " differ in length");
        }
        DrawEngine engine = engine(options);
        int n = xs.length;
        LocationUncertainty[] out = new LocationUncertainty[n];
        int block = 16;
        int blocks = (n + block - 1) / block;
        Kernels.forEachBlock(blocks, options.parallel() && n > 1, b -> {
            DrawEngine.Scratch s = engine.scratch();
            for (int i = b * block; i < Math.min(n, b * block + block); i++) {
                KrigingPrediction pr = covariates == null ? kriging.predict(xs[i], ys[i])
                        : kriging.predict(xs[i], ys[i], covariates[i]);
                try {
                    engine.evaluate(pr.density().coordinates(), 0, pr.variance(), i, s);
                } catch (DensaException e) {
                    throw new DensaException("location " + i + " (" + xs[i] + ", " + ys[i] + "): " + e.getMessage(),
                            e.diagnostics());
                }
                out[i] = result(law(pr), engine, s);
            }
        });
        return List.of(out);
    }

    private static LocationUncertainty result(CoordinateLaw law, DrawEngine engine, DrawEngine.Scratch s) {
        int p = engine.probs.length, t = engine.thresholds.length;
        return new LocationUncertainty(law, engine.intervals(s, 0, p), engine.intervals(s, p, t),
                engine.mean ? engine.intervals(s, p + t, 1).get(0) : null, s.exact);
    }

    private DrawEngine engine(UncertaintyOptions options) {
        BayesSpace space = kriging.space();
        if (rank == 0) {
            throw new IllegalArgumentException("the coordinate covariance shape has rank 0");
        }
        return new DrawEngine(space, factor, rank, options);
    }

    /**
     * Predicts a grid tile by tile ({@link Kriging#predictGrid}, with the kriging variance on) and
     * summarises every cell in the same pass, on the worker thread that kriged its tile; tiles
     * reach the consumer in tile order from the calling thread. Cell (column c, row r) uses stream
     * r·columns + c of the seed, so a location at the cell centre summarised as location
     * r·columns + c gives the same draws.
     *
     * @throws IllegalArgumentException as {@link Kriging#predictGrid}, or with no quantity
     * @throws DensaException           naming the cell when a draw's evaluation fails
     */
    public void summariseGrid(Grid grid, GridOptions gridOptions, UncertaintyOptions options,
            Consumer<UncertaintyTile> consumer) {
        summariseGrid(grid, null, gridOptions, options, consumer);
    }

    /**
     * {@link #summariseGrid(Grid, GridOptions, UncertaintyOptions, Consumer)} for a universal
     * kriging with external drift covariates, whose values at the cells the covariate grid gives
     * (null when the drift has none).
     */
    public void summariseGrid(Grid grid, CovariateGrid covariates, GridOptions gridOptions,
            UncertaintyOptions options, Consumer<UncertaintyTile> consumer) {
        Objects.requireNonNull(gridOptions, "gridOptions");
        summariseTiles(grid, covariates, gridOptions, options, 0, GridTiles.tileCount(grid, gridOptions), consumer);
    }

    /**
     * {@link #summariseGrid(Grid, CovariateGrid, GridOptions, UncertaintyOptions, Consumer)} for tiles
     * [from, to) only, numbered as by {@link GridTiles#predict}: tile t at tile column
     * t mod {@link GridTiles#tilesAcross}, tile row t / tilesAcross. A cell's draws depend only on its
     * column and row, so every tile is bit for bit the one the whole-grid call delivers, however the
     * grid is split (over threads, processes or machines).
     *
     * @param covariates the drift's covariates at every cell, or null when the drift has none
     * @throws IllegalArgumentException if the range is not within [0, {@link GridTiles#tileCount}), as
     *                                  {@link Kriging#predictGrid}, or with no quantity
     * @throws DensaException           naming the cell when a draw's evaluation fails
     */
    public void summariseTiles(Grid grid, CovariateGrid covariates, GridOptions gridOptions,
            UncertaintyOptions options, int from, int to, Consumer<UncertaintyTile> consumer) {
        Objects.requireNonNull(grid, "grid");
        Objects.requireNonNull(gridOptions, "gridOptions");
        Objects.requireNonNull(options, "options");
        Objects.requireNonNull(consumer, "consumer");
        DrawEngine engine = engine(options);
        long columns = grid.columns();
        GridTiles.map(kriging, grid, covariates, gridOptions.withVariance(true), from, to, tile -> {
            DrawEngine.Scratch s = engine.scratch();
            int m = tile.size();
            int nq = engine.probs.length, nt = engine.thresholds.length;
            IntervalLayer[] layers = new IntervalLayer[engine.quantities];
            double[][][] arr = new double[engine.quantities][5][m];
            int[] exact = new int[m];
            double[] coords = tile.predictions().coordinatesRowMajor();
            double[] v = new double[5];
            for (int c = 0; c < m; c++) {
                long stream = tile.rows()[c] * columns + tile.columns()[c];
                try {
                    engine.evaluate(coords, c * kriging.dimension(), tile.variances()[c], stream, s);
                } catch (DensaException e) {
                    throw new DensaException("grid cell (column " + tile.columns()[c] + ", row " + tile.rows()[c]
                            + "): " + e.getMessage(), e.diagnostics());
                }
                exact[c] = s.exact;
                for (int qi = 0; qi < engine.quantities; qi++) {
                    engine.summary(s, qi, options.level(), v);
                    for (int f = 0; f < 5; f++) {
                        arr[qi][f][c] = v[f];
                    }
                }
            }
            for (int qi = 0; qi < engine.quantities; qi++) {
                layers[qi] = new IntervalLayer(arr[qi][0], arr[qi][1], arr[qi][2], arr[qi][3], arr[qi][4]);
            }
            List<IntervalLayer> ql = List.of(java.util.Arrays.copyOfRange(layers, 0, nq));
            List<IntervalLayer> tl = List.of(java.util.Arrays.copyOfRange(layers, nq, nq + nt));
            return new UncertaintyTile(tile, ql, tl, engine.mean ? layers[nq + nt] : null, exact);
        }, consumer);
    }

    /**
     * Checks the proportional covariance model on the data: the variograms of the scores on the
     * leading principal directions of the shape against the trace-variogram, with a Monte Carlo
     * p-value (see {@link ProportionalityCheck}).
     *
     * @param options    the variogram bins (omnidirectional)
     * @param directions principal directions compared, 1 ≤ directions ≤ {@link #rank()}
     * @param replicates simulated fields under the model, ≥ 1
     * @param seed       seed of the simulations (replicate b uses stream b)
     */
    public ProportionalityCheck checkProportionality(VariogramOptions options, int directions, int replicates,
            long seed) {
        return ProportionalityCheck.run(this, options, directions, replicates, seed);
    }

    double[] factorInternal() {
        return factor;
    }

    /** Checks the number B of simulated fields of a model check: in [1, 100000]. */
    static void checkReplicates(int replicates) {
        if (replicates < 1 || replicates > 100_000) {
            throw new IllegalArgumentException("replicates must be in [1, 100000], got " + replicates);
        }
    }

    /**
     * The Monte Carlo p-value (1 + #{T* ≥ observed}) / (1 + B) of the model checks: B fields
     * simulated at the data locations with the shape factor (K × r, row-major), replicate b from
     * stream b of the seed, each reduced to its drift residuals in place and given to the statistic.
     *
     * @param parallel whether the replicates may run in the common pool (the result does not depend on it)
     */
    static double monteCarloPValue(FieldSimulator sim, double[] factor, int r, int replicates, long seed,
            boolean parallel, ToDoubleFunction<double[]> statistic, double observed) {
        double[] sims = new double[replicates];
        Kernels.forEachBlock(replicates, parallel && replicates > 1, b -> {
            double[] e = sim.simulate(factor, r, Seeds.stream(seed, b));
            sim.simulatedResiduals(e);
            sims[b] = statistic.applyAsDouble(e);
        });
        int above = 0;
        for (double t : sims) {
            above += t >= observed ? 1 : 0;
        }
        return (1.0 + above) / (1.0 + replicates);
    }
}
