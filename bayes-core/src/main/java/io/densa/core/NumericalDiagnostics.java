package io.densa.core;

import java.io.Serializable;

/**
 * The numbers behind a numerical failure, carried by a {@link DensaException}. Every Densa
 * diagnostics record implements this interface (for example {@link SolveDiagnostics},
 * {@link EvaluationDiagnostics}, the estimators' {@code EstimationDiagnostics} and the kriging
 * {@code KrigingDiagnostics}); {@link DensaException#diagnostics(Class)} picks out the expected
 * kind. Diagnostics are serializable, so that they survive distributed execution.
 */
public interface NumericalDiagnostics extends Serializable {
}
