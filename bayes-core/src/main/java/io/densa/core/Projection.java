package io.densa.core;

/**
 * Result of projecting a function onto a Bayes space.
 *
 * @param density       the projected density
 * @param error         L2(P) norm of the clr residual (0 when the function lies in the space)
 * @param relativeError error divided by the L2(P) norm of the centred log-density
 */
public record Projection(Density density, double error, double relativeError) {
}
