package io.densa.core;

/**
 * A test statistic and its p-value. Every Densa test result implements it (the autocorrelation
 * tests, the function-on-scalar permutation test, the per-unit anomaly scores, the spatial scan, the
 * anisotropy test and the proportionality check of the predictive law), so results of
 * different tests can be listed, adjusted ({@link BenjaminiHochberg}) and reported alike.
 */
public interface TestResult {
    /** The test statistic. */
    double statistic();

    /** The p-value, in [0, 1]; two-sided unless {@link #method()} says otherwise. */
    double pValue();

    /**
     * How {@link #pValue()} was obtained, for example "randomisation (normal approximation),
     * two-sided" or "permutation (999 draws, seed 7), upper tail".
     */
    String method();

    /**
     * Whether the result is significant at level alpha, that is p ≤ alpha.
     *
     * @throws IllegalArgumentException unless 0 &lt; alpha &lt; 1
     */
    default boolean significantAt(double alpha) {
        if (!(alpha > 0 && alpha < 1)) {
            throw new IllegalArgumentException("level must be in (0, 1), got " + alpha);
        }
        return pValue() <= alpha;
    }
}
