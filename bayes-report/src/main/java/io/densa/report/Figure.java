package io.densa.report;

import io.densa.report.chart.Chart;
import io.densa.report.chart.ChartGrid;
import io.densa.report.map.MapFigure;
import java.awt.image.BufferedImage;

/**
 * Something a report can show as a PNG: a {@link Chart}, a {@link ChartGrid} or a {@link MapFigure},
 * or a figure of one's own. {@link #render()} draws it headless (no display needed); it may be
 * called more than once and must return a new image each time.
 */
@FunctionalInterface
public interface Figure {
    /** Draws the figure into a new image. */
    BufferedImage render();
}
