package io.densa.spatial.autocorrelation;

/**
 * Result of a permutation test of an autocorrelation statistic T: the values are randomly
 * permuted over the units R times (conditional on the observed values) and T is recomputed.
 *
 * <p>Pseudo p-values count the observed value as one of the permutations (Hope (1968), A
 * simplified Monte Carlo significance test procedure, JRSS B 30 — from memory):
 * p_greater = (1 + #{T_r ≥ T}) / (R + 1), p_less = (1 + #{T_r ≤ T}) / (R + 1), and
 * p_two-sided = (1 + #{|T_r − E| ≥ |T − E|}) / (R + 1), where E is the exact permutation
 * expectation of T (for Moran's I, −1/(n − 1); for Geary's c, 1). Values within a relative
 * 1e-11 of the observed one count as ties (as large as the observed value).
 *
 * @param permutations R
 * @param seed         the seed that reproduces the permutations
 * @param mean         mean of the R permuted statistics
 * @param variance     variance of the R permuted statistics (divisor R − 1; 0 if R = 1)
 * @param pTwoSided    two-sided pseudo p-value
 * @param pGreater     one-sided pseudo p-value for T larger than expected
 * @param pLess        one-sided pseudo p-value for T smaller than expected
 */
public record AutocorrelationPermutation(int permutations, long seed, double mean, double variance,
        double pTwoSided, double pGreater, double pLess) {
}
