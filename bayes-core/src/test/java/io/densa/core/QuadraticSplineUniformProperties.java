package io.densa.core;

/** {@link SpaceContract} for quadratic splines, equal knots, uniform probability reference. */
class QuadraticSplineUniformProperties extends SpaceContract {
    private static final BayesSpace SPACE = BayesSpace.splines(-1, 1, 3, 6).withReference(Reference.uniform());

    @Override
    BayesSpace space() {
        return SPACE;
    }
}
