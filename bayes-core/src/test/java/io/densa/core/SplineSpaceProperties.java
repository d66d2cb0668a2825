package io.densa.core;

/** {@link SpaceContract} for cubic splines on unequal interior knots over [0, 3]. */
class SplineSpaceProperties extends SpaceContract {
    private static final BayesSpace SPACE = BayesSpace.splines(0, 3, 4, new double[] {0.4, 1.1, 1.5, 2.2, 2.7});

    @Override
    BayesSpace space() {
        return SPACE;
    }
}
