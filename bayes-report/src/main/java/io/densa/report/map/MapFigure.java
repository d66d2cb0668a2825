package io.densa.report.map;

import io.densa.report.Figure;
import io.densa.report.colour.Palette;
import java.awt.Color;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.locationtech.jts.geom.Geometry;

/**
 * A map ready to render: one or more panels over a {@link MapFrame}, a legend that says what the
 * colours, patterns and outlines mean (with units and counts), a scale bar in the frame's length
 * unit and a north arrow. Made by the factories of {@link Maps}; the {@code with…} methods add
 * overlays and return a new figure.
 *
 * <p>Immutable; rendering is headless and may be repeated.
 */
public final class MapFigure implements Figure {
    /** Paints something on one panel. */
    @FunctionalInterface
    interface Layer {
        void paint(MapCanvas canvas, int panel);
    }

    /** Paints an entry of the legend column. */
    @FunctionalInterface
    interface LegendItem {
        void paint(MapCanvas canvas);
    }

    private final MapFrame frame;
    private final String title;
    private final String[] subtitles;
    private final List<List<Layer>> panelLayers;
    private final List<Layer> overlays;
    private final List<LegendItem> legend;
    private final int panelWidth;

    MapFigure(MapFrame frame, String title, String[] subtitles, List<List<Layer>> panelLayers, List<Layer> overlays,
            List<LegendItem> legend, int panelWidth) {
        this.frame = Objects.requireNonNull(frame, "frame");
        this.title = Objects.requireNonNull(title, "title");
        this.subtitles = subtitles.clone();
        this.panelLayers = List.copyOf(panelLayers);
        this.overlays = List.copyOf(overlays);
        this.legend = List.copyOf(legend);
        this.panelWidth = panelWidth;
    }

    static MapFigure single(MapFrame frame, String title, List<Layer> layers, List<LegendItem> legend) {
        return new MapFigure(frame, title, new String[] {""}, List.of(layers), List.of(), legend, 760);
    }

    /** The frame. */
    public MapFrame frame() {
        return frame;
    }

    /** The title. */
    public String title() {
        return title;
    }

    /** Width of each map panel in pixels (default 760 for one panel, 420 for several), in [200, 3000]. */
    public MapFigure withPanelWidth(int pixels) {
        if (pixels < 200 || pixels > 3000) {
            throw new IllegalArgumentException("panel width must be in [200, 3000] pixels, got " + pixels);
        }
        return new MapFigure(frame, title, subtitles, panelLayers, overlays, legend, pixels);
    }

    /**
     * Outlines the flagged units with a heavy dark line in every panel and says so in the legend,
     * with the count.
     *
     * @param flagged one flag per unit of the frame
     * @param meaning what the outline means, e.g. "flagged at a false discovery rate of 0.10"
     */
    public MapFigure withFlagged(boolean[] flagged, String meaning) {
        Objects.requireNonNull(flagged, "flagged");
        Objects.requireNonNull(meaning, "meaning");
        frame.checkLength(flagged.length, "flag column");
        List<Geometry> shapes = new ArrayList<>();
        for (int i = 0; i < flagged.length; i++) {
            if (flagged[i]) {
                shapes.add(frame.units().get(i));
            }
        }
        List<Layer> o = new ArrayList<>(overlays);
        o.add((c, p) -> {
            c.stroke(p, shapes, Color.WHITE, 4.6f);
            c.stroke(p, shapes, Palette.TEXT, 2.4f);
        });
        List<LegendItem> l = new ArrayList<>(legend);
        l.add(MapCanvas::legendGap);
        l.add(c -> c.legendEntry("outlined: " + meaning + " (" + shapes.size() + ")", new Color(0, 0, 0, 0),
                MapCanvas.Hatch.NONE, Palette.TEXT, 2.4f));
        return new MapFigure(frame, title, subtitles, panelLayers, o, l, panelWidth);
    }

    /**
     * Marks sites (e.g. monitors) with small white dots in every panel, with a legend entry.
     *
     * @param x       planar x of each site
     * @param y       planar y of each site
     * @param meaning what the dots are, e.g. "monitors"
     */
    public MapFigure withSites(double[] x, double[] y, String meaning) {
        Objects.requireNonNull(x, "x");
        Objects.requireNonNull(y, "y");
        if (x.length != y.length) {
            throw new IllegalArgumentException("sites: " + x.length + " x values and " + y.length + " y values");
        }
        double[] xs = x.clone();
        double[] ys = y.clone();
        Color[] fills = new Color[xs.length];
        java.util.Arrays.fill(fills, Color.WHITE);
        double[] r = new double[xs.length];
        java.util.Arrays.fill(r, 3.5);
        List<Layer> o = new ArrayList<>(overlays);
        o.add((c, p) -> c.points(p, xs, ys, fills, r));
        List<LegendItem> l = new ArrayList<>(legend);
        l.add(MapCanvas::legendGap);
        l.add(c -> c.legendPoint(meaning + " (" + xs.length + ")", Color.WHITE, 3.5));
        return new MapFigure(frame, title, subtitles, panelLayers, o, l, panelWidth);
    }

    /** Draws the units' borders faintly over every panel (e.g. over a grid map). */
    public MapFigure withUnitBorders() {
        List<Layer> o = new ArrayList<>(overlays);
        o.add(0, (c, p) -> c.stroke(p, frame.units(), new Color(255, 255, 255, 110), 0.6f));
        return new MapFigure(frame, title, subtitles, panelLayers, o, legend, panelWidth);
    }

    /** A note at the end of the legend (e.g. how colours saturate). */
    public MapFigure withLegendNote(String note) {
        Objects.requireNonNull(note, "note");
        List<LegendItem> l = new ArrayList<>(legend);
        l.add(MapCanvas::legendGap);
        l.add(c -> c.legendNote(note));
        return new MapFigure(frame, title, subtitles, panelLayers, overlays, l, panelWidth);
    }

    @Override
    public BufferedImage render() {
        return draw().image();
    }

    /** The image and where its legend parts are. */
    record Drawn(BufferedImage image, MapCanvas.Layout layout) {
    }

    Drawn draw() {
        MapCanvas c = new MapCanvas(frame.outline().getEnvelopeInternal(), panelWidth, title, subtitles,
                frame.caption());
        for (int p = 0; p < subtitles.length; p++) {
            for (Layer layer : panelLayers.get(p)) {
                layer.paint(c, p);
            }
            for (Layer layer : overlays) {
                layer.paint(c, p);
            }
            c.stroke(p, List.of(frame.outline()), Palette.TEXT, 1.5f);
        }
        for (LegendItem item : legend) {
            item.paint(c);
        }
        c.scaleBarAndNorth(frame.lengthUnit());
        BufferedImage img = c.finish();
        return new Drawn(img, c.layout());
    }
}
