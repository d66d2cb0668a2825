package io.densa.core;

import java.util.Objects;
import java.util.Optional;

/**
 * A numerical failure (no convergence, singular or ill-conditioned system, a value beyond double
 * precision) with the diagnostics that explain it. Bad input is reported by
 * {@link IllegalArgumentException} instead.
 */
public class DensaException extends RuntimeException {
    private static final long serialVersionUID = 2L;
    private final NumericalDiagnostics diagnostics;

    /**
     * @param message     what failed, where, and what would help
     * @param diagnostics the numbers behind the failure (required)
     */
    public DensaException(String message, NumericalDiagnostics diagnostics) {
        super(message);
        this.diagnostics = Objects.requireNonNull(diagnostics, "diagnostics");
    }

    /** The diagnostics record (never null). */
    public NumericalDiagnostics diagnostics() {
        return diagnostics;
    }

    /**
     * The diagnostics if they are of the given kind, for example
     * {@code e.diagnostics(SolveDiagnostics.class).orElseThrow()}.
     */
    public <T extends NumericalDiagnostics> Optional<T> diagnostics(Class<T> type) {
        return type.isInstance(diagnostics) ? Optional.of(type.cast(diagnostics)) : Optional.empty();
    }
}
