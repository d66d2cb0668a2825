/**
 * Estimation of densities in a {@link io.densa.core.BayesSpace} from binned counts and raw
 * samples.
 *
 * <h2>Semantics</h2>
 * {@link io.densa.core.estimate.PenalizedLikelihoodEstimator} maximises a penalised likelihood
 * directly in the space's coordinates (counts or samples, zero counts need no replacement);
 * {@link io.densa.core.estimate.SmoothingSplineEstimator} fits the clr of a zero-replaced
 * histogram ({@link io.densa.core.estimate.ZeroReplacement}) by penalised least squares. Each
 * returns a {@link io.densa.core.estimate.UnitEstimate} for one unit or a
 * {@link io.densa.core.estimate.BatchEstimate} (a {@link io.densa.core.DensitySet} plus one
 * {@link io.densa.core.estimate.EstimationDiagnostics} per unit) for many units sharing bin
 * edges; the smoothing parameter is fixed or chosen by a {@link
 * io.densa.core.estimate.SmoothingCriterion}.
 *
 * <p>Inputs: bin edges strictly increasing inside the space's domain; counts finite and
 * non-negative (whole numbers unless fractional counts are allowed), one row per unit with one
 * count per bin; samples finite and inside the domain; ids, when given, one non-null id per unit.
 * What a unit without events yields is set by {@link io.densa.core.estimate.ZeroTotalPolicy}.
 * Units whose values beyond a detection limit were recorded at the limit are declared with
 * {@link io.densa.core.estimate.DetectionLimits}: their censored counts enter the likelihood as
 * "at most (at least) the limit" instead of a spike at the limit.
 * Outputs: immutable estimators and results; no argument is modified. Batches run in fixed blocks
 * combined in order, so parallel and serial runs give bit-identical results. Bad input throws
 * {@link java.lang.IllegalArgumentException} naming the unit and bin; a fit that fails numerically
 * throws {@link io.densa.core.DensaException} or is reported in its diagnostics.
 */
package io.densa.core.estimate;
