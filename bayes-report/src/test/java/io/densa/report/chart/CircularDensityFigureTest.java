package io.densa.report.chart;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.awt.image.BufferedImage;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.XYPlot;
import org.junit.jupiter.api.Test;

/**
 * A density on a circle drawn by {@link Figures#density}: the curve spans one period from the space's
 * start, and the data of a bin that wraps around the cut point are drawn at its midpoint taken modulo
 * the period (x ≡ x + kP on the circle ℝ/Pℤ), so the x axis stays within one period.
 */
class CircularDensityFigureTest {
    @Test
    void curveAndDataStayWithinOnePeriodFromTheStart() {
        for (double start : new double[] {0, 100}) {
            BayesSpace circle = BayesSpace.periodicSplines(start, 365, 4, 8);
            // bins of 30 from start + 20; the last, [start + 350, start + 385), wraps around the cut point
            double[] lower = new double[12];
            double[] upper = new double[12];
            int[] counts = new int[12];
            for (int j = 0; j < 12; j++) {
                lower[j] = start + 20 + 30 * j;
                upper[j] = j == 11 ? start + 385 : lower[j] + 30;
                counts[j] = 5 + (j == 11 ? 20 : j);
            }
            double[] edges = new double[13];
            System.arraycopy(lower, 0, edges, 0, 12);
            edges[12] = start + 385;
            Density f = PenalizedLikelihoodEstimator.withDefaults(circle).withSmoothing(1).fit(edges, counts).density();
            Chart c = Figures.density("circle", f, Observed.counts("observed", lower, upper, counts),
                    Axis.linear("day of year", "days"));
            for (Chart.Series s : c.series()) {
                for (double x : s.x()) {
                    assertTrue(x >= start && x < start + 365, s.name() + ": x = " + x + " outside one period from "
                            + start);
                }
            }
            // the wrapping bin's midpoint start + 367.5 is drawn at start + 2.5, the others where they are
            double[] px = c.series().get(0).x();
            assertEquals(start + 2.5, px[11], 1e-12);
            assertEquals(start + 35, px[0], 1e-12);
            // a bin whose midpoint is the end of the period itself is drawn at the start
            Chart d = Figures.density("circle", f, Observed.counts("observed", new double[] {start + 350},
                    new double[] {start + 380}, new int[] {3}), Axis.linear("day of year", "days"));
            assertEquals(start, d.series().get(0).x()[0], 1e-12);
            ValueAxis axis = ((XYPlot) c.toJFreeChart().getPlot()).getDomainAxis();
            assertTrue(axis.getLowerBound() > start - 0.05 * 365 && axis.getUpperBound() < start + 365 + 0.05 * 365,
                    "axis [" + axis.getLowerBound() + ", " + axis.getUpperBound() + "]");
            BufferedImage img = c.render();
            assertTrue(img.getWidth() > 0);
        }
    }
}
