package io.densa.report.colour;

import io.densa.report.Numbers;
import java.awt.Color;
import java.util.Objects;

/**
 * Maps values of one quantity to colours of a {@link ColourRamp}, and says what the colours mean:
 * the quantity, its unit, and tick values at round numbers for the legend.
 *
 * <p>Kinds of scale:
 * <ul>
 *   <li>{@link #linear} / {@link #of}: linear in the value; the domain is widened outward to round
 *       ticks (1, 2 or 5 times a power of ten) so that both ends of the legend are labelled;</li>
 *   <li>{@link #log}: logarithmic in the value (all values &gt; 0), ticks labelled in the value's
 *       own unit (e.g. 20, 50, 100, 200 visits), never in logarithms;</li>
 *   <li>{@link #diverging}: symmetric around zero on the diverging ramp;</li>
 *   <li>{@link #probability}: fixed on [0, 1] whatever the data, ticks at 0, 0.2, …, 1, so that maps
 *       of probabilities can be compared.</li>
 * </ul>
 * Values outside the domain take the colour of the nearer end; NaN takes {@link Palette#NO_DATA}.
 *
 * <p>Immutable and thread-safe.
 */
public final class ColourScale {
    private final ColourRamp ramp;
    private final double lo;
    private final double hi;
    private final boolean logarithmic;
    private final String quantity;
    private final String unit;
    private final double[] ticks;

    private ColourScale(ColourRamp ramp, double lo, double hi, boolean logarithmic, String quantity, String unit,
            double[] ticks) {
        this.ramp = Objects.requireNonNull(ramp, "ramp");
        this.lo = lo;
        this.hi = hi;
        this.logarithmic = logarithmic;
        this.quantity = Objects.requireNonNull(quantity, "quantity");
        this.unit = unit == null ? "" : unit;
        this.ticks = ticks;
    }

    /**
     * A linear scale on the ramp from {@code lo} to {@code hi}, widened outward to round ticks.
     *
     * @param ramp     the colours
     * @param lo       smallest value (finite)
     * @param hi       largest value (finite, ≥ lo; equal bounds are widened by one unit either side)
     * @param quantity what the colours show, e.g. "median age of visits"
     * @param unit     its unit, e.g. "years" ("" for none)
     */
    public static ColourScale linear(ColourRamp ramp, double lo, double hi, String quantity, String unit) {
        if (!(Double.isFinite(lo) && Double.isFinite(hi) && hi >= lo)) {
            throw new IllegalArgumentException("colour scale '" + quantity + "' needs finite lo <= hi, got [" + lo
                    + ", " + hi + "]");
        }
        if (hi == lo) {
            double d = lo == 0 ? 1 : Math.abs(lo) * 0.01;
            lo -= d;
            hi += d;
        }
        double step = Numbers.tickStep(lo, hi, 5);
        double a = Math.floor(lo / step + 1e-9) * step;
        double b = Math.ceil(hi / step - 1e-9) * step;
        return new ColourScale(ramp, a, b, false, quantity, unit, stepTicks(a, b, step));
    }

    /** A linear scale on the sequential ramp over the finite range of {@code values} (0..1 if none). */
    public static ColourScale of(double[] values, String quantity, String unit) {
        double[] r = range(values, false);
        return linear(ColourRamp.sequential(), r[0], r[1], quantity, unit);
    }

    /**
     * A logarithmic scale on the sequential ramp over the range of the positive finite values,
     * widened outward to 1, 2 or 5 times a power of ten; ticks are labelled in the values' unit.
     *
     * @throws IllegalArgumentException if no value is positive and finite
     */
    public static ColourScale log(double[] values, String quantity, String unit) {
        double[] r = range(values, true);
        if (Double.isNaN(r[0])) {
            throw new IllegalArgumentException("log colour scale '" + quantity + "' needs a positive finite value");
        }
        double a = Numbers.roundDown125(r[0]);
        double b = Numbers.roundUp125(r[1]);
        if (b <= a) {
            b = Numbers.roundUp125(a * 1.0001);
        }
        return new ColourScale(ColourRamp.sequential(), a, b, true, quantity, unit, Numbers.logTicks(a, b));
    }

    /**
     * A symmetric scale on the diverging ramp from −m to m, m being {@code absMax} rounded up to a
     * round tick value; white-ish at zero.
     *
     * @param absMax largest absolute value to resolve; larger values take the end colours
     */
    public static ColourScale diverging(double absMax, String quantity, String unit) {
        if (!(absMax > 0 && Double.isFinite(absMax))) {
            throw new IllegalArgumentException("diverging colour scale '" + quantity + "' needs a positive finite "
                    + "largest absolute value, got " + absMax);
        }
        double step = Numbers.tickStep(0, absMax, 3);
        double m = Math.ceil(absMax / step - 1e-9) * step;
        return new ColourScale(ColourRamp.diverging(), -m, m, false, quantity, unit, stepTicks(-m, m, step));
    }

    /**
     * Multiples of {@code step} from a to b (both multiples of it); when there would be more than
     * eight, every k-th one with k the smallest divisor of the number of steps that leaves at most
     * eight, so that both ends stay labelled.
     */
    private static double[] stepTicks(double a, double b, double step) {
        int steps = (int) Math.round((b - a) / step);
        int stride = 1;
        while (steps / stride + 1 > 8 || steps % stride != 0) {
            stride++;
        }
        double[] out = new double[steps / stride + 1];
        for (int k = 0; k < out.length; k++) {
            out[k] = new java.math.BigDecimal(a + k * stride * step).round(new java.math.MathContext(12))
                    .doubleValue();
        }
        return out;
    }

    /**
     * The fixed scale for probabilities: [0, 1] on the sequential ramp, ticks 0, 0.2, …, 1,
     * whatever the values shown.
     *
     * @param event what the probability is of, e.g. "P(daily mean > 15 µg/m³)"
     */
    public static ColourScale probability(String event) {
        return new ColourScale(ColourRamp.sequential(), 0, 1, false, event, "", new double[] {0, 0.2, 0.4, 0.6,
            0.8, 1});
    }

    private static double[] range(double[] values, boolean positive) {
        double a = Double.POSITIVE_INFINITY;
        double b = Double.NEGATIVE_INFINITY;
        for (double v : values) {
            if (Double.isFinite(v) && (!positive || v > 0)) {
                a = Math.min(a, v);
                b = Math.max(b, v);
            }
        }
        if (a > b) {
            return positive ? new double[] {Double.NaN, Double.NaN} : new double[] {0, 1};
        }
        return new double[] {a, b};
    }


    /** Position of a value on the ramp, in [0, 1] (NaN for NaN; non-positive values are 0 on a log scale). */
    public double position(double v) {
        if (Double.isNaN(v)) {
            return Double.NaN;
        }
        double t;
        if (logarithmic) {
            t = v <= 0 ? 0 : Math.log(v / lo) / Math.log(hi / lo);
        } else {
            t = (v - lo) / (hi - lo);
        }
        return Math.max(0, Math.min(1, t));
    }

    /** The colour of a value; {@link Palette#NO_DATA} for NaN. */
    public Color colour(double v) {
        return Double.isNaN(v) ? Palette.NO_DATA : ramp.colour(position(v));
    }

    /** The value at a ramp position in [0, 1] (inverse of {@link #position}). */
    public double valueAt(double t) {
        return logarithmic ? lo * Math.pow(hi / lo, t) : lo + t * (hi - lo);
    }

    /** Smallest value of the domain. */
    public double lower() {
        return lo;
    }

    /** Largest value of the domain. */
    public double upper() {
        return hi;
    }

    /** Whether the scale is logarithmic. */
    public boolean logarithmic() {
        return logarithmic;
    }

    /** The ramp. */
    public ColourRamp ramp() {
        return ramp;
    }

    /** Tick values at round numbers, in the quantity's unit (a copy). */
    public double[] ticks() {
        return ticks.clone();
    }

    /** Tick labels (see {@link Numbers#tickLabels}). */
    public String[] tickLabels() {
        return Numbers.tickLabels(ticks);
    }

    /** The legend title: "quantity (unit)", plus "log scale" for logarithmic scales. */
    public String title() {
        String u = unit.isEmpty() ? "" : unit;
        if (logarithmic) {
            u = u.isEmpty() ? "log scale" : u + ", log scale";
        }
        return u.isEmpty() ? quantity : quantity + " (" + u + ")";
    }

    /** What the colours show. */
    public String quantity() {
        return quantity;
    }

    /** The unit ("" for none). */
    public String unit() {
        return unit;
    }

    @Override
    public String toString() {
        return "ColourScale[" + title() + ", " + Numbers.significant(lo, 4) + " to " + Numbers.significant(hi, 4)
                + ", " + ramp.name() + "]";
    }
}
