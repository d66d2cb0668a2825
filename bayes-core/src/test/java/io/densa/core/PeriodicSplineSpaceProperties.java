package io.densa.core;

/** {@link SpaceContract} for cubic periodic splines on 9 knots of the circle [−2, 5). */
class PeriodicSplineSpaceProperties extends SpaceContract {
    private static final BayesSpace SPACE = BayesSpace.periodicSplines(-2, 7, 4, 9);

    @Override
    BayesSpace space() {
        return SPACE;
    }
}
