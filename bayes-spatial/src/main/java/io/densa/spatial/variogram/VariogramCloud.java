package io.densa.spatial.variogram;

import io.densa.core.internal.RecordArrays;

/**
 * The variogram cloud: for each listed pair (first[p], second[p]) of locations, their distance
 * and half the squared B2 distance ½‖X_i ⊖ X_j‖²_B of their densities. Immutable: arrays are
 * copied on construction and by every accessor; equality is by content.
 *
 * @param first       first location index of each pair
 * @param second      second location index (greater than first)
 * @param distance    spatial distance of each pair
 * @param semivariance ½‖X_i ⊖ X_j‖²_B of each pair
 * @param truncated   true if more pairs lay within the maximum lag than the requested limit
 */
public record VariogramCloud(int[] first, int[] second, double[] distance, double[] semivariance,
        boolean truncated) {

    /** Copies the array components (the caller keeps its arrays). */
    public VariogramCloud {
        first = RecordArrays.copy(first);
        second = RecordArrays.copy(second);
        distance = RecordArrays.copy(distance);
        semivariance = RecordArrays.copy(semivariance);
    }

    /** A copy of the {@code first} component. */
    @Override
    public int[] first() {
        return RecordArrays.copy(first);
    }

    /** A copy of the {@code second} component. */
    @Override
    public int[] second() {
        return RecordArrays.copy(second);
    }

    /** A copy of the {@code distance} component. */
    @Override
    public double[] distance() {
        return RecordArrays.copy(distance);
    }

    /** A copy of the {@code semivariance} component. */
    @Override
    public double[] semivariance() {
        return RecordArrays.copy(semivariance);
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
    /** Number of pairs listed. */
    public int size() {
        return first.length;
    }
}
