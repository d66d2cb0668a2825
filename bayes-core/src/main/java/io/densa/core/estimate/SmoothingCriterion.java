package io.densa.core.estimate;

/**
 * How an estimator chooses its smoothing parameter λ (or, with a fixed λ, which criterion it
 * reports).
 */
public enum SmoothingCriterion {
    /**
     * Akaike's information criterion −2ℓ(λ) + 2 edf(λ), edf the effective degrees of freedom
     * (Akaike (1974), A new look at the statistical model identification, IEEE Trans. Autom.
     * Control 19(6); from memory).
     */
    AIC,
    /**
     * Small-sample corrected AIC, −2ℓ(λ) + 2 edf N/(N − edf − 1) with N the number of events
     * (undefined when N ≤ edf + 1: a search skips such λ, and a fit whose final λ has it is
     * rejected with an IllegalArgumentException): Hurvich, Simonoff &amp; Tsai (1998), Smoothing parameter selection in
     * nonparametric regression using an improved Akaike information criterion, J. R. Stat. Soc. B
     * 60(2) (from memory). Equal to AIC for large N, it resists the undersmoothing of AIC and GCV on
     * sparse counts (the default before {@link #MARGINAL_LIKELIHOOD}, which does better there).
     */
    AICC,
    /**
     * Laplace-approximate restricted marginal likelihood (empirical Bayes): the roughness penalty
     * is read as an improper Gaussian prior c ~ N(0, (2λΩ)⁻) on the coordinates, flat on the
     * penalty's null space (the clr polynomials of degree below the penalty order), and λ
     * minimises
     * <pre>
     *   V(λ) = −2ℓ(ĉ) + 2λ ĉ'Ωĉ + log det(I(ĉ) + 2λΩ) − r log(2λ),
     * </pre>
     * r = rank Ω, I(ĉ) = −∇²ℓ(ĉ) the observed information at the estimate ĉ(λ), so that
     * I(ĉ) + 2λΩ is minus the Hessian of the log integrand at its mode: minus twice the Laplace
     * approximation of log ∫ L(c) p(c | λ) dc up to a constant (Tierney &amp; Kadane (1986),
     * Accurate approximations for posterior moments and marginal densities, JASA 81; from memory).
     * The factor of that Hessian is the one the last Newton iteration of each fit computed, so the
     * criterion costs no pass over the data beyond the fit; where the observed matrix is not
     * positive definite the fit takes Fisher-scoring steps and the expected information stands in
     * for it. For binned counts the observed and expected information differ by O(N^½) against
     * O(N); for a sample with weights w_i the Hessian is that of Σ w_i log f(x_i), W Cov_f(e) with
     * W = Σ w_i (the weights act as frequency weights here; equal to the Fisher information for
     * unit weights, the model being an exponential family in c). Wahba (1985), A comparison of GCV and
     * GML for choosing the smoothing parameter in the generalized spline smoothing problem, Ann.
     * Statist. 13(4); Wood (2011), Fast stable restricted maximum likelihood and marginal likelihood
     * estimation of semiparametric generalized linear models, J. R. Stat. Soc. B 73(1) (both from
     * memory). Unlike AIC-type criteria it accounts for the unpenalised null space through r and
     * does not need N ≫ edf. With the reference prior of {@link PenalizedLikelihoodEstimator}
     * (weight w &gt; 0, the default) the prior on c is the proper N(0, (2λΩ + (w/P(I)) I)⁻¹) and the
     * criterion is
     * <pre>
     *   V(λ) = −2ℓ(ĉ) + 2λ ĉ'Ωĉ + (w/P(I)) ‖ĉ‖² + log det(I(ĉ) + 2λΩ + (w/P(I)) I)
     *          − log det(2λΩ + (w/P(I)) I),
     * </pre>
     * the same Laplace approximation with the prior's exact normalising constant in place of
     * r log(2λ).
     */
    MARGINAL_LIKELIHOOD,
    /**
     * Generalised cross-validation (Craven &amp; Wahba (1979), Smoothing noisy data with spline
     * functions, Numer. Math. 31; from memory). For least squares D·RSS/(D − edf)²; for counts
     * the deviance form D·Dev(λ)/(D − edf)² over D bins (O'Sullivan, Yandell &amp; Raynor (1986),
     * Automatic smoothing of regression functions in generalized linear models, JASA 81; from
     * memory).
     */
    GCV,
    /**
     * k-fold cross-validation of the log-likelihood, with the estimator's seed: the events of each
     * bin are assigned to the k folds independently with equal probabilities (a multinomial split
     * per bin, drawn without listing the events, so memory does not grow with their number); raw
     * observations are shuffled and dealt into the folds in turn. The criterion is minus the
     * held-out log-likelihood summed over folds.
     */
    CROSS_VALIDATION
}
