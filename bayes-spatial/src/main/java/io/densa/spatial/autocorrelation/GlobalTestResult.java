package io.densa.spatial.autocorrelation;

import io.densa.core.TestResult;
import java.util.Optional;

/**
 * The result of a global autocorrelation test ({@link MoranI.Result}, {@link GearyC.Result}) as a
 * {@link TestResult}: its p-value is the two-sided permutation p-value when permutations were
 * requested, else the two-sided normal approximation under randomisation.
 */
public interface GlobalTestResult extends TestResult {
    /** Moments and z-test under randomisation. */
    AutocorrelationMoments randomisation();

    /** The permutation test, present when permutations were requested. */
    Optional<AutocorrelationPermutation> permutation();

    /**
     * The two-sided permutation p-value when permutations were requested, else the two-sided
     * normal approximation under randomisation.
     */
    @Override
    default double pValue() {
        return permutation().map(AutocorrelationPermutation::pTwoSided).orElse(randomisation().pTwoSided());
    }

    @Override
    default String method() {
        return AutocorrelationSupport.method(permutation());
    }
}
