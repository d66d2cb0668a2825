/**
 * Spatial statistics of densities: locations and distances, trace-variograms, kriging of
 * densities, spatial autocorrelation.
 *
 * <h2>Semantics</h2>
 * Everything works on the coordinates of a {@link io.densa.core.DensitySet}: the
 * trace-semivariogram γ(h) = ½ E‖X(s) ⊖ X(s+h)‖²_B is computed from coordinate distances, and a
 * kriged density ⊕_i λ_i ⊙ X(s_i) is the weighted sum of coordinate rows, so predictions are in
 * the data's space. Locations are planar or geographic ({@link io.densa.spatial.Locations}).
 */
package io.densa.spatial;
