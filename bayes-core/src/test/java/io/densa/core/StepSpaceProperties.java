package io.densa.core;

/** {@link SpaceContract} for step functions on 5 unequal bins. */
class StepSpaceProperties extends SpaceContract {
    private static final BayesSpace SPACE = BayesSpace.steps(0, 0.3, 1, 1.2, 2.5, 4);

    @Override
    BayesSpace space() {
        return SPACE;
    }
}
