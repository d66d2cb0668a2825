package io.densa.report;

import io.densa.core.BayesSpace;
import io.densa.spatial.variogram.VariogramModel;
import java.util.Locale;
import java.util.Objects;

/**
 * Readable descriptions of fitted models and spaces for report text.
 *
 * <p>Stateless and thread-safe.
 */
public final class Describe {
    private Describe() {
    }

    /**
     * A variogram model in words with its parameters and the distance unit, e.g.
     * {@code nugget 1.09 + exponential (partial sill 0.204, practical range 20.1 km)}.
     */
    public static String variogram(VariogramModel model, String lengthUnit) {
        Objects.requireNonNull(model, "model");
        Objects.requireNonNull(lengthUnit, "lengthUnit");
        StringBuilder sb = new StringBuilder();
        for (VariogramModel.Structure s : model.structures()) {
            if (sb.length() > 0) {
                sb.append(" + ");
            }
            String family = s.family().name().toLowerCase(Locale.ROOT);
            String c = Numbers.significant(s.partialSill(), 3);
            String a = Numbers.significant(s.range(), 3);
            switch (s.family()) {
                case NUGGET -> sb.append("nugget ").append(c);
                case EXPONENTIAL, GAUSSIAN -> sb.append(family).append(" (partial sill ").append(c)
                        .append(", practical range ").append(a).append(' ').append(lengthUnit).append(')');
                case MATERN -> sb.append("Matérn ν = ").append(Numbers.fixed(s.smoothness(), 2))
                        .append(" (partial sill ").append(c).append(", practical range ").append(a).append(' ')
                        .append(lengthUnit).append(')');
                case POWER -> sb.append("power (coefficient ").append(c).append(", exponent ").append(a).append(')');
                default -> sb.append(family).append(" (partial sill ").append(c).append(", range ").append(a)
                        .append(' ').append(lengthUnit).append(')');
            }
        }
        return sb.toString();
    }

    /**
     * A spline Bayes space in words, e.g. "the Bayes space of cubic B-splines on [0, 100] with the
     * Lebesgue reference and 8 equally spaced interior knots (K = 11 orthonormal clr coordinates)".
     *
     * @param knots how the knots were placed, in words
     */
    public static String splineSpace(BayesSpace space, String knots) {
        Objects.requireNonNull(space, "space");
        Objects.requireNonNull(knots, "knots");
        return "the Bayes space of cubic B-splines on [" + Numbers.significant(space.lower(), 3) + ", "
                + Numbers.significant(space.upper(), 3) + "] with the Lebesgue reference and " + knots + " (K = "
                + space.dimension() + " orthonormal clr coordinates)";
    }
}
