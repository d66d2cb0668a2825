package io.densa.io.raster;

import io.densa.spatial.kriging.GridTile;
import java.util.Objects;
import java.util.function.DoubleUnaryOperator;
import java.util.function.ToDoubleFunction;

/**
 * One band of an exported prediction grid ({@link GridExport}): a per-cell quantity of the kriged
 * density — a quantile, an exceedance probability P(X &gt; t), the mean, the kriging variance or
 * standard deviation, or a caller function of the predicted coordinates — optionally mapped by a
 * function (e.g. {@code Math::exp} for quantiles of a log scale) and named.
 *
 * <p>Immutable.
 */
public final class GridBand {
    enum Kind { QUANTILE, EXCEEDANCE, MEAN, VARIANCE, SD, FUNCTION }

    final Kind kind;
    final double parameter;
    final ToDoubleFunction<double[]> function;
    final DoubleUnaryOperator map;
    private final String name;

    private GridBand(Kind kind, double parameter, ToDoubleFunction<double[]> function, DoubleUnaryOperator map,
            String name) {
        this.kind = kind;
        this.parameter = parameter;
        this.function = function;
        this.map = map;
        this.name = name;
    }

    /** The p-quantile of each cell's predicted density, p in (0, 1); named "q" + p. */
    public static GridBand quantile(double p) {
        if (!(p > 0 && p < 1)) {
            throw new IllegalArgumentException("quantile probability must be in (0, 1), got " + p);
        }
        return new GridBand(Kind.QUANTILE, p, null, null, "q" + p);
    }

    /** The median (0.5-quantile); named "median". */
    public static GridBand median() {
        return quantile(0.5).named("median");
    }

    /** P(X &gt; t) under each cell's predicted density; named "P(X>t)". */
    public static GridBand exceedance(double threshold) {
        if (!Double.isFinite(threshold)) {
            throw new IllegalArgumentException("threshold must be finite, got " + threshold);
        }
        return new GridBand(Kind.EXCEEDANCE, threshold, null, null, "P(X>" + threshold + ")");
    }

    /** The mean of each cell's predicted density; named "mean". */
    public static GridBand mean() {
        return new GridBand(Kind.MEAN, 0, null, null, "mean");
    }

    /** The kriging variance (in squared B2 norm); named "kriging_variance". */
    public static GridBand krigingVariance() {
        return new GridBand(Kind.VARIANCE, 0, null, null, "kriging_variance");
    }

    /** The kriging standard deviation √max(0, variance); named "kriging_sd". */
    public static GridBand krigingSd() {
        return new GridBand(Kind.SD, 0, null, null, "kriging_sd");
    }

    /**
     * A caller function of the predicted coordinates (K values in a scratch array it must not keep),
     * called from worker threads: it must be thread-safe.
     */
    public static GridBand of(String name, ToDoubleFunction<double[]> coordinatesFunction) {
        Objects.requireNonNull(coordinatesFunction, "coordinatesFunction");
        return new GridBand(Kind.FUNCTION, 0, coordinatesFunction, null, Objects.requireNonNull(name, "name"));
    }

    /** The same band under another name (printable ASCII, as {@link RasterLayout} requires). */
    public GridBand named(String n) {
        return new GridBand(kind, parameter, function, map, Objects.requireNonNull(n, "name"));
    }

    /** The band's values passed through f (applied after any earlier map). */
    public GridBand map(DoubleUnaryOperator f) {
        Objects.requireNonNull(f, "f");
        DoubleUnaryOperator m = map == null ? f : map.andThen(f);
        return new GridBand(kind, parameter, function, m, name);
    }

    /** The band name. */
    public String name() {
        return name;
    }

    /** v passed through the band's function (v itself without one). */
    double map(double v) {
        return map == null ? v : map.applyAsDouble(v);
    }

    /** The value of cell q of a tile, given where this band's quantity sits in the tile's arrays. */
    double value(GridTile t, int q, int index) {
        double v;
        switch (kind) {
            case QUANTILE:
                v = t.quantiles()[index][q];
                break;
            case EXCEEDANCE:
                v = t.tailProbabilities()[index][q];
                break;
            case MEAN:
                v = t.means()[q];
                break;
            case VARIANCE:
                v = t.variances()[q];
                break;
            case SD:
                v = Math.sqrt(Math.max(0, t.variances()[q]));
                break;
            default:
                v = t.cellValues()[index][q];
        }
        return map == null ? v : map.applyAsDouble(v);
    }

    @Override
    public String toString() {
        return "GridBand[" + name + "]";
    }
}
