package io.densa.spatial.uncertainty;

/**
 * The Monte Carlo summary of one derived quantity (a quantile, an exceedance probability, a mean)
 * at one location, from n draws of its {@link PredictiveDistribution}.
 *
 * @param estimate the quantity at the kriged density itself (the plug-in value a map shows)
 * @param mean     the mean of the quantity over the draws
 * @param sd       the standard deviation of the quantity over the draws (n − 1 denominator): the
 *                 kriging uncertainty in the quantity's units (for a quantile with data units,
 *                 e.g. µg/m³)
 * @param lower    the lower end of the central interval: the sample quantile (1 − level)/2 of the
 *                 draws (Hyndman &amp; Fan type 7)
 * @param upper    the upper end, the sample quantile (1 + level)/2
 * @param level    the central level, e.g. 0.9
 * @param draws    the number n of draws
 */
public record DerivedInterval(double estimate, double mean, double sd, double lower, double upper, double level,
        int draws) {

    /** Width upper − lower of the interval. */
    public double width() {
        return upper - lower;
    }

    /**
     * The same summary multiplied by a positive factor, for quantities linear in this one: for an
     * exceedance probability of a daily value, {@code scaled(365)} summarises the expected number
     * of days per year above the threshold (by linearity of expectation, whatever the dependence
     * between days).
     *
     * @throws IllegalArgumentException unless the factor is finite and &gt; 0
     */
    public DerivedInterval scaled(double factor) {
        if (!(factor > 0) || Double.isInfinite(factor)) {
            throw new IllegalArgumentException("scale factor must be finite and > 0, got " + factor);
        }
        return new DerivedInterval(factor * estimate, factor * mean, factor * sd, factor * lower, factor * upper,
                level, draws);
    }
}
