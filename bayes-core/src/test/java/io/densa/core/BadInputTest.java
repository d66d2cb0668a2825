package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;

/** Bad input fails fast with an {@link IllegalArgumentException} whose message says what and where. */
class BadInputTest {
    private static final BayesSpace S = BayesSpace.splines(0, 1, 4, 3);

    private static void fails(String regex, Executable call) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, call);
        assertTrue(Pattern.compile(regex).matcher(e.getMessage()).find(),
                "message \"" + e.getMessage() + "\" does not match /" + regex + "/");
    }

    @Test
    void nanCoordinate() {
        fails("coordinate 2 is not finite: NaN", () -> S.density(0, 0, Double.NaN, 0, 0, 0));
    }

    @Test
    void infiniteCoordinate() {
        fails("coordinate 0 is not finite: Infinity", () -> S.density(Double.POSITIVE_INFINITY, 0, 0, 0, 0, 0));
    }

    @Test
    void nanCoordinateInSetNamesRowAndColumn() {
        double[][] c = new double[3][6];
        c[1][4] = Double.NaN;
        fails("row 1, column 4\\) is not finite: NaN", () -> DensitySet.of(S, c));
    }

    @Test
    void wrongDimension() {
        fails("expected 6 coordinates .* got 2", () -> S.density(1, 2));
    }

    @Test
    void nanPoint() {
        fails("x = NaN is outside the domain \\[0.0, 1.0\\]", () -> S.neutral().clr(Double.NaN));
        fails("x is NaN; pdf accepts any other x \\(0 outside the domain \\[0.0, 1.0\\]\\)",
                () -> S.neutral().pdf(Double.NaN));
        fails("x is NaN; cdf accepts any other x, including points outside the domain \\[0.0, 1.0\\] \\(0 below"
                + " it, 1 above\\)", () -> S.neutral().cdf(Double.NaN));
        fails("threshold is NaN; tail probabilities accept any other threshold.*\\(1 below it, 0 above\\)",
                () -> S.neutral().tailProbability(Double.NaN));
        fails("x is NaN; cdf accepts any other x", () -> DensitySet.of(List.of(S.neutral())).cdf(Double.NaN));
        fails("threshold is NaN; tail probabilities accept",
                () -> DensitySet.of(List.of(S.neutral())).tailProbability(Double.NaN));
    }

    @Test
    void infinitePointOutsideDomain() {
        fails("x = Infinity is outside the domain", () -> S.neutral().clr(Double.POSITIVE_INFINITY));
        fails("x = 1.5 is outside the domain \\[0.0, 1.0\\]", () -> S.fromClr(
                new double[] {0, .1, .2, .3, .4, .5, 1.5}, new double[7]));
    }

    @Test
    void nonFiniteClrValue() {
        fails("value 3 \\(x = 0.3\\) is not finite: NaN", () -> S.fromClr(
                new double[] {0, .1, .2, .3, .4, .5, 1}, new double[] {0, 0, 0, Double.NaN, 0, 0, 0}));
    }

    @Test
    void domainWithAGreaterOrEqualB() {
        fails("domain must satisfy a < b, got \\[1.0, 1.0\\]", () -> BayesSpace.splines(1, 1, 4, 3));
        fails("domain must satisfy a < b, got \\[2.0, 1.0\\]", () -> BayesSpace.polynomials(2, 1, 2));
        fails("domain ends must be finite", () -> BayesSpace.steps(0, Double.NaN, 3));
    }

    @Test
    void knotsOutsideDomain() {
        fails("interior knot 1 = 1.2 lies outside the open domain \\(0.0, 1.0\\)",
                () -> BayesSpace.splines(0, 1, 4, new double[] {0.5, 1.2}));
    }

    @Test
    void knotsUnsorted() {
        fails("interior knots must be strictly increasing: knot 1 = 0.3 follows 0.6",
                () -> BayesSpace.splines(0, 1, 4, new double[] {0.6, 0.3}));
        fails("bin edges must be strictly increasing: edge 2 = 0.5 follows 0.5",
                () -> BayesSpace.steps(0, 0.5, 0.5, 1));
    }

    @Test
    void pdfNegativeSomewhere() {
        fails("pdf must be > 0 on the domain .* got -0\\.\\d+ at x = [0-9.E-]+", () -> S.project(x -> x - 0.5));
    }

    @Test
    void pdfZeroOnAnInterval() {
        fails("pdf must be > 0 on the domain .* got 0.0 at x = [0-9.E-]+", () -> S.project(x -> x < 0.25 ? 0 : 1));
    }

    @Test
    void pdfNotFinite() {
        fails("pdf is not finite at x = .*: NaN", () -> S.project(x -> x > 0.5 ? Double.NaN : 1));
    }

    @Test
    void densitiesFromDifferentSpaces() {
        BayesSpace other = BayesSpace.polynomials(0, 1, 6);
        String both = " lives in " + Pattern.quote(other.toString()) + " but " + Pattern.quote(S.toString())
                + " is required; use space.project\\(density\\) to move a density into another space";
        fails("density" + both, () -> S.neutral().perturb(other.neutral()));
        fails("density" + both, () -> S.neutral().inner(other.neutral()));
        fails("density 1" + both, () -> DensitySet.of(List.of(S.neutral(), other.neutral())));
        fails("density set" + both,
                () -> DensitySet.of(List.of(S.neutral())).concat(DensitySet.of(List.of(other.neutral()))));
        fails("density set" + both,
                () -> DensitySet.of(List.of(S.neutral())).innerProducts(DensitySet.of(List.of(other.neutral()))));
    }

    @Test
    void quantileOutsideZeroOne() {
        String accepted = "probability must be in \\[0, 1\\] \\(0 gives the domain's lower end 0.0, 1 its upper end"
                + " 1.0\\), got ";
        fails(accepted + "-0.1", () -> S.neutral().quantile(-0.1));
        fails(accepted + "1.0000000000000002", () -> S.neutral().quantile(Math.nextUp(1.0)));
        fails(accepted + "1.5", () -> DensitySet.of(List.of(S.neutral())).quantiles(1.5));
        fails(accepted + "-Infinity", () -> S.neutral().quantile(Double.NEGATIVE_INFINITY));
    }

    @Test
    void quantileNaN() {
        fails("probability must be in \\[0, 1\\] .*got NaN", () -> S.neutral().quantile(Double.NaN));
        fails("probability must be in \\[0, 1\\] .*got NaN",
                () -> DensitySet.of(List.of(S.neutral())).quantiles(Double.NaN));
    }

    @Test
    void nanPower() {
        fails("power must be finite, got NaN", () -> S.neutral().power(Double.NaN));
    }

    @Test
    void badReferenceParameters() {
        fails("sd must be finite and > 0, got -1.0", () -> Reference.normal(0, -1));
        fails("shapes must be finite and >= 1, got alpha=NaN", () -> Reference.beta(Double.NaN, 2));
    }

    /** Moments of an empty (or one-density) set are bad input, not a model used before fitting. */
    @Test
    void momentsOfTooSmallSets() {
        DensitySet empty = DensitySet.of(S, new double[0][]);
        fails("mean of an empty density set", empty::mean);
        fails("centring of an empty density set", empty::centred);
        fails("centred cross products of an empty density set", () -> empty.crossProducts(true));
        fails("covariance of a density set needs at least 2 densities, have 0", empty::covariance);
        fails("needs at least 2 densities, have 1", () -> DensitySet.of(S, new double[][] {new double[6]}).covariance());
        assertEquals(0.0, empty.crossProducts(false).get(0, 0)); // uncentred: the zero matrix
    }
}
