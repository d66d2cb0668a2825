package io.densa.examples;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.Shape;
import java.awt.geom.AffineTransform;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Path2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import javax.imageio.ImageIO;
import org.locationtech.jts.geom.Coordinate;
import org.locationtech.jts.geom.Envelope;
import org.locationtech.jts.geom.Geometry;
import org.locationtech.jts.geom.Polygon;

/**
 * Draws maps with Java2D from planar-kilometre geometry: filled polygons (choropleths), rasters
 * (grid predictions), points, a title, a colour bar or category legend, a scale bar and a north
 * arrow. One instance draws one PNG. Works headless.
 */
final class MapPainter {
    private static final int LEFT = 20;
    private static final int TOP = 56;
    private static final int RIGHT = 196;
    private static final int BOTTOM = 64;
    private static final Font TITLE = new Font(Font.SANS_SERIF, Font.BOLD, 18);
    private static final Font LABEL = new Font(Font.SANS_SERIF, Font.PLAIN, 13);
    private static final Font SMALL = new Font(Font.SANS_SERIF, Font.PLAIN, 12);

    private final Envelope extent;
    private final double scale;
    private final int plotW;
    private final int plotH;
    private final BufferedImage image;
    private final Graphics2D g;

    /**
     * @param extent  the area to show (km), padded by 3 %
     * @param plotW   width of the map area in pixels
     * @param title   title drawn above the map
     * @param caption a line under the map (source, units, CRS)
     */
    MapPainter(Envelope extent, int plotW, String title, String caption) {
        Envelope e = new Envelope(extent);
        e.expandBy(0.03 * Math.max(e.getWidth(), e.getHeight()));
        this.extent = e;
        this.plotW = plotW;
        this.scale = plotW / e.getWidth();
        this.plotH = (int) Math.ceil(e.getHeight() * scale);
        this.image = new BufferedImage(LEFT + plotW + RIGHT, TOP + plotH + BOTTOM, BufferedImage.TYPE_INT_RGB);
        this.g = image.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setColor(Color.WHITE);
        g.fillRect(0, 0, image.getWidth(), image.getHeight());
        g.setColor(new Color(0xF4F7FA));
        g.fillRect(LEFT, TOP, plotW, plotH);
        g.setColor(Color.BLACK);
        g.setFont(TITLE);
        g.drawString(title, LEFT, 32);
        g.setFont(SMALL);
        g.setColor(new Color(0x444444));
        g.drawString(caption, LEFT, TOP + plotH + BOTTOM - 10);
    }

    double px(double x) {
        return LEFT + (x - extent.getMinX()) * scale;
    }

    double py(double y) {
        return TOP + (extent.getMaxY() - y) * scale;
    }

    private Shape shape(Geometry geom) {
        Path2D.Double path = new Path2D.Double(Path2D.WIND_EVEN_ODD);
        for (int i = 0; i < geom.getNumGeometries(); i++) {
            if (geom.getGeometryN(i) instanceof Polygon p) {
                addRing(path, p.getExteriorRing().getCoordinates());
                for (int h = 0; h < p.getNumInteriorRing(); h++) {
                    addRing(path, p.getInteriorRingN(h).getCoordinates());
                }
            }
        }
        return path;
    }

    private void addRing(Path2D.Double path, Coordinate[] cs) {
        for (int i = 0; i < cs.length; i++) {
            if (i == 0) {
                path.moveTo(px(cs[i].x), py(cs[i].y));
            } else {
                path.lineTo(px(cs[i].x), py(cs[i].y));
            }
        }
        path.closePath();
    }

    /** Fills each geometry with its colour and strokes its border. */
    MapPainter fill(List<Geometry> shapes, Color[] fills, Color border, float borderWidth) {
        g.setStroke(new BasicStroke(borderWidth));
        for (int i = 0; i < shapes.size(); i++) {
            Shape s = shape(shapes.get(i));
            g.setColor(fills[i]);
            g.fill(s);
            if (border != null) {
                g.setColor(border);
                g.draw(s);
            }
        }
        return this;
    }

    /** Strokes the borders of the geometries only. */
    MapPainter stroke(List<Geometry> shapes, Color colour, float width) {
        g.setStroke(new BasicStroke(width, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND));
        g.setColor(colour);
        for (Geometry s : shapes) {
            g.draw(shape(s));
        }
        return this;
    }

    /**
     * Draws a raster of nx × ny cells covering {@code cells} (km), row 0 at the south; NaN cells
     * stay transparent. The raster is clipped to {@code clip} when given.
     */
    MapPainter raster(Envelope cells, int nx, int ny, double[] values, ColourScale colours, Geometry clip) {
        BufferedImage r = new BufferedImage(nx, ny, BufferedImage.TYPE_INT_ARGB);
        for (int j = 0; j < ny; j++) {
            for (int i = 0; i < nx; i++) {
                double v = values[j * nx + i];
                if (Double.isFinite(v)) {
                    r.setRGB(i, ny - 1 - j, colours.rgb(v));
                }
            }
        }
        Shape oldClip = g.getClip();
        if (clip != null) {
            g.setClip(shape(clip));
        }
        double x0 = px(cells.getMinX());
        double y0 = py(cells.getMaxY());
        double w = cells.getWidth() * scale;
        double h = cells.getHeight() * scale;
        AffineTransform t = new AffineTransform(w / nx, 0, 0, h / ny, x0, y0);
        g.setRenderingHint(RenderingHints.KEY_INTERPOLATION, RenderingHints.VALUE_INTERPOLATION_BILINEAR);
        g.drawImage(r, t, null);
        g.setClip(oldClip);
        return this;
    }

    /** Filled circles of the given pixel radius with a dark edge. */
    MapPainter points(double[] x, double[] y, Color[] fills, double radius) {
        g.setStroke(new BasicStroke(1.2f));
        for (int i = 0; i < x.length; i++) {
            Ellipse2D.Double c = new Ellipse2D.Double(px(x[i]) - radius, py(y[i]) - radius, 2 * radius, 2 * radius);
            g.setColor(fills[i]);
            g.fill(c);
            g.setColor(new Color(0x222222));
            g.draw(c);
        }
        return this;
    }

    /** Small text labels next to points. */
    MapPainter labels(double[] x, double[] y, String[] text) {
        g.setFont(SMALL);
        for (int i = 0; i < x.length; i++) {
            float lx = (float) px(x[i]) + 6;
            float ly = (float) py(y[i]) - 4;
            g.setColor(new Color(255, 255, 255, 200));
            FontMetrics fm = g.getFontMetrics();
            g.fillRect((int) lx - 1, (int) ly - fm.getAscent() + 1, fm.stringWidth(text[i]) + 2, fm.getHeight() - 2);
            g.setColor(Color.BLACK);
            g.drawString(text[i], lx, ly);
        }
        return this;
    }

    /** A vertical colour bar with five tick labels and the scale's label. */
    MapPainter colourBar(ColourScale colours, int digits) {
        int x0 = LEFT + plotW + 24;
        int barW = 22;
        int y0 = wrapped(colours.label(), x0 - 4, TOP + 4, RIGHT - 32) + 16;
        int barH = Math.min(plotH - (y0 - TOP) - 10, 320);
        for (int k = 0; k < barH; k++) {
            double v = colours.max() - (colours.max() - colours.min()) * k / (barH - 1.0);
            g.setColor(colours.colour(v));
            g.fillRect(x0, y0 + k, barW, 1);
        }
        g.setColor(Color.BLACK);
        g.setStroke(new BasicStroke(1f));
        g.drawRect(x0, y0, barW, barH);
        g.setFont(SMALL);
        for (int t = 0; t <= 4; t++) {
            double v = colours.max() - (colours.max() - colours.min()) * t / 4.0;
            int ty = y0 + (int) Math.round(barH * t / 4.0);
            g.drawLine(x0 + barW, ty, x0 + barW + 5, ty);
            g.drawString(String.format(Locale.ROOT, "%." + digits + "f", v), x0 + barW + 8, ty + 4);
        }
        return this;
    }

    /** A legend of coloured boxes. */
    MapPainter legend(String heading, String[] labels, Color[] colours) {
        int x0 = LEFT + plotW + 24;
        int y = TOP + 4;
        g.setFont(LABEL);
        g.setColor(Color.BLACK);
        y = wrapped(heading, x0 - 4, y, RIGHT - 32) + 8;
        g.setFont(SMALL);
        for (int i = 0; i < labels.length; i++) {
            g.setColor(colours[i]);
            g.fillRect(x0, y, 18, 14);
            g.setColor(Color.BLACK);
            g.drawRect(x0, y, 18, 14);
            g.drawString(labels[i], x0 + 24, y + 12);
            y += 22;
        }
        return this;
    }

    private int wrapped(String text, int x, int y, int width) {
        g.setFont(LABEL);
        g.setColor(Color.BLACK);
        FontMetrics fm = g.getFontMetrics();
        StringBuilder line = new StringBuilder();
        int yy = y + fm.getAscent();
        for (String word : text.split(" ")) {
            if (line.length() > 0 && fm.stringWidth(line + " " + word) > width) {
                g.drawString(line.toString(), x, yy);
                yy += fm.getHeight();
                line.setLength(0);
            }
            if (line.length() > 0) {
                line.append(' ');
            }
            line.append(word);
        }
        g.drawString(line.toString(), x, yy);
        return yy;
    }

    /** Scale bar of a round length (about a fifth of the map width) and a north arrow. */
    MapPainter scaleBar() {
        double target = extent.getWidth() / 5;
        double[] nice = {0.5, 1, 2, 5, 10, 20, 25, 50, 100, 200};
        double len = nice[0];
        for (double v : nice) {
            if (v <= target) {
                len = v;
            }
        }
        int x0 = LEFT + 10;
        int y0 = TOP + plotH + 16;
        int w = (int) Math.round(len * scale);
        g.setStroke(new BasicStroke(1f));
        for (int k = 0; k < 4; k++) {
            g.setColor(k % 2 == 0 ? Color.BLACK : Color.WHITE);
            g.fillRect(x0 + k * w / 4, y0, w / 4, 7);
        }
        g.setColor(Color.BLACK);
        g.drawRect(x0, y0, w, 7);
        g.setFont(SMALL);
        g.drawString("0", x0 - 3, y0 + 22);
        String end = (len == Math.rint(len) ? String.valueOf((int) len) : String.valueOf(len)) + " km";
        g.drawString(end, x0 + w - 6, y0 + 22);
        // north arrow in the top-right corner of the map
        int ax = LEFT + plotW - 24;
        int ay = TOP + 14;
        Path2D.Double arrow = new Path2D.Double();
        arrow.moveTo(ax, ay);
        arrow.lineTo(ax - 8, ay + 22);
        arrow.lineTo(ax, ay + 16);
        arrow.lineTo(ax + 8, ay + 22);
        arrow.closePath();
        g.setColor(Color.BLACK);
        g.fill(arrow);
        g.setFont(LABEL);
        g.drawString("N", ax - 5, ay + 38);
        return this;
    }

    void save(Path file) {
        g.dispose();
        try {
            ImageIO.write(image, "png", file.toFile());
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
