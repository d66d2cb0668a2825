package io.densa.spatial;

/**
 * Diagnostics attached to a {@link io.densa.core.DensaException} when a kriging system cannot be
 * solved reliably.
 *
 * @param systemSize        number of data locations in the system
 * @param conditionEstimate estimate of the 2-norm condition number of the covariance matrix
 *                          ((max L_ii / min L_ii)² from its Cholesky factor, a lower bound; +∞
 *                          when the factorisation broke down)
 * @param locations         the data location indices of the system (ascending)
 * @param detail            what failed
 */
public record KrigingDiagnostics(int systemSize, double conditionEstimate, int[] locations, String detail) {
}
