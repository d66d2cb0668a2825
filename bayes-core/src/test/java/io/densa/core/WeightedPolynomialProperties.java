package io.densa.core;

/** {@link SpaceContract} for polynomials of degree 4 with a beta(2, 3) reference weight. */
class WeightedPolynomialProperties extends SpaceContract {
    private static final BayesSpace SPACE = BayesSpace.polynomials(0, 1, 4).withReference(Reference.beta(2, 3));

    @Override
    BayesSpace space() {
        return SPACE;
    }
}
