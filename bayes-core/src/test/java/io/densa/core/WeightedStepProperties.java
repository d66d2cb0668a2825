package io.densa.core;

/** {@link SpaceContract} for steps on 6 equal bins with a custom exponential-shaped reference weight. */
class WeightedStepProperties extends SpaceContract {
    private static final BayesSpace SPACE = BayesSpace.steps(0, 3, 6).withReference(Reference.weight("exp-decay", x -> Math.exp(-0.7 * x)));

    @Override
    BayesSpace space() {
        return SPACE;
    }
}
