package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;

/**
 * The documented evaluation rule (class description of {@link Density}): evaluation points may
 * lie anywhere but NaN (pdf 0, cdf 0/1, tail 1/0 outside the domain), probabilities must lie in
 * [0, 1] (quantile(0) = a, quantile(1) = b), functions defined on the domain only (clr, log pdf)
 * reject outside points; the same for {@link Density} and {@link DensitySet}. Also the messages
 * of bad domains and bad indices.
 */
class EvaluationRuleTest {
    private static final BayesSpace S = BayesSpace.splines(0, 150, 4, 4);

    private static void fails(String regex, Executable call) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, call);
        assertTrue(Pattern.compile(regex).matcher(e.getMessage()).find(),
                "message \"" + e.getMessage() + "\" does not match /" + regex + "/");
    }

    @Test
    void pointsOutsideTheDomainAreValidForProbabilities() {
        Density f = S.project(x -> Math.exp(-x / 40)).density();
        DensitySet set = DensitySet.of(List.of(f, S.neutral()));
        for (double x : new double[] {500, 150.0000001, Double.POSITIVE_INFINITY, Double.MAX_VALUE}) {
            assertEquals(1.0, f.cdf(x));
            assertEquals(0.0, f.tailProbability(x));
            assertEquals(0.0, f.pdf(x));
            assertArrayEquals(new double[] {1, 1}, set.cdf(x));
            assertArrayEquals(new double[] {0, 0}, set.tailProbability(x));
            assertEquals(0.0, set.pdf(x).get(0, 0));
        }
        for (double x : new double[] {-3, -1e-300, Double.NEGATIVE_INFINITY}) {
            assertEquals(0.0, f.cdf(x));
            assertEquals(1.0, f.tailProbability(x));
            assertEquals(0.0, f.pdf(x));
            assertArrayEquals(new double[] {0, 0}, set.cdf(x));
            assertArrayEquals(new double[] {1, 1}, set.tailProbability(x));
        }
        // at the ends: cdf(a) = 0, cdf(b) = 1, tail(a) = 1, tail(b) = 0
        assertEquals(0.0, f.cdf(0));
        assertEquals(1.0, f.cdf(150));
        assertEquals(1.0, f.tailProbability(0));
        assertEquals(0.0, f.tailProbability(150));
    }

    @Test
    void probabilitiesMustBeProbabilities() {
        Density f = S.project(x -> Math.exp(-x / 40)).density();
        DensitySet set = DensitySet.of(List.of(f));
        assertEquals(0.0, f.quantile(0));
        assertEquals(150.0, f.quantile(1));
        assertArrayEquals(new double[] {0.0}, set.quantiles(0));
        assertArrayEquals(new double[] {150.0}, set.quantiles(1));
        // monotone up to the ends
        assertTrue(f.quantile(1e-300) >= 0 && f.quantile(Math.nextDown(1.0)) <= 150);
        for (double p : new double[] {1.5, -1e-300, Math.nextUp(1.0), Double.NaN, Double.POSITIVE_INFINITY}) {
            fails("probability must be in \\[0, 1\\] \\(0 gives the domain's lower end 0.0, 1 its upper end 150.0\\)",
                    () -> f.quantile(p));
            fails("probability must be in \\[0, 1\\]", () -> set.quantiles(p));
        }
    }

    @Test
    void domainOnlyFunctionsRejectOutsidePoints() {
        Density f = S.neutral();
        fails("logPdf accepts x in the domain \\[0.0, 150.0\\] only \\(the pdf is 0 outside it, its log −∞\\), got x = 500",
                () -> f.logPdf(500));
        fails("logPdf accepts x in the domain .* got x = NaN", () -> f.logPdf(Double.NaN));
        fails("x = -1.0 is outside the domain \\[0.0, 150.0\\]: the clr and the basis are defined on the domain only"
                + " \\(pdf, cdf and tail probabilities accept any x but NaN\\)", () -> f.clr(-1));
        fails("x = 151.0 is outside the domain", () -> S.basisAt(151));
        fails("x = 151.0 is outside the domain", () -> DensitySet.of(List.of(f)).clr(151));
    }

    @Test
    void narrowDomainIsNotBlamedOnTheKnots() {
        fails("domain \\[1.0, 1.000000000001\\] is too narrow relative to its magnitude: width 1.0000889005823\\d*E-12"
                + " is .* of max\\(\\|a\\|, \\|b\\|\\) = 1.000000000001, and at least 1.0E-8 of it is accepted",
                () -> BayesSpace.splines(1, 1 + 1e-12, 4, 5));
        fails("too narrow relative to its magnitude", () -> BayesSpace.polynomials(1e6, 1e6 + 1e-6, 3));
        fails("too narrow relative to its magnitude", () -> BayesSpace.steps(5, 5 + 1e-12, 4));
        fails("domain \\[0.0, 1.0E200\\] reaches 1.0E200; ends up to 1.0E150 in magnitude are accepted",
                () -> BayesSpace.splines(0, 1e200, 4, 2));
        fails("domain \\[0.0, 1.0E-200\\] has width 1.0E-200; widths from 1.0E-150 are accepted",
                () -> BayesSpace.splines(0, 1e-200, 4, 2));
        // a narrow domain near 0 is fine: the check is relative to the domain's magnitude
        BayesSpace tiny = BayesSpace.splines(0, 1e-12, 4, 5);
        Density f = tiny.project(x -> Math.exp(-x / 3e-13)).density();
        double expected = (1 - Math.exp(-0.5e-12 / 3e-13)) / (1 - Math.exp(-1e-12 / 3e-13)); // truncated exponential
        assertEquals(expected, f.cdf(0.5e-12), 1e-9);
    }

    @Test
    void indicesAndIds() {
        DensitySet set = DensitySet.of(S, new double[3][S.dimension()], new String[] {"a", "b", "c"});
        fails("subset index 1 is row 5, outside \\[0, 3\\): the set has 3 densities", () -> set.subset(0, 5));
        fails("subset index 0 is row -1, outside \\[0, 3\\)", () -> set.subset(-1));
        fails("row index 3 is outside \\[0, 3\\): the set has 3 densities", () -> set.get(3));
        fails("row index -1 is outside", () -> set.id(-1));
        fails("column 99 is outside \\[0, 7\\): the space has K = 7 coordinates", () -> set.coordinate(0, 99));
        fails("id of row 1 is null; give every row a \\(not necessarily distinct\\) id, or pass no id array at all",
                () -> DensitySet.of(S, new double[3][S.dimension()], new String[] {"a", null, "c"}));
        fails("id of row 0 is null", () -> DensitySet.ofRowMajor(S, new double[S.dimension()], 1, new String[1]));
        fails("id of row 1 is null", () -> DensitySet.of(List.of(S.neutral(), S.neutral()), new String[] {"x", null}));
        assertEquals(List.of("c", "a", "c"), set.subset(2, 0, 2).ids());
    }
}
