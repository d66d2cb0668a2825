package io.densa.report.chart;

import io.densa.report.Figure;
import io.densa.report.colour.Palette;
import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Objects;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.block.BlockBorder;
import org.jfree.chart.plot.CombinedDomainXYPlot;
import org.jfree.chart.plot.SeriesRenderingOrder;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.ClusteredXYBarRenderer;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.LegendTitle;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.HorizontalAlignment;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;

/**
 * An x–y chart drawn with JFreeChart in Densa's look: lines (solid, dashed, thin), points,
 * vertical reference lines, and an optional lower panel of counts (e.g. pairs per variogram
 * bin) sharing the x axis. Axes carry their quantity and unit ({@link Axis}); dashed series are
 * drawn as one path so that the dash pattern runs on across the points (flat stretches included).
 *
 * <p>Immutable: every {@code with}-style method returns a new chart. Rendering is headless.
 */
public final class Chart implements Figure {
    static final Font TITLE = new Font(Font.SANS_SERIF, Font.BOLD, 16);
    static final Font AXIS = new Font(Font.SANS_SERIF, Font.PLAIN, 13);
    static final Font TICKS = new Font(Font.SANS_SERIF, Font.PLAIN, 12);

    /** How a series is drawn. */
    public enum Style {
        /** A solid line, 2.2 px. */
        LINE,
        /** A dashed line, 2 px, 8 on 5 off. */
        DASHED,
        /** A thin solid line, 1 px. */
        THIN,
        /** Dots of 7 px, no line. */
        POINTS
    }

    /**
     * One series.
     *
     * @param name   legend text
     * @param x      x values, in the x axis's convention
     * @param y      y values, in the y axis's convention (NaN points are left out)
     * @param style  how it is drawn
     * @param colour its colour
     */
    public record Series(String name, double[] x, double[] y, Style style, Color colour) {
        /** Checks and copies. */
        public Series {
            Objects.requireNonNull(name, "name");
            Objects.requireNonNull(style, "style");
            Objects.requireNonNull(colour, "colour");
            if (x.length != y.length) {
                throw new IllegalArgumentException("series '" + name + "' has " + x.length + " x values and "
                        + y.length + " y values");
            }
            x = x.clone();
            y = y.clone();
        }

        /** A copy of the x values. */
        @Override
        public double[] x() {
            return x.clone();
        }

        /** A copy of the y values. */
        @Override
        public double[] y() {
            return y.clone();
        }
    }

    private record Marker(String label, double x, Color colour) {
    }

    private record Counts(String name, double[] x, double[] counts, Color colour) {
    }

    private final String title;
    private final Axis xAxis;
    private final Axis yAxis;
    private final List<Series> series;
    private final List<Marker> markers;
    private final List<Counts> counts;
    private final String countsLabel;
    private final List<String> subtitles;
    private final int width;
    private final int height;
    private final boolean yFromZero;

    private Chart(String title, Axis xAxis, Axis yAxis, List<Series> series, List<Marker> markers,
            List<Counts> counts, String countsLabel, List<String> subtitles, int width, int height, boolean yFromZero) {
        this.title = title;
        this.xAxis = xAxis;
        this.yAxis = yAxis;
        this.series = List.copyOf(series);
        this.markers = List.copyOf(markers);
        this.counts = List.copyOf(counts);
        this.countsLabel = countsLabel;
        this.subtitles = List.copyOf(subtitles);
        this.width = width;
        this.height = height;
        this.yFromZero = yFromZero;
    }

    /** An empty chart with a title and two axes, 900 × 560 pixels. */
    public static Chart of(String title, Axis x, Axis y) {
        Objects.requireNonNull(title, "title");
        Objects.requireNonNull(x, "x");
        Objects.requireNonNull(y, "y");
        return new Chart(title, x, y, List.of(), List.of(), List.of(), "", List.of(), 900, 560, false);
    }

    private Chart withSeries(List<Series> s) {
        return new Chart(title, xAxis, yAxis, s, markers, counts, countsLabel, subtitles, width, height, yFromZero);
    }

    /** With one more series. */
    public Chart with(Series s) {
        List<Series> all = new ArrayList<>(series);
        all.add(Objects.requireNonNull(s, "series"));
        return withSeries(all);
    }

    private Color nextColour() {
        int k = 0;
        for (Series s : series) {
            if (s.style() != Style.POINTS) {
                k++;
            }
        }
        return Palette.categorical(k);
    }

    /** A solid line in the next categorical colour. */
    public Chart line(String name, double[] x, double[] y) {
        return with(new Series(name, x, y, Style.LINE, nextColour()));
    }

    /** A dashed line in the next categorical colour. */
    public Chart dashed(String name, double[] x, double[] y) {
        return with(new Series(name, x, y, Style.DASHED, nextColour()));
    }

    /** Data points in the neutral data colour. */
    public Chart points(String name, double[] x, double[] y) {
        return with(new Series(name, x, y, Style.POINTS, Palette.DATA));
    }

    /** A dashed vertical reference line at {@code x} (in the x axis's convention), labelled. */
    public Chart verticalLine(String label, double x) {
        if (!Double.isFinite(x)) {
            throw new IllegalArgumentException("vertical line '" + label + "' needs a finite x, got " + x);
        }
        List<Marker> m = new ArrayList<>(markers);
        m.add(new Marker(label, x, Palette.BRICK));
        return new Chart(title, xAxis, yAxis, series, m, counts, countsLabel, subtitles, width, height, yFromZero);
    }

    /**
     * Counts drawn as bars in a lower panel sharing the x axis (several series side by side).
     *
     * @param label  the lower panel's axis title, e.g. "pairs per bin"
     * @param name   legend text of this series
     * @param x      bar positions
     * @param values counts (≥ 0)
     * @param colour bar colour
     */
    public Chart counts(String label, String name, double[] x, long[] values, Color colour) {
        if (x.length != values.length) {
            throw new IllegalArgumentException("counts '" + name + "': " + x.length + " positions and "
                    + values.length + " counts");
        }
        double[] v = new double[values.length];
        for (int i = 0; i < v.length; i++) {
            if (values[i] < 0) {
                throw new IllegalArgumentException("counts '" + name + "': count " + i + " is negative");
            }
            v[i] = values[i];
        }
        List<Counts> c = new ArrayList<>(counts);
        c.add(new Counts(name, x.clone(), v, colour));
        return new Chart(title, xAxis, yAxis, series, markers, c, label, subtitles, width, height, yFromZero);
    }

    /** A line of text under the title. */
    public Chart subtitle(String text) {
        List<String> s = new ArrayList<>(subtitles);
        s.add(Objects.requireNonNull(text, "text"));
        return new Chart(title, xAxis, yAxis, series, markers, counts, countsLabel, s, width, height, yFromZero);
    }

    /** The size of the image when rendered alone, in pixels (each in [200, 4000]). */
    public Chart size(int w, int h) {
        if (w < 200 || w > 4000 || h < 200 || h > 4000) {
            throw new IllegalArgumentException("chart size must be in [200, 4000] pixels, got " + w + " x " + h);
        }
        return new Chart(title, xAxis, yAxis, series, markers, counts, countsLabel, subtitles, w, h, yFromZero);
    }

    /** The same chart with a y axis that always includes zero (e.g. variograms, where the nugget is the gap at 0). */
    public Chart yFromZero() {
        return new Chart(title, xAxis, yAxis, series, markers, counts, countsLabel, subtitles, width, height, true);
    }

    /** The series, in drawing order. */
    public List<Series> series() {
        return series;
    }

    /** The x axis. */
    public Axis xAxis() {
        return xAxis;
    }

    /** The y axis. */
    public Axis yAxis() {
        return yAxis;
    }

    private static NumberAxis axis(Axis a) {
        NumberAxis axis = a.logarithmic() ? new RoundLogAxis(a.title()) : new NumberAxis(a.title());
        axis.setStandardTickUnits(a.scale() == Axis.Scale.COUNT ? NumberAxis.createIntegerTickUnits(Locale.ROOT)
                : NumberAxis.createStandardTickUnits(Locale.ROOT));
        axis.setAutoRangeIncludesZero(false);
        axis.setLabelFont(AXIS);
        axis.setTickLabelFont(TICKS);
        axis.setLabelPaint(Palette.TEXT);
        axis.setTickLabelPaint(Palette.MUTED);
        axis.setAxisLinePaint(Palette.MUTED);
        axis.setTickMarkPaint(Palette.MUTED);
        return axis;
    }

    /** The chart as a JFreeChart object, for callers who want to adjust it further. */
    public JFreeChart toJFreeChart() {
        XYSeriesCollection data = new XYSeriesCollection();
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer();
        renderer.setDrawSeriesLineAsPath(true);
        // lines first, points on top of them
        List<Series> ordered = new ArrayList<>();
        for (Series sr : series) {
            if (sr.style() != Style.POINTS) {
                ordered.add(sr);
            }
        }
        for (Series sr : series) {
            if (sr.style() == Style.POINTS) {
                ordered.add(sr);
            }
        }
        for (int s = 0; s < ordered.size(); s++) {
            Series sr = ordered.get(s);
            XYSeries xy = new XYSeries(s + ":" + sr.name(), false, true);
            for (int i = 0; i < sr.x.length; i++) {
                double px = xAxis.toPlot(sr.x[i]);
                double py = yAxis.toPlot(sr.y[i]);
                if (Double.isFinite(px) && Double.isFinite(py)) {
                    xy.add(px, py);
                }
            }
            data.addSeries(xy);
            renderer.setSeriesPaint(s, sr.colour());
            renderer.setLegendTextPaint(s, Palette.TEXT);
            switch (sr.style()) {
                case POINTS -> {
                    renderer.setSeriesLinesVisible(s, false);
                    renderer.setSeriesShapesVisible(s, true);
                    renderer.setSeriesShape(s, new Ellipse2D.Double(-3.5, -3.5, 7, 7));
                }
                case DASHED -> {
                    renderer.setSeriesShapesVisible(s, false);
                    renderer.setSeriesStroke(s, new BasicStroke(2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_ROUND, 1f,
                            new float[] {8f, 5f}, 0f));
                }
                case THIN -> {
                    renderer.setSeriesShapesVisible(s, false);
                    renderer.setSeriesStroke(s, new BasicStroke(1f));
                }
                default -> {
                    renderer.setSeriesShapesVisible(s, false);
                    renderer.setSeriesStroke(s, new BasicStroke(2.2f, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND));
                }
            }
        }
        renderer.setLegendItemLabelGenerator((dataset, s) -> ordered.get(s).name());
        NumberAxis x = axis(xAxis);
        NumberAxis y = axis(yAxis);
        y.setAutoRangeIncludesZero(yFromZero);
        XYPlot plot = new XYPlot(data, null, y, renderer);
        style(plot);
        plot.setSeriesRenderingOrder(SeriesRenderingOrder.FORWARD);
        for (Marker m : markers) {
            ValueMarker vm = new ValueMarker(m.x(), m.colour(), new BasicStroke(1.6f, BasicStroke.CAP_BUTT,
                    BasicStroke.JOIN_ROUND, 1f, new float[] {6f, 4f}, 0f));
            vm.setLabel(m.label());
            vm.setLabelFont(TICKS);
            vm.setLabelPaint(m.colour());
            vm.setLabelBackgroundColor(new Color(255, 255, 255, 220));
            vm.setLabelAnchor(RectangleAnchor.TOP_RIGHT);
            vm.setLabelTextAnchor(TextAnchor.TOP_LEFT);
            vm.setLabelOffset(new RectangleInsets(4, 4, 4, 4));
            plot.addDomainMarker(vm);
        }
        JFreeChart chart;
        if (counts.isEmpty()) {
            plot.setDomainAxis(x);
            chart = new JFreeChart(title, TITLE, plot, true);
        } else {
            CombinedDomainXYPlot combined = new CombinedDomainXYPlot(x);
            combined.setGap(8);
            combined.add(plot, 3);
            combined.add(countsPlot(), 1);
            chart = new JFreeChart(title, TITLE, combined, true);
        }
        chart.setBackgroundPaint(Color.WHITE);
        chart.getTitle().setPaint(Palette.TEXT);
        chart.getTitle().setHorizontalAlignment(HorizontalAlignment.LEFT);
        chart.getTitle().setPadding(new RectangleInsets(6, 10, 2, 6));
        for (String s : subtitles) {
            TextTitle t = new TextTitle(s, TICKS);
            t.setPaint(Palette.MUTED);
            t.setHorizontalAlignment(HorizontalAlignment.LEFT);
            t.setPadding(new RectangleInsets(0, 10, 2, 6));
            chart.addSubtitle(t);
        }
        LegendTitle legend = chart.getLegend();
        if (legend != null) {
            legend.setItemFont(TICKS);
            legend.setFrame(BlockBorder.NONE);
            legend.setPosition(RectangleEdge.BOTTOM);
        }
        return chart;
    }

    private XYPlot countsPlot() {
        XYSeriesCollection data = new XYSeriesCollection();
        ClusteredXYBarRenderer bars = new ClusteredXYBarRenderer(0.15, false);
        bars.setBarPainter(new StandardXYBarPainter());
        bars.setShadowVisible(false);
        double minGap = Double.POSITIVE_INFINITY;
        for (int s = 0; s < counts.size(); s++) {
            Counts c = counts.get(s);
            XYSeries xy = new XYSeries(s + ":" + c.name(), false, true);
            double[] px = new double[c.x().length];
            for (int i = 0; i < c.x().length; i++) {
                px[i] = xAxis.toPlot(c.x()[i]);
                if (Double.isFinite(px[i])) {
                    xy.add(px[i], c.counts()[i]);
                }
            }
            java.util.Arrays.sort(px);
            for (int i = 1; i < px.length; i++) {
                if (px[i] - px[i - 1] > 0) {
                    minGap = Math.min(minGap, px[i] - px[i - 1]);
                }
            }
            data.addSeries(xy);
            bars.setSeriesPaint(s, c.colour());
        }
        data.setIntervalWidth(Double.isFinite(minGap) ? 0.7 * minGap : 1);
        bars.setLegendItemLabelGenerator((dataset, s) -> counts.get(s).name());
        NumberAxis y = axis(Axis.linear(countsLabel, ""));
        y.setAutoRangeIncludesZero(true);
        y.setStandardTickUnits(NumberAxis.createIntegerTickUnits(Locale.ROOT));
        XYPlot plot = new XYPlot(data, null, y, bars);
        style(plot);
        return plot;
    }

    private static void style(XYPlot plot) {
        plot.setBackgroundPaint(Color.WHITE);
        plot.setOutlineVisible(false);
        plot.setDomainGridlinePaint(Palette.GRID);
        plot.setRangeGridlinePaint(Palette.GRID);
        plot.setDomainGridlineStroke(new BasicStroke(1f));
        plot.setRangeGridlineStroke(new BasicStroke(1f));
        plot.setAxisOffset(new RectangleInsets(4, 4, 4, 4));
    }

    @Override
    public BufferedImage render() {
        BufferedImage img = new BufferedImage(width, height, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        toJFreeChart().draw(g, new Rectangle2D.Double(0, 0, width, height));
        g.dispose();
        return img;
    }

    /** Draws the chart into a region of a graphics context (used by {@link ChartGrid}). */
    void draw(Graphics2D g, Rectangle2D area) {
        toJFreeChart().draw(g, area);
    }
}
