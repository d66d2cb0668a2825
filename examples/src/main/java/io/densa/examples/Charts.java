package io.densa.examples;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.List;
import javax.imageio.ImageIO;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;

/** Line and point charts drawn with JFreeChart, written as PNG (headless). */
final class Charts {
    private static final Font TITLE = new Font(Font.SANS_SERIF, Font.BOLD, 16);
    private static final Font AXIS = new Font(Font.SANS_SERIF, Font.PLAIN, 13);
    private static final Font TICKS = new Font(Font.SANS_SERIF, Font.PLAIN, 12);
    private static final Color[] PALETTE = {new Color(0x1f77b4), new Color(0xd62728), new Color(0x2ca02c),
        new Color(0xff7f0e), new Color(0x9467bd), new Color(0x8c564b), new Color(0x17becf), new Color(0x7f7f7f)};

    /** How a series is drawn. */
    enum Style {
        LINE, DASHED, POINTS, THIN
    }

    /**
     * One series.
     *
     * @param name   legend text
     * @param x      x values
     * @param y      y values (NaN points are skipped)
     * @param style  how to draw it
     * @param colour colour index into the palette
     */
    record Series(String name, double[] x, double[] y, Style style, int colour) {
    }

    private Charts() {
    }

    static JFreeChart chart(String title, String xLabel, String yLabel, List<Series> series) {
        XYSeriesCollection data = new XYSeriesCollection();
        XYLineAndShapeRenderer renderer = new XYLineAndShapeRenderer();
        for (int s = 0; s < series.size(); s++) {
            Series sr = series.get(s);
            XYSeries xy = new XYSeries(sr.name() + (s < 10 ? "" : " " + s), false, true);
            for (int i = 0; i < sr.x().length; i++) {
                if (Double.isFinite(sr.y()[i])) {
                    xy.add(sr.x()[i], sr.y()[i]);
                }
            }
            data.addSeries(xy);
            Color c = PALETTE[Math.floorMod(sr.colour(), PALETTE.length)];
            renderer.setSeriesPaint(s, c);
            switch (sr.style()) {
                case POINTS -> {
                    renderer.setSeriesLinesVisible(s, false);
                    renderer.setSeriesShapesVisible(s, true);
                    renderer.setSeriesShape(s, new Ellipse2D.Double(-3.5, -3.5, 7, 7));
                }
                case DASHED -> {
                    renderer.setSeriesShapesVisible(s, false);
                    renderer.setSeriesStroke(s, new BasicStroke(2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_ROUND, 1f,
                            new float[] {7f, 5f}, 0f));
                }
                case THIN -> {
                    renderer.setSeriesShapesVisible(s, false);
                    renderer.setSeriesStroke(s, new BasicStroke(1f));
                }
                default -> {
                    renderer.setSeriesShapesVisible(s, false);
                    renderer.setSeriesStroke(s, new BasicStroke(2.2f));
                }
            }
        }
        NumberAxis xAxis = new NumberAxis(xLabel);
        NumberAxis yAxis = new NumberAxis(yLabel);
        xAxis.setAutoRangeIncludesZero(false);
        for (NumberAxis a : new NumberAxis[] {xAxis, yAxis}) {
            a.setLabelFont(AXIS);
            a.setTickLabelFont(TICKS);
        }
        XYPlot plot = new XYPlot(data, xAxis, yAxis, renderer);
        plot.setBackgroundPaint(Color.WHITE);
        plot.setDomainGridlinePaint(new Color(0xdddddd));
        plot.setRangeGridlinePaint(new Color(0xdddddd));
        JFreeChart chart = new JFreeChart(title, TITLE, plot, true);
        chart.setBackgroundPaint(Color.WHITE);
        chart.getLegend().setItemFont(TICKS);
        return chart;
    }

    static void save(JFreeChart chart, Path file, int width, int height) {
        BufferedImage img = new BufferedImage(width, height, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        chart.draw(g, new Rectangle2D.Double(0, 0, width, height));
        g.dispose();
        write(img, file);
    }

    /** Several charts in a grid of {@code cols} columns, each cell w × h, with an overall title. */
    static void panel(String title, List<JFreeChart> charts, int cols, int w, int h, Path file) {
        int rows = (charts.size() + cols - 1) / cols;
        int top = title == null ? 0 : 40;
        BufferedImage img = new BufferedImage(cols * w, rows * h + top, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setColor(Color.WHITE);
        g.fillRect(0, 0, img.getWidth(), img.getHeight());
        if (title != null) {
            g.setColor(Color.BLACK);
            g.setFont(new Font(Font.SANS_SERIF, Font.BOLD, 18));
            g.drawString(title, 14, 28);
        }
        for (int i = 0; i < charts.size(); i++) {
            charts.get(i).draw(g, new Rectangle2D.Double((i % cols) * w, top + (i / cols) * h, w, h));
        }
        g.dispose();
        write(img, file);
    }

    static void subtitle(JFreeChart chart, String text) {
        TextTitle t = new TextTitle(text, TICKS);
        chart.addSubtitle(t);
    }

    private static void write(BufferedImage img, Path file) {
        try {
            ImageIO.write(img, "png", file.toFile());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
