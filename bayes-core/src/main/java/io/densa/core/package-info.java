/**
 * The Bayes Hilbert space B2(P) of densities on a bounded interval and its coordinates.
 *
 * <h2>Semantics</h2>
 * A {@link io.densa.core.BayesSpace} fixes a domain, a reference measure and an orthonormal
 * basis of the clr subspace; a {@link io.densa.core.Density} is a space plus K coordinates, and
 * a {@link io.densa.core.DensitySet} is n such densities as one n × K matrix. Because the basis is
 * orthonormal, perturbation, powering, inner products, means, PCA and kriging weights are ordinary
 * linear algebra on coordinates; only the space integrates.
 *
 * <p>Inputs: domains are finite with a &lt; b; coordinates and evaluation points are finite;
 * densities of different spaces are never mixed. Outputs: new immutable values; no argument is
 * modified. Bad input throws {@link java.lang.IllegalArgumentException} naming the offending
 * value; numerical failure throws {@link io.densa.core.DensaException} with diagnostics.
 */
package io.densa.core;
