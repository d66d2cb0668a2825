package io.densa.core;

/** {@link SpaceContract} for polynomials of degree 6 over [-1, 2]. */
class PolynomialSpaceProperties extends SpaceContract {
    private static final BayesSpace SPACE = BayesSpace.polynomials(-1, 2, 6);

    @Override
    BayesSpace space() {
        return SPACE;
    }
}
