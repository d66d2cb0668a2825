package io.densa.report.map;

import io.densa.report.Numbers;
import io.densa.report.colour.ColourRamp;
import io.densa.report.colour.ColourScale;
import io.densa.report.colour.Oklab;
import io.densa.report.colour.Palette;
import io.densa.spatial.autocorrelation.LocalMoran;
import java.awt.Color;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;

/**
 * Ready-made maps: choropleths of any unit value, category maps with counts, local-cluster maps,
 * grid maps, interval maps and point maps. Each returns a {@link MapFigure} with its legend
 * (quantity, unit, round ticks, counts per class), a scale bar and a north arrow.
 *
 * <p>Stateless and thread-safe; arrays are not modified.
 */
public final class Maps {
    private static final Color BORDER = new Color(255, 255, 255, 170);

    private Maps() {
    }

    /**
     * A choropleth: each unit filled by its value on the scale; units without a value (NaN) are
     * grey and counted in the legend.
     *
     * @param frame  the units
     * @param values one value per unit
     * @param scale  the colours, with the quantity and its unit
     * @param title  the map's title
     */
    public static MapFigure choropleth(MapFrame frame, double[] values, ColourScale scale, String title) {
        Objects.requireNonNull(values, "values");
        Objects.requireNonNull(scale, "scale");
        frame.checkLength(values.length, "choropleth '" + title + "'");
        Color[] fills = new Color[values.length];
        int missing = 0;
        for (int i = 0; i < values.length; i++) {
            if (Double.isInfinite(values[i])) {
                throw new IllegalArgumentException("choropleth '" + title + "': unit " + i + " has value " + values[i]
                        + "; give a finite value or NaN for none");
            }
            fills[i] = scale.colour(values[i]);
            if (Double.isNaN(values[i])) {
                missing++;
            }
        }
        List<MapFigure.LegendItem> legend = new ArrayList<>();
        legend.add(c -> c.colourBar(scale));
        if (missing > 0) {
            int m = missing;
            legend.add(c -> c.legendEntry("no value (" + m + ")", Palette.NO_DATA, MapCanvas.Hatch.NONE,
                    Palette.MUTED, 0.8f));
        }
        return MapFigure.single(frame, title, List.of((c, p) -> c.fill(p, frame.units(), fills, BORDER, 0.6f)),
                legend);
    }

    /**
     * A category map: each unit filled by the colour of its category; the legend gives each label
     * with the number of units in it.
     *
     * @param category one index into {@code labels} per unit
     * @param labels   the categories' names
     * @param colours  one colour per category
     * @param heading  the legend's heading
     */
    public static MapFigure categories(MapFrame frame, int[] category, String[] labels, Color[] colours,
            String heading, String title) {
        Objects.requireNonNull(category, "category");
        frame.checkLength(category.length, "category map '" + title + "'");
        if (labels.length != colours.length || labels.length == 0) {
            throw new IllegalArgumentException("category map '" + title + "': " + labels.length + " labels and "
                    + colours.length + " colours; give one colour per label");
        }
        int[] counts = new int[labels.length];
        Color[] fills = new Color[category.length];
        for (int i = 0; i < category.length; i++) {
            if (category[i] < 0 || category[i] >= labels.length) {
                throw new IllegalArgumentException("category map '" + title + "': unit " + i + " has category "
                        + category[i] + ", accepted 0.." + (labels.length - 1));
            }
            counts[category[i]]++;
            fills[i] = colours[category[i]];
        }
        String[] l = labels.clone();
        Color[] col = colours.clone();
        List<MapFigure.LegendItem> legend = new ArrayList<>();
        legend.add(c -> c.legendHeading(heading));
        for (int k = 0; k < l.length; k++) {
            int kk = k;
            legend.add(c -> c.legendEntry(l[kk] + " (" + counts[kk] + ")", col[kk], MapCanvas.Hatch.NONE,
                    Palette.MUTED, 0.8f));
        }
        return MapFigure.single(frame, title, List.of((c, p) -> c.fill(p, frame.units(), fills,
                new Color(0x8a8f96), 0.6f)), legend);
    }

    /**
     * A local-cluster map of local Moran's I in Densa's own visual language. The fill is the
     * local statistic I_i on the diverging ramp (brick: a unit like its neighbours; blue: a unit
     * unlike them); units significant at false discovery rate {@code fdr} carry a heavy outline,
     * and their type is a line pattern: rising lines for a raised unit among raised neighbours,
     * falling lines for a lowered unit among lowered neighbours, horizontal lines for a raised unit
     * among lowered neighbours and vertical lines for a lowered unit among raised neighbours (the
     * two kinds of outlier are kept apart). The legend counts each class.
     *
     * @param result    local Moran's I of the units of the frame, in the same order
     * @param fdr       false discovery rate for the Benjamini–Hochberg adjusted p-values, in (0, 1]
     * @param valueName what was analysed, e.g. "log anomaly score"
     */
    public static MapFigure clusters(MapFrame frame, LocalMoran.Result result, double fdr, String valueName,
            String title) {
        Objects.requireNonNull(result, "result");
        if (!(fdr > 0 && fdr <= 1)) {
            throw new IllegalArgumentException("false discovery rate must be in (0, 1], got " + fdr);
        }
        int n = frame.size();
        double[] stat = new double[n];
        Arrays.fill(stat, Double.NaN);
        MapCanvas.Hatch[] hatch = new MapCanvas.Hatch[n];
        Arrays.fill(hatch, MapCanvas.Hatch.NONE);
        boolean[] significant = new boolean[n];
        int[] counts = new int[5];
        double[] abs = new double[result.units().size()];
        int k = 0;
        for (LocalMoran.Unit u : result.units()) {
            if (u.index() < 0 || u.index() >= n) {
                throw new IllegalArgumentException("cluster map '" + title + "': result has unit index " + u.index()
                        + " but the map has " + n + " units");
            }
            stat[u.index()] = u.statistic();
            abs[k++] = Math.abs(u.statistic());
            int cls = 4;
            if (u.adjustedPValue() <= fdr) {
                cls = switch (u.quadrant()) {
                    case HIGH_HIGH -> 0;
                    case LOW_LOW -> 1;
                    case HIGH_LOW -> 2;
                    case LOW_HIGH -> 3;
                    default -> 4;
                };
            }
            counts[cls]++;
            if (cls < 4) {
                significant[u.index()] = true;
                hatch[u.index()] = CLUSTER_HATCH[cls];
            }
        }
        int excluded = n - result.units().size();
        Arrays.sort(abs);
        double m = abs.length == 0 ? 1 : abs[(int) Math.floor(0.98 * (abs.length - 1))];
        ColourScale scale = ColourScale.diverging(m > 0 ? m : 1, "local Moran's I of the " + valueName, "");
        Color[] fills = new Color[n];
        List<org.locationtech.jts.geom.Geometry> sig = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            fills[i] = scale.colour(stat[i]);
            if (significant[i]) {
                sig.add(frame.units().get(i));
            }
        }
        List<MapFigure.Layer> layers = List.of((c, p) -> {
            c.fill(p, frame.units(), fills, BORDER, 0.6f);
            for (int i = 0; i < n; i++) {
                c.hatch(p, frame.units().get(i), hatch[i], hatchColour(fills[i]));
            }
            c.stroke(p, sig, Color.WHITE, 4.4f);
            c.stroke(p, sig, Palette.TEXT, 2.4f);
        });
        String q = Numbers.significant(fdr, 3);
        Color swatch = ColourRamp.diverging().colour(0.62);
        List<MapFigure.LegendItem> legend = new ArrayList<>();
        legend.add(c -> c.colourBar(scale));
        legend.add(c -> c.legendNote("Brick: like its neighbours; blue: unlike them. Colours saturate at "
                + Numbers.significant(scale.upper(), 2) + "."));
        legend.add(MapCanvas::legendGap);
        legend.add(c -> c.legendHeading("Local pattern, heavy outline where the Benjamini–Hochberg q ≤ " + q));
        for (int cls = 0; cls < 4; cls++) {
            int cc = cls;
            legend.add(c -> c.legendEntry(CLUSTER_LABELS[cc] + " (" + counts[cc] + ")", swatch, CLUSTER_HATCH[cc],
                    Palette.TEXT, 2.4f));
        }
        legend.add(c -> c.legendEntry(CLUSTER_LABELS[4] + " (" + counts[4] + ")", swatch, MapCanvas.Hatch.NONE,
                Palette.MUTED, 0.8f));
        if (excluded > 0) {
            legend.add(c -> c.legendEntry("left out: no neighbours (" + excluded + ")", Palette.NO_DATA,
                    MapCanvas.Hatch.NONE, Palette.MUTED, 0.8f));
        }
        return MapFigure.single(frame, title, layers, legend);
    }

    /** Dark lines on light fills, light lines on dark fills, so that the pattern reads on any fill. */
    static Color hatchColour(Color fill) {
        return Oklab.of(fill)[0] < 0.6 ? new Color(255, 255, 255, 225) : new Color(0x23, 0x26, 0x2b, 215);
    }

    /** Line patterns of the four significant local-pattern classes. */
    static final MapCanvas.Hatch[] CLUSTER_HATCH = {MapCanvas.Hatch.RISING, MapCanvas.Hatch.FALLING,
        MapCanvas.Hatch.HORIZONTAL, MapCanvas.Hatch.VERTICAL};

    /** Our words for the classes: raised/lowered against the mean, among raised/lowered neighbours. */
    static final String[] CLUSTER_LABELS = {"raised, among raised neighbours", "lowered, among lowered neighbours",
        "raised, standing out among lowered neighbours", "lowered, standing out among raised neighbours",
        "no local pattern"};

    /**
     * A grid map: cells coloured by value, clipped to the frame's outline; cells without a value
     * (NaN) stay clear.
     */
    public static MapFigure grid(MapFrame frame, GridValues values, ColourScale scale, String title) {
        Objects.requireNonNull(values, "values");
        Objects.requireNonNull(scale, "scale");
        return MapFigure.single(frame, title, List.of((c, p) -> c.raster(p, values, scale, frame.outline())),
                List.of(c -> c.colourBar(scale)));
    }

    /**
     * An interval map: three panels on one colour scale, the lower end of an interval, the
     * estimate and the upper end, so that the width of the interval reads as the change of colour
     * between the outer panels.
     *
     * @param panelTitles three titles, e.g. {"lower end of the 90 % interval", "median", "upper end"}
     */
    public static MapFigure interval(MapFrame frame, GridValues lower, GridValues estimate, GridValues upper,
            ColourScale scale, String title, String[] panelTitles) {
        Objects.requireNonNull(lower, "lower");
        Objects.requireNonNull(estimate, "estimate");
        Objects.requireNonNull(upper, "upper");
        Objects.requireNonNull(scale, "scale");
        if (panelTitles.length != 3) {
            throw new IllegalArgumentException("an interval map needs three panel titles, got " + panelTitles.length);
        }
        double[] lo = lower.values();
        double[] hi = upper.values();
        if (lo.length != hi.length || lo.length != estimate.values().length) {
            throw new IllegalArgumentException("interval map '" + title + "': the three grids differ in size");
        }
        for (int k = 0; k < lo.length; k++) {
            if (lo[k] > hi[k]) {
                throw new IllegalArgumentException("interval map '" + title + "': cell " + k + " has lower end "
                        + lo[k] + " above upper end " + hi[k]);
            }
        }
        GridValues[] g = {lower, estimate, upper};
        List<List<MapFigure.Layer>> panels = new ArrayList<>();
        for (GridValues v : g) {
            panels.add(List.of((c, p) -> c.raster(p, v, scale, frame.outline())));
        }
        return new MapFigure(frame, title, panelTitles, panels, List.of(), List.of(c -> c.colourBar(scale)), 420);
    }

    /**
     * Sites (e.g. monitors) as dots coloured by a value on the outline; emphasised sites are drawn
     * larger and the legend says what the two sizes mean.
     */
    public static MapFigure points(MapFrame frame, double[] x, double[] y, double[] values, ColourScale scale,
            boolean[] emphasised, String emphasisMeaning, String otherMeaning, String title) {
        int n = x.length;
        if (y.length != n || values.length != n || emphasised.length != n) {
            throw new IllegalArgumentException("point map '" + title + "': x, y, values and emphasis must have the "
                    + "same length, got " + n + ", " + y.length + ", " + values.length + ", " + emphasised.length);
        }
        double[] xs = x.clone();
        double[] ys = y.clone();
        Color[] fills = new Color[n];
        double[] r = new double[n];
        int big = 0;
        for (int i = 0; i < n; i++) {
            fills[i] = scale.colour(values[i]);
            r[i] = emphasised[i] ? 9 : 5.5;
            big += emphasised[i] ? 1 : 0;
        }
        int b = big;
        Color mid = scale.ramp().colour(0.5);
        List<MapFigure.Layer> layers = List.of((c, p) -> {
            c.fill(p, List.of(frame.outline()), new Color[] {new Color(0xfbfaf5)}, null, 0);
            c.stroke(p, frame.units(), new Color(0xb8bcc2), 0.6f);
            c.points(p, xs, ys, fills, r);
        });
        List<MapFigure.LegendItem> legend = new ArrayList<>();
        legend.add(c -> c.colourBar(scale));
        legend.add(c -> c.legendPoint(emphasisMeaning + " (" + b + ")", mid, 9));
        legend.add(c -> c.legendPoint(otherMeaning + " (" + (n - b) + ")", mid, 5.5));
        return MapFigure.single(frame, title, layers, legend);
    }
}
