package io.densa.core;

/**
 * A numerical failure (no convergence, singular or ill-conditioned system) with the
 * diagnostics that explain it. Bad input is reported by {@link IllegalArgumentException}
 * instead.
 */
public class DensaException extends RuntimeException {
    private static final long serialVersionUID = 1L;
    private final transient Record diagnostics;

    /**
     * @param message     what failed, where, and what would help
     * @param diagnostics the numbers behind the failure (may be null)
     */
    public DensaException(String message, Record diagnostics) {
        super(message);
        this.diagnostics = diagnostics;
    }

    /** The diagnostics record, or null if none was attached. */
    public Record diagnostics() {
        return diagnostics;
    }
}
