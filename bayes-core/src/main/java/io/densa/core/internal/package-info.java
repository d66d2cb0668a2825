/**
 * Internal kernels shared by the Densa modules: dense row-major products and blocked sums
 * ({@code Kernels}), seeded streams, permutations and folds ({@code Seeds}), the Cholesky
 * factorisation with its triangular solves and inverses ({@code Cholesky}), Gauss–Legendre rules,
 * the raw basis functions and their roughness penalty, record array helpers, sample quantiles,
 * exact count samplers ({@code CountSampling}), binary search ({@code Sorted}), golden-section search
 * ({@code GoldenSection}), the curvature of a function from its values at scattered points
 * ({@code ScatteredCurvature}) and progress counting. Internal: exported only to
 * the regression and spatial modules and not
 * published in the javadoc; may change without notice. Every kernel is deterministic: parallel and
 * serial runs give bit-identical results.
 */
package io.densa.core.internal;
