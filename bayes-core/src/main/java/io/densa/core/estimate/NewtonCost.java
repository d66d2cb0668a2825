package io.densa.core.estimate;

/**
 * Arithmetic cost of one damped-Newton iteration of {@link PenalizedLikelihoodEstimator} for one
 * unit, counted from the loops (see {@link PenalizedLikelihoodEstimator#newtonCost(double[])}).
 *
 * @param quadratureNodes nodes Q of the bin quadrature
 * @param supportWidth    raw basis functions nonzero at a point (W; the spline order)
 * @param dimension       K
 * @param flops           floating-point operations per iteration
 * @param expCalls        calls of {@code Math.exp} per iteration (Q)
 */
public record NewtonCost(int quadratureNodes, int supportWidth, int dimension, long flops, long expCalls) {
}
