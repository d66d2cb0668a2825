/**
 * Models on densities: simplicial functional PCA, function-on-scalar, function-on-function and
 * scalar-on-function regression, and anomaly scoring.
 *
 * <h2>Semantics</h2>
 * Models take a {@link io.densa.core.DensitySet} (an n × K coordinate matrix in an orthonormal
 * basis) and do linear algebra on coordinates; results are turned back into densities and clr
 * functions through the set's {@link io.densa.core.BayesSpace}. Configuration objects and fitted
 * models are immutable; fitted models are safe to share between threads.
 */
package io.densa.regression;
