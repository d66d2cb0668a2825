package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.spatial.variogram.VariogramModel;
import java.util.Locale;

/** Readable descriptions of fitted models for the reports. */
final class ModelText {
    private ModelText() {
    }

    /** E.g. {@code nugget 1.09 + exponential (partial sill 0.204, practical range 20.1 km)}. */
    static String variogram(VariogramModel model) {
        StringBuilder sb = new StringBuilder();
        for (VariogramModel.Structure s : model.structures()) {
            if (sb.length() > 0) {
                sb.append(" + ");
            }
            String family = s.family().name().toLowerCase(Locale.ROOT);
            switch (s.family()) {
                case NUGGET -> sb.append(String.format(Locale.ROOT, "nugget %.3g", s.partialSill()));
                case EXPONENTIAL, GAUSSIAN -> sb.append(String.format(Locale.ROOT,
                        "%s (partial sill %.3g, practical range %.3g km)", family, s.partialSill(), s.range()));
                case MATERN -> sb.append(String.format(Locale.ROOT, "Matérn ν = %.2f (partial sill %.3g, scale %.3g km)",
                        s.smoothness(), s.partialSill(), s.range()));
                case POWER -> sb.append(String.format(Locale.ROOT, "power (coefficient %.3g, exponent %.3g)",
                        s.partialSill(), s.range()));
                default -> sb.append(String.format(Locale.ROOT, "%s (partial sill %.3g, range %.3g km)", family,
                        s.partialSill(), s.range()));
            }
        }
        return sb.toString();
    }

    /** E.g. {@code cubic B-splines on [0, 100] with 10 interior knots (K = 13), Lebesgue reference}. */
    static String space(BayesSpace space, String interiorKnots) {
        return String.format(Locale.ROOT, "the Bayes space of cubic B-splines on [%s, %s] with the Lebesgue reference "
                + "and %s (K = %d orthonormal clr coordinates)", num(space.lower()), num(space.upper()), interiorKnots,
                space.dimension());
    }

    /** Up to three significant digits, no trailing zeros. */
    static String num(double v) {
        return new java.math.BigDecimal(String.format(Locale.ROOT, "%.3g", v)).stripTrailingZeros().toPlainString();
    }
}
