package io.densa.spark;

import io.densa.core.NumericalDiagnostics;
import java.util.Objects;

/**
 * Diagnostics of a Densa failure that reached the driver only as the text of a Spark error (the
 * executor's exception object, with its own diagnostics, was not passed on).
 *
 * @param text the failure's message as Spark reported it
 */
public record RemoteFailure(String text) implements NumericalDiagnostics {
    /** Validates. */
    public RemoteFailure {
        Objects.requireNonNull(text, "text");
    }
}
