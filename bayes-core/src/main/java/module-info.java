/**
 * Densa core: the Bayes space of densities on an interval, its values and sets of values
 * ({@code io.densa.core}), and estimation of densities from counts and samples
 * ({@code io.densa.core.estimate}). The kernels of {@code io.densa.core.internal} are shared with
 * the sibling modules only. See each package's documentation for its semantics.
 */
module io.densa.core {
    // DMatrixRMaj appears in public signatures (DensitySet, the estimators' penalties and diagnostics)
    requires transitive ejml.core;
    // decompositions and dense operations (SingularOps, LinearSolverFactory, symmetric QR)
    requires ejml.ddense;
    // the binomial split of counts into cross-validation folds (PenalizedLikelihoodEstimator)
    requires commons.math3;
    // optional SIMD kernels (KernelPath), linked only when the JVM runs with --add-modules jdk.incubator.vector
    requires static jdk.incubator.vector;

    exports io.densa.core;
    exports io.densa.core.estimate;
    exports io.densa.core.internal to io.densa.regression, io.densa.spatial;
}
