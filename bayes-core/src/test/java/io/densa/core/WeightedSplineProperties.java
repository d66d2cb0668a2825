package io.densa.core;

/** {@link SpaceContract} for cubic splines with a normal reference weight. */
class WeightedSplineProperties extends SpaceContract {
    private static final BayesSpace SPACE = BayesSpace.splines(-2, 2, 4, 6).withReference(Reference.normal(0.3, 0.8));

    @Override
    BayesSpace space() {
        return SPACE;
    }
}
