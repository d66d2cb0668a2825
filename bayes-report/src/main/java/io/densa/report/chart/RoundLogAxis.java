package io.densa.report.chart;

import io.densa.report.Numbers;
import java.awt.Graphics2D;
import java.awt.geom.Rectangle2D;
import java.util.ArrayList;
import java.util.List;
import org.jfree.chart.axis.AxisState;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.NumberTick;
import org.jfree.chart.axis.TickType;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.TextAnchor;

/**
 * A JFreeChart number axis whose values are natural logarithms of amounts, with ticks at the
 * logarithms of round amounts (1, 2, 5 times powers of ten, see {@link Numbers#logTicks}) labelled
 * with the amounts themselves.
 */
final class RoundLogAxis extends NumberAxis {
    private static final long serialVersionUID = 1L;

    RoundLogAxis(String label) {
        super(label);
    }

    @Override
    @SuppressWarnings({"rawtypes", "unchecked"})
    public List refreshTicks(Graphics2D g2, AxisState state, Rectangle2D dataArea, RectangleEdge edge) {
        double lo = Math.exp(getRange().getLowerBound());
        double hi = Math.exp(getRange().getUpperBound());
        if (!(hi > lo) || !Double.isFinite(hi) || !(lo > 0)) {
            return super.refreshTicks(g2, state, dataArea, edge);
        }
        double[] amounts = Numbers.logTicks(lo, hi);
        if (amounts.length < 2) {
            return super.refreshTicks(g2, state, dataArea, edge);
        }
        String[] labels = Numbers.tickLabels(amounts);
        boolean horizontal = RectangleEdge.isTopOrBottom(edge);
        TextAnchor anchor = horizontal ? (edge == RectangleEdge.TOP ? TextAnchor.BOTTOM_CENTER : TextAnchor.TOP_CENTER)
                : (edge == RectangleEdge.LEFT ? TextAnchor.CENTER_RIGHT : TextAnchor.CENTER_LEFT);
        List ticks = new ArrayList();
        for (int i = 0; i < amounts.length; i++) {
            ticks.add(new NumberTick(TickType.MAJOR, Math.log(amounts[i]), labels[i], anchor, anchor, 0));
        }
        return ticks;
    }
}
