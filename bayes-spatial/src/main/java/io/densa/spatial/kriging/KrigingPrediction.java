package io.densa.spatial.kriging;

import io.densa.core.Density;
import io.densa.core.internal.RecordArrays;

/**
 * One kriging prediction. Immutable: arrays are copied on construction and by every accessor;
 * equality is by content.
 *
 * @param density    the predicted density ⊕_i λ_i ⊙ X(s_i) (simple kriging: m ⊕ ⊕_i λ_i ⊙ (X(s_i) ⊖ m))
 * @param variance   the kriging variance E‖X(s_0) ⊖ X̂(s_0)‖²_B (B2 norm squared)
 * @param neighbours the data location indices used (ascending)
 * @param weights    λ_i for those neighbours, or null when not requested
 * @param nearestStationDistance distance from the target to the nearest data location (in
 *                   the locations' units: planar units, or km for geographic locations; for a
 *                   block, from its nearest discretisation point to the nearest data location;
 *                   in leave-one-out, the left-out location does not count): a target many
 *                   ranges away from every station is an extrapolation, whose prediction is the
 *                   drift alone with a variance near the sill (or growing with the drift)
 */
public record KrigingPrediction(Density density, double variance, int[] neighbours, double[] weights,
        double nearestStationDistance) {

    /** Copies the array components (the caller keeps its arrays). */
    public KrigingPrediction {
        neighbours = RecordArrays.copy(neighbours);
        weights = RecordArrays.copy(weights);
    }

    /** A copy of the {@code neighbours} component. */
    @Override
    public int[] neighbours() {
        return RecordArrays.copy(neighbours);
    }

    /** A copy of the {@code weights} component. */
    @Override
    public double[] weights() {
        return RecordArrays.copy(weights);
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
