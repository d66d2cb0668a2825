package io.densa.report.chart;

import java.util.Objects;

/**
 * A chart axis that knows its quantity and unit, and its scale. Its title is "quantity (unit)";
 * logarithmic axes are labelled at round values of the quantity in its own unit (e.g. 2, 5, 10,
 * 20, 50 µg/m³), never in logarithms.
 *
 * @param quantity what the axis measures, e.g. "age"
 * @param unit     its unit, e.g. "years" ("" for none)
 * @param scale    how values are placed
 */
public record Axis(String quantity, String unit, Scale scale) {
    /** How values are placed along the axis. */
    public enum Scale {
        /** Linear in the values given. */
        LINEAR,
        /** Linear, for whole numbers (counts of districts, events, weeks): ticks at whole numbers only. */
        COUNT,
        /** The values given are positive amounts, placed on a logarithmic scale. */
        LOG,
        /**
         * The values given are already natural logarithms of amounts in {@code unit} (as for a
         * density of log concentrations); placed linearly, labelled in the amounts.
         */
        LOGGED_DATA
    }

    /** Checks the components. */
    public Axis {
        Objects.requireNonNull(quantity, "quantity");
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(scale, "scale");
    }

    /** A linear axis. */
    public static Axis linear(String quantity, String unit) {
        return new Axis(quantity, unit, Scale.LINEAR);
    }

    /** A linear axis for whole numbers (counts), ticked at whole numbers only. */
    public static Axis count(String quantity, String unit) {
        return new Axis(quantity, unit, Scale.COUNT);
    }

    /** A logarithmic axis for positive amounts given as they are. */
    public static Axis log(String quantity, String unit) {
        return new Axis(quantity, unit, Scale.LOG);
    }

    /** An axis for natural logarithms of amounts, labelled in the amounts' unit. */
    public static Axis loggedData(String quantity, String unit) {
        return new Axis(quantity, unit, Scale.LOGGED_DATA);
    }

    /** "quantity (unit)", with "log scale" added for the logarithmic scales. */
    public String title() {
        String u = unit;
        if (logarithmic()) {
            u = u.isEmpty() ? "log scale" : u + ", log scale";
        }
        return u.isEmpty() ? quantity : quantity + " (" + u + ")";
    }

    /** Whether ticks are placed at logarithms of round amounts. */
    boolean logarithmic() {
        return scale == Scale.LOG || scale == Scale.LOGGED_DATA;
    }

    /** Position on the drawn axis of a value given in this axis's convention (NaN if it cannot be drawn). */
    double toPlot(double v) {
        if (scale == Scale.LOG) {
            return v > 0 ? Math.log(v) : Double.NaN;
        }
        return v;
    }
}
