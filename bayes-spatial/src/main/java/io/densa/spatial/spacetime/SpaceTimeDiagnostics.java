package io.densa.spatial.spacetime;

import io.densa.core.NumericalDiagnostics;
import java.util.Objects;

/**
 * The numbers behind a numerical failure in space–time variograms, fitting or kriging, carried by
 * the {@link io.densa.core.DensaException} that reports it.
 *
 * @param quantity what failed ("space-time covariance matrix", "fit criterion", …)
 * @param index    the observation, lag class or column where it failed (−1 when not one)
 * @param value    the offending number (a pivot, a criterion value), NaN when there is none
 */
public record SpaceTimeDiagnostics(String quantity, int index, double value) implements NumericalDiagnostics {
    /** Validates. */
    public SpaceTimeDiagnostics {
        Objects.requireNonNull(quantity, "quantity");
    }
}
