package io.densa.core;

/**
 * Diagnostics of a linear system that could not be solved reliably, carried by the
 * {@link DensaException} that reports it.
 *
 * @param system             what was being solved (for example "QR of the weighted design")
 * @param size               order of the system
 * @param smallestPivotRatio smallest pivot over the largest diagonal entry (squared |R_jj| ratio
 *                           for QR), 0 when the matrix is not positive definite, NaN when a
 *                           decomposition failed outright
 */
public record SolveDiagnostics(String system, int size, double smallestPivotRatio) implements NumericalDiagnostics {
}
