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
 *
 * <h2>The covariance of a penalised-likelihood estimate</h2>
 * The reported coordinate covariance is the sandwich J⁻¹ M J⁻¹ of the first-order (Newton)
 * linearisation ĉ − c_λ ≈ J⁻¹ ∇ℓ(c_λ) around the penalised target c_λ, with J = F + 2λΩ +
 * (w / P(I)) I (the reference prior's precision included), F the
 * expected Fisher information of the unpenalised log-likelihood at the estimate (multinomial:
 * F = N(Σ_j π_j m_j m_j' − m m'), m_j the mean of the basis functions over bin j under the fit;
 * samples: (Σ w_i²) Cov_f(e)) and edf = tr(J⁻¹F). The meat M estimates the variance of the score
 * under the distribution that generated the data:
 * <ul>
 * <li>binned counts: the empirical (model-robust) information M = N/(N − edf) · Σ_j n_j (m_j −
 * m̄)(m_j − m̄)', m̄ = Σ_j n_j m_j / N, the variance of the per-event scores over the observed
 * events (Huber (1967), The behavior of maximum likelihood estimates
 * under nonstandard conditions, Proc. 5th Berkeley Symp. 1; small-sample factor as HC1 in
 * MacKinnon &amp; White (1985), J. Econometrics 29; both from memory), or F when N ≤ edf + 1. The
 * model-based choice M = F describes the variance only if the data came from the smoothed fit
 * π(ĉ); a strongly penalised fit of a few tens of events is far from the truth (smoothing bias),
 * and F then over-reports: in our simulations (normal truth, 50 bins, K = 11, λ fixed) F gave a
 * reported / empirical trace of 1.31 at 100 events and 1.37 at 40 (1.7–1.9 at ten times the λ),
 * while the exact first-order variance J⁻¹ Var_true(∇ℓ) J⁻¹ at c_λ matched within 6 %: the
 * mismatch was the meat, not nonlinearity, not the multinomial constraint (the basis functions
 * integrate to zero, so F has full rank K when the bins resolve the space);</li>
 * <li>raw samples x_i with weights w_i: likewise M = n/(n − edf) · (Σ w_i²/W) Σ_i w_i (e(x_i) −
 * ē)(e(x_i) − ē)', ē the weighted sample mean of the basis functions, n = W²/Σ w_i² (Kish's
 * effective sample size), or F when n ≤ edf + 1 (with M = F: reported / empirical 1.26 at 40
 * and 1.23 at 100 observations);</li>
 * </ul>
 * With a fixed λ it is conditional on λ. With λ chosen per unit by
 * {@link io.densa.core.estimate.SmoothingCriterion#MARGINAL_LIKELIHOOD} (the default) the first-order effect of the
 * uncertainty of ρ = ln λ̂ is added, V_ρ (dĉ/dρ)(dĉ/dρ)' with dĉ/dρ = −H⁻¹ 2λΩĉ, H the observed
 * penalised information of the fit's last Newton iteration (implicit differentiation of the
 * penalised score equation) and V_ρ = 2/V''(ρ), V'' from the cubic through the search's criterion
 * values nearest to λ̂ where they bracket it, else from a central difference over ±0.25 decade (two
 * more fits of the search; Wood, Pya &amp; Säfken (2016), Smoothing parameter and model selection for general smooth
 * models, JASA 111, §3; from memory); without it, reported / empirical traces over replicates with
 * their own λ̂ were 0.92, 0.74 and 0.51 at 2,000, 100 and 40 events (normal truth), with it 0.98,
 * 0.91 and 0.81 (mixture truth: 0.93, 0.79, 0.74); these figures are from before the reference
 * prior, with which the same normal-truth replicates gave 0.98, 0.95 and 0.91. With the other
 * criteria the variability of λ̂
 * is not included (AICc picks λ over five decades on such replicates; reported / empirical
 * 0.2–0.3). With strong undersmoothing (λ far below the chosen one) the linearisation itself
 * under-reports. V_ρ is at most W²/4 (also where V is not convex at λ̂), W the width of the range
 * of ρ whose grid criterion is within 6 of the best, plus a grid step: no law on an interval of width
 * W has a larger variance (Popoviciu 1935). Where the data hardly determine λ (20–50 events, K = 24:
 * V may vary by under 0.1 over two decades) V''(ρ) is near 0 and the local value alone reported up to
 * 816 times the empirical variance over replicates; with the bound at most 14 (see the CHANGELOG).
 * It describes the sampling variability of the estimate, not its smoothing bias; its trace is the
 * unit's B2 estimation variance.
 *
 * <h2>Regions without events</h2>
 * <h3>The reference prior</h3>
 * Where a unit has no events (a run of empty bins at one end, as when values below a detection
 * limit are not reported or are set to the limit), the likelihood says only that the density is
 * small there, not how small. With the roughness penalty alone the estimate there is pure
 * extrapolation: a second-derivative penalty continues the slope at the edge of the data, and when
 * the data end abruptly the criterion picks a small λ and the clr dives far below anything the
 * data support (−24 to −268 on the simulated networks of the examples' clipped-network test);
 * those units then rule every B2 distance, FPCA and kriging. The term
 * (w / (2 P(I))) ‖c‖² is a Gaussian prior c ~ N(0, (P(I)/w) I) centred at the reference density,
 * the neutral element of B2(P), and isotropic in its geometry (van den Boogaart, Egozcue &amp;
 * Pawlowsky-Glahn (2014), Bayes Hilbert spaces, Aust. N. Z. J. Stat. 56(2); from memory). Its
 * precision is the Fisher information of w observations drawn from the reference (the
 * per-observation information of the coordinates there is Cov(e) = I / P(I), e orthonormal with
 * zero P-integral), so with w = 1 it is the unit-information prior of Kass &amp; Wasserman (1995), A
 * reference Bayesian test for nested hypotheses and its relationship to the Schwarz criterion,
 * JASA 90(431) (from memory): where there are N events it weighs as one observation among N (a
 * change of order 1/N); where there are none it sets the level, balancing N f(x) ≈ (w / P(I))
 * |clr(x)| for the P-density f, i.e. the clr settles where the expected number of events in the
 * empty region is of order one instead of diving without limit. It also makes the penalised
 * information positive definite in every direction. On ten simulated clipped networks (56 units,
 * 1,000–4,000 events over 40 bins, up to eight clipped at a detection limit with 10–15 empty low
 * bins) it brought the lowest clr of a clipped unit to −6.7 … −10.8, the leave-one-out
 * ordinary-kriging MSE from 0.69–1.00 (mean 0.84) of the mean-density baseline to 0.33–0.74 (mean
 * 0.48), and the deviation of the FPCA first-component share from that of the true densities from a
 * mean of 0.049 (up to 0.134) to 0.030 (up to 0.047; about 0.01 of it is the sampling noise any
 * estimate from these counts has). Measured alternatives that did less: a penalty that also damps the
 * slope (adding κ ∫ clr'², κ up to 100/(b − a)²: no change); one pseudo-event spread over the bins
 * like the reference (the conjugate prior of Diaconis &amp; Ylvisaker (1979), Conjugate priors for
 * exponential families, Ann. Statist. 7(2); from memory), whose cost grows only linearly with the
 * depth of the dive (dives to −30 remained); a floor on λ (g ≥ −1), which oversmoothed the units
 * with data. A reference measure weighted towards where the network's data lie (B2(P) with P the
 * pooled histogram; a choice of the space, {@link io.densa.core.BayesSpace#withReference}) also helped and
 * combines with the prior. {@link io.densa.core.estimate.PenalizedLikelihoodEstimator#withReferencePrior}(0) removes the prior.
 *
 * <h3>Empty bins at an end</h3>
 * The prior sets a level where there are no events; it cannot tell whether the events next to an
 * empty end are where they seem. Values clipped at a limit pile into the first occupied bin after
 * the empty run, a spike the true law does not have, and nothing in the counts tells it from a
 * density that rises there. {@link io.densa.core.estimate.PenalizedLikelihoodEstimator#withEmptyEnds}
 * (default {@code CENSORED_IF_DENSE}: units with at least
 * {@link io.densa.core.estimate.DetectionLimits#DENSE_EVENTS_PER_BIN} events per bin) reads such a run
 * and its first occupied bin as one censored cell; see there for what it gives up. Measured on the
 * examples' clipped-network test (ten simulated networks of 56 units, 1,000–4,000 events over 40
 * bins, up to eight units clipped at a detection limit, the limits not declared): with the default
 * the FPCA first-component share lies within 0.019 of the true densities' share on every network
 * (mean deviation 0.009; up to 0.038, mean 0.020 when every bin is read as recorded: about as close
 * as with the true limits declared) and leave-one-out ordinary kriging's MSE is at most 0.742 of the
 * mean-density baseline's (0.748 counted); on the same networks without any clipping the two
 * readings differ by at most 0.02 in that ratio and 0.007 in the share.
 */
package io.densa.core.estimate;
