package io.densa.report;

import io.densa.report.chart.Axis;
import io.densa.report.chart.Chart;
import io.densa.report.chart.Figures;
import io.densa.report.chart.Observed;
import io.densa.report.colour.ColourScale;
import io.densa.report.colour.Palette;
import io.densa.report.map.GridValues;
import io.densa.report.map.MapFrame;
import io.densa.report.map.Maps;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.Rectangle;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import javax.imageio.ImageIO;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.AxisState;
import org.jfree.chart.axis.NumberTick;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.ui.RectangleEdge;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Renders every figure type into a report and checks the files, then checks pixels: dashed series
 * are dashed on flat stretches, and log axes are labelled in the original unit (the maps' pixels:
 * {@code io.densa.report.map.MapRenderTest}).
 *
 * <p>Set the environment variable {@code DENSA_GALLERY} to a folder to keep the rendered report
 * there for viewing.
 */
class FiguresRenderTest {
    static final Fixtures F = new Fixtures(11);

    static Report gallery() {
        MapFrame frame = F.frame();
        int u = 3;
        int v = 40;
        Observed obs = Observed.counts("observed share per year of age", Fixtures.lower(), Fixtures.upper(),
                F.counts[u]);
        Axis age = Axis.linear("age", "years");
        boolean[] flagged = new boolean[frame.size()];
        double[] score = new double[frame.size()];
        for (int i = 0; i < score.length; i++) {
            score[i] = Math.exp(F.value[i]);
            flagged[i] = F.value[i] > 2.2;
        }
        int[] category = new int[frame.size()];
        for (int i = 0; i < category.length; i++) {
            category[i] = Math.floorMod((int) Math.floor(F.value[i]), 3);
        }
        GridValues lo = F.grid(90, 60, (x, y) -> 0.2 + 0.01 * x);
        GridValues mid = F.grid(90, 60, (x, y) -> 0.3 + 0.01 * x + 0.005 * y);
        GridValues hi = F.grid(90, 60, (x, y) -> 0.45 + 0.01 * x + 0.01 * y);
        ColourScale prob = ColourScale.probability("P(value > 1)");
        return Report.titled("Gallery of Densa figures")
                .note("Invented test data.")
                .figure("fig_density.png", Figures.density("Unit U3", F.densities.get(u), obs, age), "Density.")
                .figure("fig_baseline.png", Figures.baseline("Unit U40", F.densities.get(v), F.densities.get(u),
                        Observed.counts("observed share", Fixtures.lower(), Fixtures.upper(), F.counts[v]), age),
                        "Baseline.")
                .figure("fig_fpca.png", Figures.fpcaModes("Modes of variation", F.fpca, 2, 2, age,
                        Axis.linear("clr", "log-ratio")), "Modes.")
                .figure("fig_variogram.png", Figures.variogram("Trace-variogram", "km", List.of(
                        new Figures.VariogramLayer("densities", F.variogram, F.fit.model()),
                        new Figures.VariogramLayer("again, dashed", F.variogram, F.fit.model().withNugget(0.01)))),
                        "Variogram.")
                .figure("fig_logged.png", Chart.of("Logged data", Axis.loggedData("daily mean", "µg/m³"),
                        Axis.linear("density", "per unit of ln(µg/m³)"))
                        .line("curve", new double[] {0, 1, 2, 3, 4, 5}, new double[] {0, 0.2, 0.5, 0.3, 0.1, 0})
                        .verticalLine("15 µg/m³", Math.log(15)), "Logged axis.")
                .figure("map_choropleth.png", Maps.choropleth(frame, score, ColourScale.log(score, "score", ""),
                        "Score (log scale)").withFlagged(flagged, "flagged"), "Choropleth.")
                .figure("map_categories.png", Maps.categories(frame, category, new String[] {"zero", "one", "two"},
                        new Color[] {Palette.QUIET, Palette.BRICK, Palette.INK}, "Class", "Categories"), "Categories.")
                .figure("map_clusters.png", Maps.clusters(frame, F.local, 0.1, "value", "Local clusters"), "Clusters.")
                .figure("map_grid.png", Maps.grid(frame, mid, prob, "Probability").withUnitBorders()
                        .withSites(F.x, F.y, "sites"), "Grid.")
                .figure("map_interval.png", Maps.interval(frame, lo, mid, hi, prob, "Interval of the probability",
                        new String[] {"lower end", "estimate", "upper end"}), "Interval.")
                .figure("map_points.png", Maps.points(frame, F.x, F.y, F.value, ColourScale.of(F.value, "value", "units"),
                        flagged, "emphasised", "other", "Points"), "Points.");
    }

    @Test
    void everyFigureTypeRendersAndIsWritten(@TempDir Path dir) throws IOException {
        Report report = gallery();
        ReportFiles files = report.writeTo(dir);
        String keep = System.getenv("DENSA_GALLERY");
        if (keep != null) {
            gallery().writeTo(Path.of(keep));
        }
        String md = Files.readString(dir.resolve("summary.md"));
        String html = Files.readString(dir.resolve("summary.html"));
        int pngs = 0;
        for (String name : files.files()) {
            if (name.endsWith(".png")) {
                BufferedImage img = ImageIO.read(dir.resolve(name).toFile());
                assertNotNull(img, name + " does not decode");
                assertTrue(img.getWidth() >= 600 && img.getHeight() >= 400, name + " is " + img.getWidth() + " x "
                        + img.getHeight());
                assertTrue(md.contains("](" + name + ")"), name + " is not linked from summary.md");
                pngs++;
            }
        }
        assertEquals(11, pngs);
        assertEquals(pngs, html.split("data:image/png;base64,", -1).length - 1, "every figure embedded once");
        assertTrue(!html.contains("src=\"fig_") && !html.contains("src=\"map_"), "HTML must not link files");
    }

    /**
     * Gaps in a line of the given colour: along the image row where that colour is most frequent,
     * the runs of at least two background pixels (far from the colour) between its first and last
     * pixel. A solid line has none (antialiased seams between segments are not background); a
     * dashed line has one per dash.
     */
    static int gaps(BufferedImage img, Color colour) {
        int bestRow = -1;
        int bestCount = -1;
        for (int yy = 0; yy < img.getHeight(); yy++) {
            int c = 0;
            for (int xx = 0; xx < img.getWidth(); xx++) {
                if (diff(img.getRGB(xx, yy), colour) < 60) {
                    c++;
                }
            }
            if (c > bestCount) {
                bestCount = c;
                bestRow = yy;
            }
        }
        int first = -1;
        int last = -1;
        for (int xx = 0; xx < img.getWidth(); xx++) {
            if (diff(img.getRGB(xx, bestRow), colour) < 60) {
                first = first < 0 ? xx : first;
                last = xx;
            }
        }
        int gaps = 0;
        int run = 0;
        for (int xx = first; xx <= last; xx++) {
            if (diff(img.getRGB(xx, bestRow), colour) > 200) {
                run++;
            } else {
                if (run >= 2) {
                    gaps++;
                }
                run = 0;
            }
        }
        return gaps;
    }

    private static int diff(int rgb, Color c) {
        Color p = new Color(rgb);
        return Math.abs(p.getRed() - c.getRed()) + Math.abs(p.getGreen() - c.getGreen())
                + Math.abs(p.getBlue() - c.getBlue());
    }

    @Test
    void dashedSeriesAreDashedOnFlatStretches() {
        double[] x = new double[400];
        double[] flat = new double[400];
        double[] low = new double[400];
        for (int i = 0; i < x.length; i++) {
            x[i] = i / 399.0;
            flat[i] = 0.5;
            low[i] = 0.2;
        }
        Chart chart = Chart.of("Dashes", Axis.linear("x", ""), Axis.linear("y", ""))
                .with(new Chart.Series("flat, dashed", x, flat, Chart.Style.DASHED, Palette.BRICK))
                .with(new Chart.Series("flat, solid", x, low, Chart.Style.LINE, Palette.TEAL));
        BufferedImage img = chart.render();
        int dashes = gaps(img, Palette.BRICK);
        assertTrue(dashes >= 30, "a dashed line 780 px long with 13 px periods should show dozens of gaps, saw "
                + dashes);
        assertEquals(0, gaps(img, Palette.TEAL), "the solid line must have no gap");
        // control: JFreeChart's default segment-by-segment drawing restarts the dash pattern at every
        // point, so 400 points 2 px apart draw solid; the check above would catch it
        JFreeChart segmentwise = chart.toJFreeChart();
        ((XYLineAndShapeRenderer) ((XYPlot) segmentwise.getPlot()).getRenderer()).setDrawSeriesLineAsPath(false);
        BufferedImage bad = new BufferedImage(900, 560, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = bad.createGraphics();
        segmentwise.draw(g, new Rectangle2D.Double(0, 0, 900, 560));
        g.dispose();
        if (System.getenv("DENSA_GALLERY") != null) {
            try {
                ImageIO.write(bad, "png", Path.of(System.getenv("DENSA_GALLERY"), "control.png").toFile());
                ImageIO.write(img, "png", Path.of(System.getenv("DENSA_GALLERY"), "dashes.png").toFile());
            } catch (IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
        }
        assertTrue(gaps(bad, Palette.BRICK) < 5, "control should draw solid, saw " + gaps(bad, Palette.BRICK)
                + " gaps");
    }

    @Test
    void countAxesTickAtWholeNumbersOnly() {
        // counts of 0..3 on a tall axis: a linear axis would tick at halves (0.5, 1.5, ...); a count axis must not
        for (boolean count : new boolean[] {true, false}) {
            Axis y = count ? Axis.count("districts flagged", "") : Axis.linear("districts flagged", "");
            Chart chart = Chart.of("Counts", Axis.count("week", "weeks"), y)
                    .line("flags", new double[] {1, 2, 3, 4}, new double[] {0, 3, 1, 2});
            ValueAxis axis = ((XYPlot) chart.toJFreeChart().getPlot()).getRangeAxis();
            List<NumberTick> ticks = ticks(axis, 800, 600, RectangleEdge.LEFT);
            boolean fractional = false;
            for (NumberTick t : ticks) {
                if (!t.getText().isEmpty()) { // labelled ticks (minor ticks carry no label)
                    fractional |= t.getValue() != Math.rint(t.getValue());
                }
            }
            assertEquals(!count, fractional, (count ? "count" : "linear") + " axis ticks " + ticks);
        }
    }

    @Test
    void logAxesAreLabelledInTheOriginalUnit() {
        Chart chart = Chart.of("Logged", Axis.loggedData("daily mean", "µg/m³"), Axis.linear("density", ""))
                .line("curve", new double[] {Math.log(1.5), Math.log(150)}, new double[] {0, 1});
        XYPlot plot = (XYPlot) chart.toJFreeChart().getPlot();
        ValueAxis axis = plot.getDomainAxis();
        assertEquals("daily mean (µg/m³, log scale)", axis.getLabel());
        List<NumberTick> ticks = ticks(axis, 800, 400, RectangleEdge.BOTTOM);
        List<String> labels = new ArrayList<>();
        for (NumberTick t : ticks) {
            labels.add(t.getText());
            assertEquals(Math.log(Double.parseDouble(t.getText())), t.getValue(), 1e-12, "tick at the log of its label");
        }
        assertTrue(labels.containsAll(List.of("2", "5", "10", "20", "50", "100")), "labels " + labels);
    }

    /** The ticks JFreeChart lays out for an axis drawn along one edge of a width × height data area. */
    @SuppressWarnings("unchecked")
    private static List<NumberTick> ticks(ValueAxis axis, double width, double height, RectangleEdge edge) {
        BufferedImage img = new BufferedImage(10, 10, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        try {
            return axis.refreshTicks(g, new AxisState(), new Rectangle2D.Double(0, 0, width, height), edge);
        } finally {
            g.dispose();
        }
    }
}
