package io.densa.spatial;

/**
 * The variogram cloud: for each listed pair (first[p], second[p]) of locations, their distance
 * and half the squared B2 distance ½‖X_i ⊖ X_j‖²_B of their densities. Arrays are owned by the
 * record; callers must not modify them.
 *
 * @param first       first location index of each pair
 * @param second      second location index (greater than first)
 * @param distance    spatial distance of each pair
 * @param semivariance ½‖X_i ⊖ X_j‖²_B of each pair
 * @param truncated   true if more pairs lay within the maximum lag than the requested limit
 */
public record VariogramCloud(int[] first, int[] second, double[] distance, double[] semivariance,
        boolean truncated) {
    /** Number of pairs listed. */
    public int size() {
        return first.length;
    }
}
