package io.densa.regression;

import static io.densa.regression.FuzzValues.extreme;
import static io.densa.regression.FuzzValues.vector;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.regression.surveillance.AnomalyScoring;
import java.util.List;
import java.util.Random;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.ShrinkingMode;

/**
 * Seeded fuzz of the regression module (issue 9 §4): FPCA, function-on-scalar regression,
 * function-on-function and scalar-on-function regression, anomaly scoring, on finite but extreme
 * inputs — coordinates and covariates from subnormal to near the double limit, constant and
 * repeated rows, constant and collinear covariates, tiny sample sizes. Each call must give finite
 * output or an {@link IllegalArgumentException} / {@link IllegalStateException} /
 * {@link io.densa.core.DensaException} thrown by Densa, and must not modify its inputs (see
 * {@link FuzzCheck}). Fixed seeds; 24,600 tries in all; each try draws its inputs from a case
 * seed that jqwik reports on failure.
 */
class FuzzProperties {
    private static final FuzzCheck CHECK = new FuzzCheck();

    /** In exploration mode (see {@link FuzzCheck}), writes what was collected to target/fuzz-collected.txt. */
    @net.jqwik.api.lifecycle.AfterContainer
    static void report() throws java.io.IOException {
        FuzzCheck.writeCollected(java.nio.file.Path.of("target", "fuzz-collected.txt"));
    }

    @Provide
    Arbitrary<Long> cases() {
        return Arbitraries.longs();
    }

    private static final List<BayesSpace> SPACES = List.of(BayesSpace.splines(0, 1, 4, 2),
            BayesSpace.polynomials(-1, 1, 3), BayesSpace.steps(0, 1, 4), BayesSpace.splines(0, 100, 3, 1));

    /**
     * A density set: rows of plain, mild (occasionally extreme) or extreme coordinates, with
     * repeated and constant rows.
     */
    private static DensitySet densities(Random r, BayesSpace s, int n) {
        int kind = r.nextInt(4);
        FuzzValues.Draw draw = kind < 2 ? q -> 2 * q.nextGaussian() : kind == 2 ? FuzzValues::mild : FuzzValues::extreme;
        double[][] c = new double[n][];
        for (int i = 0; i < n; i++) {
            c[i] = i > 0 && r.nextInt(6) == 0 ? c[i - 1].clone() : vector(r, s.dimension(), draw);
        }
        return DensitySet.of(s, c);
    }

    /** A covariate column: mild, extreme, constant, or a multiple of another (collinear). */
    private static double[] covariate(Random r, int n, double[] other) {
        int kind = r.nextInt(8);
        if (kind == 0 && other != null) {
            double f = extreme(r);
            double[] x = other.clone();
            for (int i = 0; i < n; i++) {
                x[i] *= f;
            }
            return x;
        }
        double scale = kind < 4 ? 1 : Math.abs(FuzzValues.magnitude(r, -300, 300));
        return vector(r, n, q -> scale * FuzzValues.mild(q));
    }

    // ------------------------------------------------------------------ FPCA

    @Property(tries = 8_000, seed = "9101", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void fpca(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "fpca seed=" + seed);
        BayesSpace s = SPACES.get(r.nextInt(SPACES.size()));
        DensitySet data = densities(r, s, FuzzValues.size(r, 15));
        Fpca f = CHECK.run("Fpca.fit", () -> Fpca.fit(data));
        if (f == null) {
            return;
        }
        int m = r.nextInt(s.dimension() + 2);
        double t = extreme(r);
        double frac = FuzzValues.probability(r);
        CHECK.run("eigenvalues", f::eigenvalues);
        CHECK.run("explainedVariance", f::explainedVariance);
        CHECK.run("cumulativeVariance", f::cumulativeVariance);
        CHECK.run("totalVariance", f::totalVariance);
        CHECK.run("mean", f::mean);
        CHECK.run("componentsForVariance", () -> f.componentsForVariance(frac));
        CHECK.run("scores", () -> f.scores(data, m));
        CHECK.run("reconstruct", () -> f.reconstruct(data, m));
        CHECK.run("component", () -> f.component(Math.max(0, m - 1)));
        CHECK.run("componentClr", () -> f.componentClr(Math.max(0, m - 1), s.lower(), s.upper()));
        CHECK.run("modeOfVariation", () -> f.modeOfVariation(Math.max(0, m - 1), t));
        if (data.size() <= 8 && r.nextInt(4) == 0) {
            CHECK.run("crossValidate", () -> Fpca.chooseComponents(data, ComponentSelection.withDefaults().withMaxComponents(Math.max(1, m)).withFraction(frac).withCrossValidation(2 + r.nextInt(3), 5L)));
        }
    }

    // ------------------------------------------------------------------ function-on-scalar

    @Property(tries = 2_500, seed = "9102", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void functionOnScalar(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "functionOnScalar seed=" + seed);
        BayesSpace s = SPACES.get(r.nextInt(SPACES.size()));
        int n = FuzzValues.size(r, 14);
        DensitySet y = densities(r, s, n);
        double[] x1 = covariate(r, n, null);
        double[] x2 = covariate(r, n, x1);
        String[] group = new String[n];
        for (int i = 0; i < n; i++) {
            group[i] = r.nextInt(3) == 0 ? "a" : "b";
        }
        Design d = CHECK.run("Design", () -> {
            Design.Builder b = Design.builder().numeric("x1", x1);
            if (r.nextBoolean()) {
                b.numeric("x2", x2);
            }
            if (r.nextInt(3) == 0) {
                b.categorical("g", group, "a");
            }
            return b.build();
        }, x1, x2, group);
        if (d == null) {
            return;
        }
        int weighting = r.nextInt(4);
        double[] w = weighting == 0 ? vector(r, n, FuzzValues::nonNegative)
                : weighting == 1 ? vector(r, n, q -> 0.1 + Math.abs(FuzzValues.mild(q))) : null;
        double lambda = Math.abs(extreme(r));
        FunctionOnScalarRegression reg = r.nextBoolean() ? FunctionOnScalarRegression.withDefaults()
                : CHECK.run("withPenalty", () -> FunctionOnScalarRegression.withDefaults().withPenalty(lambda,
                        r.nextBoolean() ? Penalties.ridge(s.dimension()) : Penalties.secondDerivative(s)));
        if (reg == null) {
            return;
        }
        FunctionOnScalarFit fit = CHECK.run("fit", () -> reg.fit(d, y, w), w);
        if (fit == null) {
            return;
        }
        CHECK.run("coefficients", fit::coefficients);
        CHECK.run("coefficient", () -> fit.coefficient("x1"));
        CHECK.run("fitted", fit::fitted);
        CHECK.run("residuals", fit::residuals);
        CHECK.run("residualNorms", fit::residualNorms);
        CHECK.run("rSquared", fit::rSquared);
        CHECK.run("diagnostics", fit::diagnostics);
        CHECK.run("predict", () -> fit.predict(d));
        CHECK.run("residuals(new)", () -> fit.residuals(d, y));
        double[] grid = {s.lower(), 0.5 * (s.lower() + s.upper()), s.upper()};
        CHECK.run("coefficientClr", () -> fit.coefficientClr("x1", grid), grid);
        if (r.nextInt(3) == 0) {
            CHECK.run("bootstrapBands", () -> fit.bootstrapBands(grid, 20, FuzzValues.probability(r), 3L), grid);
        }
        if (r.nextInt(3) == 0) {
            CHECK.run("permutationTest", () -> fit.test("x1", 19, 4L));
        }
    }

    // ------------------------------------------------------------------ functional regression

    @Property(tries = 1_100, seed = "9103", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void functionalRegression(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "functionalRegression seed=" + seed);
        BayesSpace s = SPACES.get(r.nextInt(SPACES.size()));
        BayesSpace sp = SPACES.get(r.nextInt(SPACES.size()));
        int n = r.nextInt(5) == 0 ? 2 + r.nextInt(5) : 8 + r.nextInt(13);
        DensitySet x = densities(r, sp, n);
        DensitySet y = densities(r, s, n);
        double[] scalar = vector(r, n, FuzzValues::extreme);
        double[] z = covariate(r, n, null);
        Design cov = r.nextBoolean() ? null : CHECK.run("Design", () -> Design.builder().numeric("z", z).build(), z);
        FunctionalRegression reg = CHECK.run("configure", () -> {
            FunctionalRegression base = r.nextBoolean() ? FunctionalRegression.truncation().withComponents(1,
                    1 + r.nextInt(3)) : FunctionalRegression.ridge().withLambdas(Math.abs(extreme(r)), 1.0);
            return base.withCrossValidation(2 + r.nextInt(2), 11L);
        });
        if (reg == null) {
            return;
        }
        FunctionOnFunctionFit ff = CHECK.run("fitDensityResponse", () -> reg.fit(List.of(x), cov, y));
        if (ff != null) {
            CHECK.run("fof fitted", ff::fitted);
            CHECK.run("fof residualNorms", ff::residualNorms);
            CHECK.run("fof rSquared", ff::rSquared);
            CHECK.run("fof chosen", ff::chosen);
            CHECK.run("fof crossValidation", ff::crossValidation);
            CHECK.run("fof kernelCoefficients", () -> ff.kernelCoefficients(0));
            CHECK.run("fof predict", () -> ff.predict(List.of(x), cov));
        }
        ScalarOnFunctionFit sf = CHECK.run("fitScalarResponse", () -> reg.fit(List.of(x), cov, scalar),
                scalar);
        if (sf != null) {
            CHECK.run("sof fitted", sf::fitted);
            CHECK.run("sof residuals", sf::residuals);
            CHECK.run("sof rSquared", sf::rSquared);
            CHECK.run("sof crossValidatedError", sf::crossValidatedError);
            CHECK.run("sof coefficientFunction", () -> sf.coefficientFunction(0));
            CHECK.run("sof predict", () -> sf.predict(List.of(x), cov));
        }
    }

    // ------------------------------------------------------------------ anomaly scoring

    @Property(tries = 13_000, seed = "9104", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void anomalyScoring(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "anomalyScoring seed=" + seed);
        BayesSpace s = SPACES.get(r.nextInt(SPACES.size()));
        DensitySet calibration = densities(r, s, FuzzValues.size(r, 20));
        DensitySet fresh = densities(r, s, FuzzValues.size(r, 8));
        double[] grid = new double[1 + r.nextInt(6)];
        for (int i = 0; i < grid.length; i++) {
            grid[i] = r.nextInt(5) == 0 ? FuzzValues.point(r, s.lower(), s.upper())
                    : s.lower() + (s.upper() - s.lower()) * i / Math.max(1, grid.length - 1);
        }
        double q = FuzzValues.probability(r);
        double level = FuzzValues.probability(r);
        AnomalyScoring a = CHECK.run("configure", () -> AnomalyScoring.withDefaults().withFdr(q).withBandLevel(level));
        if (a == null) {
            a = AnomalyScoring.withDefaults();
        }
        AnomalyScoring scoring = a;
        AnomalyScoring.Calibrated cal = CHECK.run("calibrate", () -> scoring.fit(calibration, grid), grid);
        if (cal == null) {
            return;
        }
        CHECK.run("band", cal::band);
        double[] norms = vector(r, FuzzValues.size(r, 6), FuzzValues::extreme);
        CHECK.run("pValues", () -> cal.pValues(norms), norms);
        CHECK.run("score", () -> cal.score(fresh));
    }
}
