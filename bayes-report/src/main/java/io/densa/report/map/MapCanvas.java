package io.densa.report.map;

import io.densa.report.Numbers;
import io.densa.report.colour.ColourScale;
import io.densa.report.colour.Palette;
import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.Rectangle;
import java.awt.RenderingHints;
import java.awt.Shape;
import java.awt.geom.AffineTransform;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Line2D;
import java.awt.geom.Path2D;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.List;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.Polygon;

/**
 * Draws one map image with Java2D: one or more map panels side by side over the same extent
 * (planar coordinates), a legend column on the right, a scale bar and north arrow, a title and a
 * caption. One instance draws one image; not thread-safe. Works headless.
 */
final class MapCanvas {
    static final int LEFT = 24;
    static final int GAP = 18;
    static final int LEGEND_W = 290;
    static final int BOTTOM = 78;
    static final Font TITLE = new Font(Font.SANS_SERIF, Font.BOLD, 19);
    static final Font LABEL = new Font(Font.SANS_SERIF, Font.PLAIN, 13);
    static final Font LABEL_BOLD = new Font(Font.SANS_SERIF, Font.BOLD, 13);
    static final Font SMALL = new Font(Font.SANS_SERIF, Font.PLAIN, 12);
    private static final int SWATCH_W = 26;
    private static final int SWATCH_H = 18;

    /** Line patterns laid over a unit's fill. */
    enum Hatch {
        NONE, RISING, FALLING, HORIZONTAL, VERTICAL
    }

    /**
     * Where the legend put things, in image pixels (for tests and callers that check pixels).
     *
     * @param swatches  the boxes of the category entries, in order
     * @param colourBar the colour bar, or null
     * @param barTicks  pixel rows of the colour bar ticks, in the order of the scale's ticks
     */
    record Layout(List<Rectangle> swatches, Rectangle colourBar, int[] barTicks) {
    }

    private final Envelope extent;
    private final double scale;
    private final int plotW;
    private final int plotH;
    private final int panels;
    private final int top;
    private final BufferedImage map;
    private final Graphics2D g;
    private final BufferedImage legend;
    private final Graphics2D lg;
    private int legendY = 4;
    private final List<Rectangle> swatches = new ArrayList<>();
    private Rectangle colourBar;
    private int[] barTicks;
    private final String title;
    private final String caption;

    MapCanvas(Envelope area, int plotW, String title, String[] subtitles, String caption) {
        Envelope e = new Envelope(area);
        e.expandBy(0.03 * Math.max(e.getWidth(), e.getHeight()));
        this.extent = e;
        this.plotW = plotW;
        this.panels = subtitles.length;
        this.scale = plotW / e.getWidth();
        this.plotH = (int) Math.ceil(e.getHeight() * scale);
        this.top = panels > 1 ? 82 : 58;
        this.title = title;
        this.caption = caption;
        this.map = new BufferedImage(LEFT + panels * plotW + (panels - 1) * GAP, top + plotH + BOTTOM,
                BufferedImage.TYPE_INT_RGB);
        this.g = map.createGraphics();
        hints(g);
        g.setColor(Color.WHITE);
        g.fillRect(0, 0, map.getWidth(), map.getHeight());
        for (int p = 0; p < panels; p++) {
            g.setColor(Palette.MAP_BACKGROUND);
            g.fillRect(x0(p), top, plotW, plotH);
            if (panels > 1) {
                g.setFont(LABEL_BOLD);
                g.setColor(Palette.TEXT);
                g.drawString(subtitles[p], x0(p), top - 10);
            }
        }
        this.legend = new BufferedImage(LEGEND_W, 4000, BufferedImage.TYPE_INT_ARGB);
        this.lg = legend.createGraphics();
        hints(lg);
    }

    private static void hints(Graphics2D gr) {
        gr.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        gr.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        gr.setRenderingHint(RenderingHints.KEY_STROKE_CONTROL, RenderingHints.VALUE_STROKE_PURE);
    }

    int panels() {
        return panels;
    }

    private int x0(int panel) {
        return LEFT + panel * (plotW + GAP);
    }

    double px(int panel, double x) {
        return x0(panel) + (x - extent.getMinX()) * scale;
    }

    double py(double y) {
        return top + (extent.getMaxY() - y) * scale;
    }

    Shape shape(int panel, Geometry geom) {
        Path2D.Double path = new Path2D.Double(Path2D.WIND_EVEN_ODD);
        for (int i = 0; i < geom.getNumGeometries(); i++) {
            if (geom.getGeometryN(i) instanceof Polygon p) {
                ring(path, panel, p.getExteriorRing().getCoordinates());
                for (int h = 0; h < p.getNumInteriorRing(); h++) {
                    ring(path, panel, p.getInteriorRingN(h).getCoordinates());
                }
            }
        }
        return path;
    }

    private void ring(Path2D.Double path, int panel, Coordinate[] cs) {
        for (int i = 0; i < cs.length; i++) {
            if (i == 0) {
                path.moveTo(px(panel, cs[i].x), py(cs[i].y));
            } else {
                path.lineTo(px(panel, cs[i].x), py(cs[i].y));
            }
        }
        path.closePath();
    }

    private void clipToPanel(int panel) {
        g.setClip(new Rectangle(x0(panel), top, plotW, plotH));
    }

    /** Fills each geometry with its colour and strokes its border (border may be null). */
    void fill(int panel, List<Geometry> shapes, Color[] fills, Color border, float width) {
        clipToPanel(panel);
        g.setStroke(new BasicStroke(width, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND));
        for (int i = 0; i < shapes.size(); i++) {
            Shape s = shape(panel, shapes.get(i));
            g.setColor(fills[i]);
            g.fill(s);
            if (border != null) {
                g.setColor(border);
                g.draw(s);
            }
        }
        g.setClip(null);
    }

    /** Lays a line pattern over a geometry. */
    void hatch(int panel, Geometry geom, Hatch hatch, Color colour) {
        if (hatch == Hatch.NONE) {
            return;
        }
        Shape s = shape(panel, geom);
        Shape old = g.getClip();
        g.setClip(s);
        g.setColor(colour);
        g.setStroke(new BasicStroke(1.3f));
        hatchLines(g, s.getBounds2D(), hatch);
        g.setClip(old);
    }

    private static void hatchLines(Graphics2D gr, Rectangle2D b, Hatch hatch) {
        double step = 6;
        double x0 = Math.floor(b.getMinX() / step) * step;
        double y0 = Math.floor(b.getMinY() / step) * step;
        double w = b.getWidth() + 2 * step;
        double h = b.getHeight() + 2 * step;
        switch (hatch) {
            case HORIZONTAL -> {
                for (double y = y0; y <= y0 + h; y += step) {
                    gr.draw(new Line2D.Double(x0, y, x0 + w, y));
                }
            }
            case VERTICAL -> {
                for (double x = x0; x <= x0 + w; x += step) {
                    gr.draw(new Line2D.Double(x, y0, x, y0 + h));
                }
            }
            case RISING, FALLING -> {
                double d = step * Math.sqrt(2);
                for (double k = -h; k <= w + h; k += d) {
                    if (hatch == Hatch.RISING) {
                        gr.draw(new Line2D.Double(x0 + k, y0 + h, x0 + k + h, y0));
                    } else {
                        gr.draw(new Line2D.Double(x0 + k, y0, x0 + k + h, y0 + h));
                    }
                }
            }
            default -> {
            }
        }
    }

    /** Strokes the borders of the geometries. */
    void stroke(int panel, List<Geometry> shapes, Color colour, float width) {
        clipToPanel(panel);
        g.setStroke(new BasicStroke(width, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND));
        g.setColor(colour);
        for (Geometry s : shapes) {
            g.draw(shape(panel, s));
        }
        g.setClip(null);
    }

    /** Draws grid values (NaN cells transparent), clipped to {@code clip} when given. */
    void raster(int panel, GridValues grid, ColourScale colours, Geometry clip) {
        int nx = grid.columns();
        int ny = grid.rows();
        BufferedImage r = new BufferedImage(nx, ny, BufferedImage.TYPE_INT_ARGB);
        for (int j = 0; j < ny; j++) {
            for (int i = 0; i < nx; i++) {
                double v = grid.value(i, j);
                if (!Double.isNaN(v)) {
                    r.setRGB(i, ny - 1 - j, colours.colour(v).getRGB());
                }
            }
        }
        Shape old = g.getClip();
        g.setClip(new Rectangle(x0(panel), top, plotW, plotH));
        if (clip != null) {
            g.clip(shape(panel, clip));
        }
        double w = (grid.maxX() - grid.minX()) * scale;
        double h = (grid.maxY() - grid.minY()) * scale;
        AffineTransform t = new AffineTransform(w / nx, 0, 0, h / ny, px(panel, grid.minX()), py(grid.maxY()));
        g.setRenderingHint(RenderingHints.KEY_INTERPOLATION, RenderingHints.VALUE_INTERPOLATION_NEAREST_NEIGHBOR);
        g.drawImage(r, t, null);
        g.setClip(old);
    }

    /** Filled circles with a dark edge; radius in pixels per point. */
    void points(int panel, double[] x, double[] y, Color[] fills, double[] radius) {
        g.setStroke(new BasicStroke(1.2f));
        for (int i = 0; i < x.length; i++) {
            double r = radius[i];
            Ellipse2D.Double c = new Ellipse2D.Double(px(panel, x[i]) - r, py(y[i]) - r, 2 * r, 2 * r);
            g.setColor(fills[i]);
            g.fill(c);
            g.setColor(Palette.TEXT);
            g.draw(c);
        }
    }

    // ------------------------------------------------------------------ legend column

    /** A wrapped heading in the legend. */
    void legendHeading(String text) {
        legendY = wrapped(text, 0, legendY, LEGEND_W - 12, LABEL_BOLD) + 10;
    }

    /** A wrapped note in the legend. */
    void legendNote(String text) {
        legendY = wrapped(text, 0, legendY, LEGEND_W - 12, SMALL) + 10;
    }

    /** A vertical colour bar with ticks at the scale's round values. */
    void colourBar(ColourScale colours) {
        legendHeading(colours.title());
        int barW = 24;
        int barH = Math.max(140, Math.min(plotH - legendY - 20, 300));
        int y0 = legendY + 4;
        for (int k = 0; k < barH; k++) {
            double t = 1 - k / (barH - 1.0);
            lg.setColor(colours.ramp().colour(t));
            lg.fillRect(2, y0 + k, barW, 1);
        }
        lg.setColor(Palette.TEXT);
        lg.setStroke(new BasicStroke(1f));
        lg.drawRect(2, y0, barW, barH);
        lg.setFont(SMALL);
        double[] ticks = colours.ticks();
        String[] labels = colours.tickLabels();
        barTicks = new int[ticks.length];
        for (int i = 0; i < ticks.length; i++) {
            int ty = y0 + (int) Math.round((1 - colours.position(ticks[i])) * (barH - 1));
            barTicks[i] = ty;
            lg.drawLine(2 + barW, ty, 2 + barW + 6, ty);
            lg.drawString(labels[i], 2 + barW + 10, ty + 4);
        }
        colourBar = new Rectangle(2, y0, barW, barH);
        legendY = y0 + barH + 18;
    }

    /**
     * A legend entry: a box with the fill, an optional hatch, an outline of the given width, and
     * the label beside it.
     */
    void legendEntry(String label, Color fill, Hatch hatch, Color outline, float outlineWidth) {
        int x = 4;
        int y = legendY;
        Rectangle box = new Rectangle(x, y, SWATCH_W, SWATCH_H);
        lg.setColor(fill);
        lg.fill(box);
        if (hatch != Hatch.NONE) {
            Shape old = lg.getClip();
            lg.setClip(box);
            lg.setColor(Palette.TEXT);
            lg.setStroke(new BasicStroke(1.3f));
            hatchLines(lg, box, hatch);
            lg.setClip(old);
        }
        lg.setColor(outline);
        lg.setStroke(new BasicStroke(outlineWidth));
        lg.draw(box);
        swatches.add(box);
        int end = wrapped(label, x + SWATCH_W + 10, y - 1, LEGEND_W - SWATCH_W - 22, SMALL);
        legendY = Math.max(y + SWATCH_H, end + 4) + 8;
    }

    /** A legend entry for point markers. */
    void legendPoint(String label, Color fill, double radius) {
        int cx = 4 + SWATCH_W / 2;
        int cy = legendY + SWATCH_H / 2;
        Ellipse2D.Double c = new Ellipse2D.Double(cx - radius, cy - radius, 2 * radius, 2 * radius);
        lg.setColor(fill);
        lg.fill(c);
        lg.setColor(Palette.TEXT);
        lg.setStroke(new BasicStroke(1.2f));
        lg.draw(c);
        swatches.add(new Rectangle((int) (cx - radius), (int) (cy - radius), (int) (2 * radius), (int) (2 * radius)));
        int end = wrapped(label, 4 + SWATCH_W + 10, legendY - 1, LEGEND_W - SWATCH_W - 22, SMALL);
        legendY = Math.max(legendY + SWATCH_H, end + 4) + 8;
    }

    /** Space between legend blocks. */
    void legendGap() {
        legendY += 10;
    }

    private int wrapped(String text, int x, int y, int width, Font font) {
        lg.setFont(font);
        lg.setColor(Palette.TEXT);
        FontMetrics fm = lg.getFontMetrics();
        StringBuilder line = new StringBuilder();
        int yy = y + fm.getAscent();
        for (String word : text.split(" ")) {
            if (line.length() > 0 && fm.stringWidth(line + " " + word) > width) {
                lg.drawString(line.toString(), x, yy);
                yy += fm.getHeight();
                line.setLength(0);
            }
            if (line.length() > 0) {
                line.append(' ');
            }
            line.append(word);
        }
        lg.drawString(line.toString(), x, yy);
        return yy + fm.getDescent();
    }

    // ------------------------------------------------------------------ furniture

    /** Scale bar of a round length (about a fifth of a panel) under the first panel, north arrow. */
    void scaleBarAndNorth(String lengthUnit) {
        double target = extent.getWidth() / 5;
        double len = Numbers.roundDown125(target);
        int x = LEFT + 10;
        int y = top + plotH + 16;
        int w = (int) Math.round(len * scale);
        g.setStroke(new BasicStroke(1f));
        for (int k = 0; k < 4; k++) {
            g.setColor(k % 2 == 0 ? Palette.TEXT : Color.WHITE);
            g.fillRect(x + k * w / 4, y, w / 4, 7);
        }
        g.setColor(Palette.TEXT);
        g.drawRect(x, y, w, 7);
        g.setFont(SMALL);
        g.drawString("0", x - 3, y + 22);
        String end = Numbers.significant(len, 3) + " " + lengthUnit;
        g.drawString(end, x + w - 6, y + 22);
        for (int p = 0; p < panels; p++) {
            int ax = x0(p) + plotW - 14;
            int ay = top + plotH + 10;
            Path2D.Double arrow = new Path2D.Double();
            arrow.moveTo(ax, ay);
            arrow.lineTo(ax - 8, ay + 22);
            arrow.lineTo(ax, ay + 16);
            arrow.closePath();
            g.setColor(Palette.TEXT);
            g.fill(arrow);
            Path2D.Double right = new Path2D.Double();
            right.moveTo(ax, ay);
            right.lineTo(ax + 8, ay + 22);
            right.lineTo(ax, ay + 16);
            right.closePath();
            g.setColor(Color.WHITE);
            g.fill(right);
            g.setColor(Palette.TEXT);
            g.setStroke(new BasicStroke(1f));
            g.draw(right);
            g.setFont(LABEL_BOLD);
            g.drawString("N", ax - 22, ay + 18);
        }
    }

    /** Composes map, legend, title and caption into the final image. */
    BufferedImage finish() {
        g.dispose();
        lg.dispose();
        int legendX = map.getWidth() + 26;
        int width = legendX + LEGEND_W;
        int height = Math.max(map.getHeight(), top + legendY + 10);
        BufferedImage out = new BufferedImage(width, height, BufferedImage.TYPE_INT_RGB);
        Graphics2D o = out.createGraphics();
        hints(o);
        o.setColor(Color.WHITE);
        o.fillRect(0, 0, width, height);
        o.drawImage(map, 0, 0, null);
        o.drawImage(legend, legendX, top, null);
        o.setColor(Palette.TEXT);
        o.setFont(TITLE);
        o.drawString(title, LEFT, 34);
        o.setFont(SMALL);
        o.setColor(Palette.MUTED);
        o.drawString(caption, LEFT, top + plotH + BOTTOM - 12);
        o.dispose();
        List<Rectangle> shifted = new ArrayList<>();
        for (Rectangle r : swatches) {
            shifted.add(new Rectangle(r.x + legendX, r.y + top, r.width, r.height));
        }
        int[] ticks = barTicks == null ? new int[0] : barTicks.clone();
        for (int i = 0; i < ticks.length; i++) {
            ticks[i] += top;
        }
        layout = new Layout(shifted, colourBar == null ? null
                : new Rectangle(colourBar.x + legendX, colourBar.y + top, colourBar.width, colourBar.height), ticks);
        return out;
    }

    private Layout layout;

    /** The legend layout of the finished image. */
    Layout layout() {
        return layout;
    }
}
