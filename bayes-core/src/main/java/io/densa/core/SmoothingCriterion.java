package io.densa.core;

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
     * (+∞ when N ≤ edf + 1): Hurvich, Simonoff &amp; Tsai (1998), Smoothing parameter selection in
     * nonparametric regression using an improved Akaike information criterion, J. R. Stat. Soc. B
     * 60(2) (from memory). Equal to AIC for large N, it resists the undersmoothing of AIC and GCV on
     * sparse counts; the default of {@link PenalizedLikelihoodEstimator}.
     */
    AICC,
    /**
     * Generalised cross-validation (Craven &amp; Wahba (1979), Smoothing noisy data with spline
     * functions, Numer. Math. 31; from memory). For least squares D·RSS/(D − edf)²; for counts
     * the deviance form D·Dev(λ)/(D − edf)² over D bins (O'Sullivan, Yandell &amp; Raynor (1986),
     * Automatic smoothing of regression functions in generalized linear models, JASA 81; from
     * memory).
     */
    GCV,
    /**
     * k-fold cross-validation of the log-likelihood: events (or observations) are dealt at
     * random, with the estimator's seed, into k folds; the criterion is minus the held-out
     * log-likelihood summed over folds.
     */
    CROSS_VALIDATION
}
