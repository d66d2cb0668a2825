package io.densa.core;

/**
 * A test statistic and its p-value. Every Densa test result implements it (the autocorrelation
 * tests, the function-on-scalar permutation test, the per-unit anomaly scores), so results of
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
}
