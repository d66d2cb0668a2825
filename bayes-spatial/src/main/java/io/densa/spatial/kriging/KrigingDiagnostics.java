package io.densa.spatial.kriging;

import io.densa.core.NumericalDiagnostics;
import io.densa.core.internal.RecordArrays;

/**
 * Diagnostics attached to a {@link io.densa.core.DensaException} when a kriging system cannot be
 * solved reliably. Immutable: the array is copied on construction and by its accessor; equality
 * is by content.
 *
 * @param systemSize        number of data locations in the system
 * @param conditionEstimate estimate of the 2-norm condition number of the covariance matrix
 *                          ((max L_ii / min L_ii)² from its Cholesky factor, a lower bound; +∞
 *                          when the factorisation broke down)
 * @param locations         the data location indices of the system (ascending)
 * @param detail            what failed
 */
public record KrigingDiagnostics(int systemSize, double conditionEstimate, int[] locations, String detail)
        implements NumericalDiagnostics {

    /** Copies the array components (the caller keeps its arrays). */
    public KrigingDiagnostics {
        locations = RecordArrays.copy(locations);
    }

    /** A copy of the {@code locations} component. */
    @Override
    public int[] locations() {
        return RecordArrays.copy(locations);
    }

    /** Equality by content of every component (arrays element by element). */
    @Override
    public boolean equals(Object o) {
        return RecordArrays.equal(this, o);
    }

    /** Hash of the content of every component. */
    @Override
    public int hashCode() {
        return RecordArrays.hash(this);
    }

    /** The components, arrays printed by content. */
    @Override
    public String toString() {
        return RecordArrays.describe(this);
    }
}
