package io.densa.spatial.autocorrelation;

/**
 * Analytic moments of an autocorrelation statistic under one null hypothesis (normality or
 * randomisation) and the normal-approximation test they give.
 *
 * @param expectation E[T] under the null
 * @param variance    Var[T] under the null (positive)
 * @param z           (T − E[T]) / √Var[T]
 * @param pTwoSided   2 (1 − Φ(|z|))
 * @param pGreater    1 − Φ(z): evidence that T is larger than expected
 * @param pLess       Φ(z): evidence that T is smaller than expected
 */
public record AutocorrelationMoments(double expectation, double variance, double z, double pTwoSided,
        double pGreater, double pLess) {
}
