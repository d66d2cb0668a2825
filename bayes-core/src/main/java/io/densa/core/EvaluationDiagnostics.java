package io.densa.core;

import java.util.Objects;

/**
 * Diagnostics of a density evaluation (pdf, cdf, quantile, moments) that double precision cannot
 * represent, carried by the {@link DensaException} that reports it.
 *
 * @param quantity what was being evaluated ("pdf", "clr range", …)
 * @param x        the point of the domain where it failed (NaN when it is not one point)
 * @param size     the magnitude that was too large: the log of the pdf, or the clr magnitude
 */
public record EvaluationDiagnostics(String quantity, double x, double size) implements NumericalDiagnostics {
    /** Validates. */
    public EvaluationDiagnostics {
        Objects.requireNonNull(quantity, "quantity");
    }
}
