package io.densa.report;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Number formatting for reports: locale-independent (dot decimals), fixed or significant digits,
 * p-values with enough digits to rank them, and round tick values for axes and colour legends.
 *
 * <p>Stateless and thread-safe; arrays are not modified.
 */
public final class Numbers {
    /** Most significant digits {@link #rankable(double[])} uses before giving up on ties. */
    static final int MAX_DIGITS = 8;

    private Numbers() {
    }

    /** Fixed-point with {@code decimals} decimals ("n/a" for NaN), e.g. {@code fixed(3.14159, 2)} = "3.14". */
    public static String fixed(double v, int decimals) {
        if (Double.isNaN(v)) {
            return "n/a";
        }
        if (decimals < 0 || decimals > 15) {
            throw new IllegalArgumentException("decimals must be in [0, 15], got " + decimals);
        }
        return String.format(Locale.ROOT, "%." + decimals + "f", v);
    }

    /**
     * Up to {@code digits} significant digits without trailing zeros, in plain notation from 1e-4 to
     * 1e9 and in scientific notation ({@code 1.2e-05}) outside; "n/a" for NaN.
     */
    public static String significant(double v, int digits) {
        if (Double.isNaN(v)) {
            return "n/a";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "inf" : "-inf";
        }
        if (digits < 1 || digits > 17) {
            throw new IllegalArgumentException("significant digits must be in [1, 17], got " + digits);
        }
        if (v == 0) {
            return "0";
        }
        BigDecimal b = new BigDecimal(v).round(new MathContext(digits, RoundingMode.HALF_EVEN));
        double a = Math.abs(b.doubleValue());
        if (a >= 1e-4 && a < 1e9) {
            return b.stripTrailingZeros().toPlainString();
        }
        BigDecimal unscaled = b.stripTrailingZeros();
        int exponent = unscaled.precision() - unscaled.scale() - 1;
        BigDecimal mantissa = unscaled.movePointLeft(exponent);
        return mantissa.toPlainString() + String.format(Locale.ROOT, "e%s%02d", exponent < 0 ? "-" : "+",
                Math.abs(exponent));
    }

    /**
     * Formats a column of probabilities (p-values, q-values) with the fewest significant digits, at
     * least two, that give different values different strings, so that the column can be ranked by
     * reading it. Equal values (true ties) stay equal. NaN gives "n/a".
     *
     * @param values the column (not modified)
     * @return one string per value
     */
    public static String[] rankable(double[] values) {
        for (int digits = 2; digits <= MAX_DIGITS; digits++) {
            String[] out = format(values, digits);
            if (distinct(values, out)) {
                return out;
            }
        }
        return format(values, MAX_DIGITS);
    }

    private static String[] format(double[] values, int digits) {
        String[] out = new String[values.length];
        for (int i = 0; i < values.length; i++) {
            out[i] = significant(values[i], digits);
        }
        return out;
    }

    private static boolean distinct(double[] values, String[] text) {
        Map<String, Double> seen = new HashMap<>();
        for (int i = 0; i < values.length; i++) {
            if (Double.isNaN(values[i])) {
                continue;
            }
            Double before = seen.putIfAbsent(text[i], values[i]);
            if (before != null && before != values[i]) {
                return false;
            }
        }
        return true;
    }

    /**
     * Round tick values covering [lo, hi]: multiples of 1, 2 or 5 times a power of ten, about
     * {@code target} of them, all inside [lo, hi] (Heckbert (1990), "Nice numbers for graph labels",
     * Graphics Gems, from memory).
     *
     * @throws IllegalArgumentException if the bounds are not finite or not increasing, or target &lt; 2
     */
    public static double[] ticks(double lo, double hi, int target) {
        if (!(Double.isFinite(lo) && Double.isFinite(hi) && hi > lo) || target < 2) {
            throw new IllegalArgumentException("ticks need finite lo < hi and target >= 2, got [" + lo + ", " + hi
                    + "], " + target);
        }
        double step = tickStep(lo, hi, target);
        List<Double> out = new ArrayList<>();
        double first = Math.ceil(lo / step - 1e-9) * step;
        for (double v = first; v <= hi + step * 1e-9; v += step) {
            out.add(clean(v, step));
        }
        return out.stream().mapToDouble(Double::doubleValue).toArray();
    }

    /** The 1-2-5 step of {@link #ticks}. */
    public static double tickStep(double lo, double hi, int target) {
        double raw = (hi - lo) / Math.max(1, target - 1);
        double mag = Math.pow(10, Math.floor(Math.log10(raw)));
        double f = raw / mag;
        double nice = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;
        return nice * mag;
    }

    /** Removes the floating-point noise of accumulating steps (e.g. 0.30000000000000004 → 0.3). */
    private static double clean(double v, double step) {
        int decimals = Math.max(0, (int) -Math.floor(Math.log10(step)) + 1);
        return new BigDecimal(v).setScale(decimals, RoundingMode.HALF_EVEN).doubleValue();
    }

    /**
     * Round tick values for a logarithmic scale on [lo, hi] (both &gt; 0): 1, 2 and 5 times powers of
     * ten when the range spans at most three decades, powers of ten alone beyond. At least two ticks
     * whenever the range contains two such values.
     */
    public static double[] logTicks(double lo, double hi) {
        if (!(lo > 0 && Double.isFinite(hi) && hi > lo)) {
            throw new IllegalArgumentException("log ticks need 0 < lo < hi, got [" + lo + ", " + hi + "]");
        }
        double decades = Math.log10(hi / lo);
        double[] mantissas = decades <= 0.7 ? new double[] {1, 1.5, 2, 3, 4, 5, 6, 7, 8}
                : decades <= 3.2 ? new double[] {1, 2, 5} : new double[] {1};
        List<Double> out = new ArrayList<>();
        for (int e = (int) Math.floor(Math.log10(lo)) - 1; e <= (int) Math.ceil(Math.log10(hi)); e++) {
            for (double m : mantissas) {
                double v = new BigDecimal(m).scaleByPowerOfTen(e).doubleValue();
                if (v >= lo * (1 - 1e-12) && v <= hi * (1 + 1e-12)) {
                    out.add(v);
                }
            }
        }
        return out.stream().mapToDouble(Double::doubleValue).toArray();
    }

    /** The largest value 1, 2 or 5 times a power of ten that is at most v (v &gt; 0). */
    public static double roundDown125(double v) {
        double mag = Math.pow(10, Math.floor(Math.log10(v)));
        double f = v / mag;
        return new BigDecimal(f >= 5 - 1e-12 ? 5 : f >= 2 - 1e-12 ? 2 : 1).multiply(new BigDecimal(mag))
                .round(new MathContext(12)).doubleValue();
    }

    /** The smallest value 1, 2 or 5 times a power of ten that is at least v (v &gt; 0). */
    public static double roundUp125(double v) {
        double mag = Math.pow(10, Math.floor(Math.log10(v)));
        double f = v / mag;
        return new BigDecimal(f <= 1 + 1e-12 ? 1 : f <= 2 + 1e-12 ? 2 : f <= 5 + 1e-12 ? 5 : 10)
                .multiply(new BigDecimal(mag)).round(new MathContext(12)).doubleValue();
    }

    /**
     * Labels for tick values: the fewest decimals (up to 6) that write every value exactly, e.g.
     * {0, 0.25, 0.5} → {"0", "0.25", "0.5"}; thousands are not grouped.
     */
    public static String[] tickLabels(double[] ticks) {
        String[] out = new String[ticks.length];
        for (int i = 0; i < ticks.length; i++) {
            out[i] = significant(ticks[i], 6);
        }
        return out;
    }
}
