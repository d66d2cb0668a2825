package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * Weighted reference measures (Talská et al. (2020), Weighting
 * the domain of probability densities in functional data analysis, Stat 9:e283, from memory): the
 * reference P has Lebesgue density p, which is the neutral element; the axioms themselves run in
 * {@link WeightedSplineProperties}, {@link WeightedPolynomialProperties} and
 * {@link WeightedStepProperties}. Reference densities come from Apache Commons Math
 * distributions. Relative tolerance 1e-10.
 */
class WeightedReferenceTest {
    private static final double REL = 1e-10;

    @Test
    void normalWeightIsNeutralElement() {
        BayesSpace s = BayesSpace.splines(-2, 2, 4, 6).withReference(Reference.normal(0.3, 0.8));
        NormalDistribution n = new NormalDistribution(0.3, 0.8);
        Projection p = s.project(n::density);
        assertTrue(p.density().norm() < REL, "‖reference‖ = " + p.density().norm());
        assertTrue(p.error() < REL);
        double z = n.cumulativeProbability(2) - n.cumulativeProbability(-2);
        for (double x : TestSpaces.grid(s, 17)) {
            double expected = n.density(x) / z; // normal truncated to [−2, 2]
            assertEquals(expected, s.neutral().pdf(x), REL * expected, "neutral pdf at " + x);
            assertEquals(expected, s.referenceDensity(x), REL * expected);
        }
        assertEquals(1.0, s.referenceMass(), 1e-14);
    }

    @Test
    void betaWeightIsNeutralElement() {
        BayesSpace s = BayesSpace.polynomials(0, 1, 4).withReference(Reference.beta(2, 3));
        BetaDistribution beta = new BetaDistribution(2, 3);
        Projection p = s.project(beta::density);
        assertTrue(p.density().norm() < REL, "‖reference‖ = " + p.density().norm());
        for (double x : new double[] {0.01, 0.2, 0.5, 0.77, 0.99}) {
            assertEquals(beta.density(x), s.neutral().pdf(x), REL * beta.density(x));
        }
        assertEquals(0.4, s.neutral().mean(), REL); // Beta(2, 3) mean α/(α+β)
        assertEquals(0.04, s.neutral().variance(), REL); // αβ/((α+β)²(α+β+1)) = 6/150
    }

    @Test
    void pdfIntegratesToOneAndPerturbationDividesByWeight() {
        BayesSpace s = BayesSpace.splines(-2, 2, 4, 6).withReference(Reference.normal(0.3, 0.8));
        Random rnd = new Random(21);
        Density f = s.density(TestSpaces.randomCoordinates(s, rnd, 1));
        Density g = s.density(TestSpaces.randomCoordinates(s, rnd, 1));
        assertEquals(1.0, TestSpaces.integrate(s, f::pdf), REL);
        // g1 ⊕ g2 ∝ g1 g2 / p: the P-densities g/p multiply, (g1/p)(g2/p) p = g1 g2 / p (definition of B2(P))
        Density fg = f.perturb(g);
        double r0 = fg.pdf(0.0) * s.referenceDensity(0.0) / (f.pdf(0.0) * g.pdf(0.0));
        for (double x : TestSpaces.grid(s, 9)) {
            double r = fg.pdf(x) * s.referenceDensity(x) / (f.pdf(x) * g.pdf(x));
            assertEquals(r0, r, REL * r0, "ratio at " + x);
        }
        // a density equal to the reference weight times a constant is still the neutral element
        assertTrue(s.project(x -> 7.5 * s.referenceDensity(x)).density().norm() < REL);
        assertTrue(f.perturb(s.neutral()).distance(f) < REL);
    }
}
