package io.densa.core;

/** {@link SpaceContract} for three harmonics on the circle [10, 34). */
class FourierSpaceProperties extends SpaceContract {
    private static final BayesSpace SPACE = BayesSpace.fourier(10, 24, 3);

    @Override
    BayesSpace space() {
        return SPACE;
    }
}
