package io.densa.report.chart;

import io.densa.report.Figure;
import io.densa.report.colour.Palette;
import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.util.List;
import java.util.Objects;

/**
 * Several charts in a grid of columns under one title, drawn as one image.
 *
 * <p>Immutable; rendering is headless.
 */
public final class ChartGrid implements Figure {
    private final String title;
    private final List<Chart> charts;
    private final int columns;
    private final int cellWidth;
    private final int cellHeight;

    private ChartGrid(String title, List<Chart> charts, int columns, int cellWidth, int cellHeight) {
        this.title = title;
        this.charts = List.copyOf(charts);
        this.columns = columns;
        this.cellWidth = cellWidth;
        this.cellHeight = cellHeight;
    }

    /**
     * Charts in rows of {@code columns}, each cell 560 × 380 pixels.
     *
     * @param title   the overall title (null or empty for none)
     * @param charts  at least one chart
     * @param columns at least one
     */
    public static ChartGrid of(String title, List<Chart> charts, int columns) {
        Objects.requireNonNull(charts, "charts");
        if (charts.isEmpty() || columns < 1) {
            throw new IllegalArgumentException("a chart grid needs at least one chart and one column, got "
                    + charts.size() + " charts and " + columns + " columns");
        }
        return new ChartGrid(title == null ? "" : title, charts, columns, 560, 380);
    }

    /** The size of each cell in pixels (each in [200, 2000]). */
    public ChartGrid withCellSize(int w, int h) {
        if (w < 200 || w > 2000 || h < 200 || h > 2000) {
            throw new IllegalArgumentException("cell size must be in [200, 2000] pixels, got " + w + " x " + h);
        }
        return new ChartGrid(title, charts, columns, w, h);
    }

    /** The charts. */
    public List<Chart> charts() {
        return charts;
    }

    @Override
    public BufferedImage render() {
        int cols = Math.min(columns, charts.size());
        int rows = (charts.size() + cols - 1) / cols;
        int top = title.isEmpty() ? 0 : 42;
        BufferedImage img = new BufferedImage(cols * cellWidth, rows * cellHeight + top, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setColor(Color.WHITE);
        g.fillRect(0, 0, img.getWidth(), img.getHeight());
        if (!title.isEmpty()) {
            g.setColor(Palette.TEXT);
            g.setFont(new Font(Font.SANS_SERIF, Font.BOLD, 19));
            g.drawString(title, 14, 30);
        }
        for (int i = 0; i < charts.size(); i++) {
            charts.get(i).draw(g, new Rectangle2D.Double((i % cols) * cellWidth, top + (i / cols) * cellHeight,
                    cellWidth, cellHeight));
        }
        g.dispose();
        return img;
    }
}
