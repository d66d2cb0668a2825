package io.densa.report.chart;

import io.densa.report.Numbers;
import io.densa.report.colour.Palette;
import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.regression.Fpca;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.variogram.VariogramModel;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Objects;

/**
 * Ready-made charts of Densa results: a unit's estimated density with its data, an estimate
 * against a baseline prediction, FPCA modes of variation, and fitted trace-variograms over the
 * empirical ones with the number of pairs per bin. Each figure names its quantities and units.
 *
 * <p>Stateless and thread-safe.
 */
public final class Figures {
    /** Points at which densities are evaluated across the domain. */
    static final int GRID = 240;

    private Figures() {
    }

    /**
     * A fitted and an empirical trace-variogram drawn together.
     *
     * @param name      legend text, e.g. "densities"
     * @param empirical the empirical trace-variogram (points, and pairs per bin in the lower panel)
     * @param fitted    the fitted model (line), or null for points only
     */
    public record VariogramLayer(String name, EmpiricalVariogram empirical, VariogramModel fitted) {
        /** Checks the components. */
        public VariogramLayer {
            Objects.requireNonNull(name, "name");
            Objects.requireNonNull(empirical, "empirical");
        }
    }

    /**
     * The y axis of a density over {@code x}: "density (per unit of x)"; for an axis of logged
     * amounts, per unit of their natural logarithm.
     */
    public static Axis densityAxis(Axis x) {
        String unit = switch (x.scale()) {
            case LINEAR, COUNT -> x.unit().isEmpty() ? "" : "per " + singular(x.unit());
            case LOG, LOGGED_DATA -> "per unit of ln(" + (x.unit().isEmpty() ? x.quantity() : x.unit()) + ")";
        };
        return Axis.linear("density", unit);
    }

    private static String singular(String unit) {
        return unit.endsWith("years") ? unit.substring(0, unit.length() - 1) : unit;
    }

    /** Midpoints of {@value #GRID} equal steps across the space's domain. */
    static double[] grid(BayesSpace space) {
        double[] x = new double[GRID];
        for (int i = 0; i < GRID; i++) {
            x[i] = space.lower() + (space.upper() - space.lower()) * (i + 0.5) / GRID;
        }
        return x;
    }

    /**
     * A unit's estimated density (line) with its data (points). On a periodic space the curve spans one
     * period from the space's start and the data's positions are taken modulo the period into it (the
     * midpoint of a bin that wraps around the cut point, e.g. 367.5 for [360, 375) on a year of 365
     * days from 0, is drawn at 2.5).
     *
     * @param title    chart title, e.g. the unit's name and size
     * @param estimate the estimated density
     * @param data     the unit's data on the density scale (null for none)
     * @param x        the domain's axis (quantity and unit)
     */
    public static Chart density(String title, Density estimate, Observed data, Axis x) {
        Objects.requireNonNull(estimate, "estimate");
        BayesSpace space = estimate.space();
        double[] g = grid(space);
        Chart c = Chart.of(title, x, densityAxis(x));
        if (data != null) {
            double[] px = data.x();
            if (space.isPeriodic()) {
                double a = space.lower(), p = space.period();
                for (int i = 0; i < px.length; i++) {
                    double y = a + ((px[i] - a) - p * Math.floor((px[i] - a) / p));
                    px[i] = y >= a + p || y < a ? a : y;
                }
            }
            c = c.points(data.name(), px, data.density());
        }
        return c.with(new Chart.Series("estimated density", g, estimate.pdf(g), Chart.Style.LINE, Palette.INK));
    }

    /**
     * A unit's estimated density (solid) against what a baseline model predicted for it (dashed),
     * with its data (points).
     */
    public static Chart baseline(String title, Density estimate, Density baseline, Observed data, Axis x) {
        Objects.requireNonNull(baseline, "baseline");
        double[] g = grid(baseline.space());
        return density(title, estimate, data, x)
                .with(new Chart.Series("baseline prediction", g, baseline.pdf(g), Chart.Style.DASHED, Palette.BRICK));
    }

    /**
     * Modes of variation of an FPCA on the clr scale: for each of the first {@code components}
     * components, the mean, the mean ⊕ {@code multiple} standard deviations along it (solid) and the
     * mean ⊖ as many (dashed), one chart per component titled with its share of variance.
     *
     * @param y the clr axis, e.g. {@code Axis.linear("clr of standardised residual", "log-ratio")}
     */
    public static ChartGrid fpcaModes(String title, Fpca pca, int components, double multiple, Axis x, Axis y) {
        Objects.requireNonNull(pca, "pca");
        if (components < 1 || components > pca.componentCount()) {
            throw new IllegalArgumentException("components must be in [1, " + pca.componentCount() + "], got "
                    + components);
        }
        if (!(multiple > 0 && Double.isFinite(multiple))) {
            throw new IllegalArgumentException("multiple of the standard deviation must be positive, got " + multiple);
        }
        double[] g = grid(pca.space());
        double[] ev = pca.explainedVariance();
        String t = Numbers.significant(multiple, 3);
        List<Chart> charts = new ArrayList<>();
        for (int j = 0; j < components; j++) {
            charts.add(Chart.of(String.format(Locale.ROOT, "Component %d (%.1f %% of variance)", j + 1, 100 * ev[j]),
                    x, y)
                    .with(new Chart.Series("mean", g, pca.mean().clr(g), Chart.Style.LINE, Palette.DATA))
                    .with(new Chart.Series("mean ⊕ " + t + " sd", g, pca.modeOfVariation(j, multiple).clr(g),
                            Chart.Style.LINE, Palette.INK))
                    .with(new Chart.Series("mean ⊖ " + t + " sd", g, pca.modeOfVariation(j, -multiple).clr(g),
                            Chart.Style.DASHED, Palette.BRICK)));
        }
        return ChartGrid.of(title, charts, Math.min(2, components));
    }

    /**
     * Fitted trace-variograms over the empirical ones, with the number of pairs per bin in a lower
     * panel. The first layer's model is drawn solid, the others dashed; each layer has its own
     * colour.
     *
     * @param lengthUnit unit of the distances, e.g. "km"
     */
    public static Chart variogram(String title, String lengthUnit, List<VariogramLayer> layers) {
        Objects.requireNonNull(lengthUnit, "lengthUnit");
        if (layers.isEmpty()) {
            throw new IllegalArgumentException("a variogram chart needs at least one layer");
        }
        double maxLag = 0;
        for (VariogramLayer l : layers) {
            double[] e = l.empirical().edges();
            maxLag = Math.max(maxLag, e[e.length - 1]);
        }
        double[] h = new double[200];
        for (int i = 0; i < h.length; i++) {
            h[i] = maxLag * (i + 1) / h.length; // from just above 0: the nugget is a jump at h = 0
        }
        Chart c = Chart.of(title, Axis.linear("distance h", lengthUnit),
                Axis.linear("semivariance γ(h)", "squared B2 norm")).yFromZero();
        for (int k = 0; k < layers.size(); k++) {
            VariogramLayer l = layers.get(k);
            java.awt.Color colour = Palette.categorical(k);
            c = c.with(new Chart.Series("empirical, " + l.name(), l.empirical().meanLags(),
                    l.empirical().semivariances(), Chart.Style.POINTS, colour));
            if (l.fitted() != null) {
                double[] g = new double[h.length];
                for (int i = 0; i < h.length; i++) {
                    g[i] = l.fitted().gamma(h[i]);
                }
                c = c.with(new Chart.Series("fitted, " + l.name(), h, g, k == 0 ? Chart.Style.LINE : Chart.Style.DASHED,
                        colour));
            }
            c = c.counts("pairs per bin", "pairs, " + l.name(), l.empirical().meanLags(), l.empirical().counts(),
                    colour);
        }
        return c;
    }
}
