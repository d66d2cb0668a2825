/**
 * Models on densities: simplicial functional PCA, function-on-scalar, function-on-function and
 * scalar-on-function regression. Anomaly scoring and excess counts are in
 * {@link io.densa.regression.surveillance}.
 *
 * <h2>Semantics</h2>
 * Models take a {@link io.densa.core.DensitySet} (an n × K coordinate matrix in an orthonormal
 * basis) and do linear algebra on coordinates; results are turned back into densities and clr
 * functions through the set's {@link io.densa.core.BayesSpace}. Configuration objects and fitted
 * models are immutable; fitted models are safe to share between threads.
 *
 * <h2>Contents</h2>
 * <ul>
 * <li>{@link io.densa.regression.Fpca}: simplicial FPCA (mean, eigenvalues, components, scores,
 * reconstruction, modes of variation, choice of the number of components).</li>
 * <li>{@link io.densa.regression.Design}: scalar covariates (numeric, categorical, intercept).</li>
 * <li>{@link io.densa.regression.FunctionOnScalarRegression} and
 * {@link io.densa.regression.FunctionOnScalarFit}: density response on scalar covariates, with
 * penalty, weights, bootstrap bands and permutation tests; {@link io.densa.regression.Penalties}.</li>
 * <li>{@link io.densa.regression.FunctionalRegression} with
 * {@link io.densa.regression.FunctionOnFunctionFit} and
 * {@link io.densa.regression.ScalarOnFunctionFit}: density predictors, by FPCA truncation or
 * ridge with cross-validated tuning.</li>
 * </ul>
 *
 * <p>Random procedures (folds, bootstrap, permutations) take a seed and use
 * {@link java.util.SplittableRandom}; batch passes over the data use fixed row blocks, so results
 * do not depend on the number of threads. Nothing here prints or keeps global state.
 */
package io.densa.regression;
