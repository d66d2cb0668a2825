package io.densa.spatial;

import io.densa.core.Density;

/**
 * One kriging prediction.
 *
 * @param density    the predicted density ⊕_i λ_i ⊙ X(s_i) (simple kriging: m ⊕ ⊕_i λ_i ⊙ (X(s_i) ⊖ m))
 * @param variance   the kriging variance E‖X(s_0) ⊖ X̂(s_0)‖²_B (B2 norm squared)
 * @param neighbours the data location indices used (ascending)
 * @param weights    λ_i for those neighbours, or null when not requested
 */
public record KrigingPrediction(Density density, double variance, int[] neighbours, double[] weights) {
}
