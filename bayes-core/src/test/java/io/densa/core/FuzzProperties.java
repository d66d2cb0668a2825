package io.densa.core;

import static io.densa.core.FuzzValues.extreme;
import static io.densa.core.FuzzValues.nonNegative;
import static io.densa.core.FuzzValues.vector;

import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.SmoothingCriterion;
import io.densa.core.estimate.SmoothingSplineEstimator;
import io.densa.core.estimate.UnitEstimate;
import io.densa.core.estimate.ZeroReplacement;
import io.densa.core.estimate.ZeroTotalPolicy;
import java.util.Arrays;
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
 * Seeded fuzz of the core value operations and estimators (issue 9 §4): finite but extreme
 * inputs — tiny and huge magnitudes, subnormals, signed zeros, duplicates and ties, constant
 * rows, near-degenerate domains and knots, empty and one-element sets — must give finite
 * output or an {@link IllegalArgumentException} / {@link IllegalStateException} /
 * {@link DensaException} thrown by Densa, and must not modify their inputs (see
 * {@link FuzzCheck}). 49,350 tries in all. Each try draws its inputs from a case seed (jqwik reports it on failure;
 * {@link FuzzValues} turns it into inputs), the properties' seeds are fixed.
 */
class FuzzProperties {
    /** Runs an estimator call and also requires a non-negative estimation variance. */
    private static void estimate(String op, java.util.function.Supplier<Object> fit, Object... watched) {
        Object result = CHECK.run(op, fit::get, watched);
        List<EstimationDiagnostics> diags = result instanceof UnitEstimate
                ? List.of(((UnitEstimate) result).diagnostics())
                : result instanceof BatchEstimate ? ((BatchEstimate) result).diagnostics() : List.of();
        for (EstimationDiagnostics d : diags) {
            CHECK.run(op, () -> {
                double[] cov = d.covariance();
                int k = (int) Math.round(Math.sqrt(cov.length));
                for (int i = 0; i < k; i++) {
                    if (cov[i * k + i] < 0) {
                        throw new FuzzCheck.Violation(op, "negative covariance diagonal " + cov[i * k + i], null);
                    }
                }
                if (d.estimationVariance() < 0) {
                    throw new FuzzCheck.Violation(op, "negative estimation variance " + d.estimationVariance(), null);
                }
                return null;
            });
        }
    }

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

    /** A small pool of spaces (built once): every basis kind and reference kind. */
    private static final List<BayesSpace> SPACES = List.of(BayesSpace.splines(0, 1, 4, 3),
            BayesSpace.splines(-5, 150, 3, new double[] {-4.999, 0, 1e-9, 149}), BayesSpace.polynomials(-1, 1, 2),
            BayesSpace.polynomials(1e6, 1e6 + 1, 5), BayesSpace.steps(0, 1, 2), BayesSpace.steps(0, 1e-3, 1, 1e3),
            BayesSpace.splines(0, 10, 2, 2).withReference(Reference.uniform()),
            BayesSpace.polynomials(0, 1, 3).withReference(Reference.normal(0.2, 0.05)),
            BayesSpace.steps(0, 1, 5).withReference(Reference.beta(2, 5)));

    private static BayesSpace space(Random r) {
        return SPACES.get(r.nextInt(SPACES.size()));
    }

    // ------------------------------------------------------------------ value algebra

    @Property(tries = 36_000, seed = "9001", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void algebraAndNorms(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "algebraAndNorms seed=" + seed);
        BayesSpace s = space(r);
        double[] x = vector(r, s.dimension(), FuzzValues::extreme);
        double[] y = vector(r, s.dimension(), FuzzValues::extreme);
        double alpha = extreme(r);
        Density f = CHECK.run("density", () -> s.density(x), x);
        Density g = CHECK.run("density", () -> s.density(y), y);
        if (f == null || g == null) {
            return;
        }
        CHECK.run("perturb", () -> f.perturb(g));
        CHECK.run("minus", () -> f.minus(g));
        CHECK.run("power", () -> f.power(alpha));
        CHECK.run("inverse", f::inverse);
        CHECK.run("inner", () -> f.inner(g));
        CHECK.run("norm", f::norm);
        CHECK.run("normSq", f::normSq);
        CHECK.run("distance", () -> f.distance(g));
        CHECK.run("distanceSq", () -> f.distanceSq(g));
        CHECK.run("equalsWithin", () -> f.equalsWithin(g, Math.abs(alpha)));
    }

    // ------------------------------------------------------------------ evaluation

    @Property(tries = 1_500, seed = "9002", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void evaluation(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "evaluation seed=" + seed);
        BayesSpace s = space(r);
        double[] x = FuzzValues.evaluationCoordinates(r, s.dimension());
        Density f = CHECK.run("density", () -> s.density(x), x);
        if (f == null) {
            return;
        }
        double pt = FuzzValues.point(r, s.lower(), s.upper());
        double p = FuzzValues.probability(r);
        CHECK.run("pdf", () -> f.pdf(pt));
        CHECK.run("logPdf", () -> f.logPdf(pt));
        CHECK.run("cdf", () -> f.cdf(pt));
        CHECK.run("tailProbability", () -> f.tailProbability(pt));
        CHECK.run("clr", () -> f.clr(pt));
        CHECK.run("quantile", () -> f.quantile(p));
        CHECK.run("mean", f::mean);
        CHECK.run("variance", f::variance);
        double[] grid = {s.lower(), pt, s.upper()};
        CHECK.run("pdf(grid)", () -> f.pdf(grid), grid);
    }

    // ------------------------------------------------------------------ spaces and projections

    @Property(tries = 600, seed = "9003", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void spaceConstruction(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "spaceConstruction seed=" + seed);
        double a = domainEnd(r), b = r.nextInt(4) == 0 ? domainEnd(r) : a + Math.abs(domainEnd(r));
        double[] knots = new double[r.nextInt(7)];
        for (int i = 0; i < knots.length; i++) {
            knots[i] = r.nextInt(6) == 0 ? new double[] {0, 1, 1e-17, 0.5, 0.5 + 1e-16}[r.nextInt(5)] : r.nextDouble();
        }
        Arrays.sort(knots);
        int kind = r.nextInt(5);
        double[] edges = new double[knots.length + 2];
        edges[0] = a;
        edges[edges.length - 1] = b;
        for (int i = 0; i < knots.length; i++) {
            edges[i + 1] = a + (b - a) * knots[i];
        }
        double[] interior = Arrays.copyOfRange(edges, 1, edges.length - 1);
        BayesSpace s = CHECK.run("space", () -> {
            switch (kind) {
                case 0:
                    return BayesSpace.splines(a, b, 4, interior);
                case 1:
                    return BayesSpace.polynomials(a, b, 1 + knots.length % 5);
                case 2:
                    return BayesSpace.steps(edges);
                case 3:
                    return BayesSpace.splines(a, b, 2 + knots.length % 4, knots.length);
                default:
                    return BayesSpace.steps(a, b, 2 + knots.length).withReference(Reference.normal(a, Math.abs(b - a)));
            }
        }, interior, edges);
        if (s == null) {
            return;
        }
        double[] v = vector(r, FuzzValues.size(r, 14), FuzzValues::extreme);
        double[] xs = new double[v.length];
        for (int i = 0; i < xs.length; i++) {
            xs[i] = s.lower() + (s.upper() - s.lower()) * (i % 4) / 3.0; // ties: only 4 distinct points
        }
        CHECK.run("fromClr", () -> s.fromClr(xs, v), xs, v);
        double[] pos = new double[v.length];
        for (int i = 0; i < pos.length; i++) {
            pos[i] = Math.abs(v[i]);
        }
        CHECK.run("fromGrid", () -> s.fromGrid(xs, pos), xs, pos);
        double slope = extreme(r);
        double width = s.upper() - s.lower();
        CHECK.run("projectLogPdf", () -> s.projectLogPdf(x -> slope * (x - s.lower()) / width));
        CHECK.run("project", () -> s.project(x -> Math.exp(-Math.abs(slope) * (x - s.lower()) / width)));
        double at = FuzzValues.point(r, s.lower(), s.upper());
        CHECK.run("basisAt", () -> s.basisAt(at));
        CHECK.run("basisMatrix", () -> s.basisMatrix(xs), xs);
        CHECK.run("integrate", () -> s.integrate(x -> x));
        CHECK.run("referenceDensity", () -> s.referenceDensity(at));
    }

    private static double domainEnd(Random r) {
        int c = r.nextInt(7);
        return c < 3 ? 20 * r.nextDouble() - 10 : c < 6 ? extreme(r)
                : new double[] {1.0, 1 + 1e-12, 1 + 1e-7, 1e150, -1e150, 1e-150}[r.nextInt(6)];
    }

    // ------------------------------------------------------------------ density sets

    @Property(tries = 3_000, seed = "9004", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void densitySets(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "densitySets seed=" + seed);
        BayesSpace s = space(r);
        int k = s.dimension();
        int n = FuzzValues.size(r, 12);
        double[][] c = new double[n][];
        boolean mildRows = r.nextBoolean();
        for (int i = 0; i < n; i++) {
            c[i] = i > 0 && r.nextInt(5) == 0 ? c[i - 1].clone() // repeated rows
                    : vector(r, k, mildRows ? FuzzValues::mild : FuzzValues::extreme);
        }
        String[] ids = null;
        if (r.nextBoolean()) {
            ids = new String[n];
            for (int i = 0; i < n; i++) {
                ids[i] = "u" + (i % 3); // duplicates allowed
            }
        }
        String[] idArg = ids;
        DensitySet set = CHECK.run("DensitySet.of", () -> DensitySet.of(s, c, idArg), c, idArg);
        if (set == null) {
            return;
        }
        double x = FuzzValues.point(r, s.lower(), s.upper());
        double p = FuzzValues.probability(r);
        CHECK.run("mean", set::mean);
        CHECK.run("centred", set::centred);
        CHECK.run("crossProducts", () -> set.crossProducts(true));
        CHECK.run("crossProducts(uncentred)", () -> set.crossProducts(false));
        CHECK.run("covariance", set::covariance);
        CHECK.run("gram", set::gram);
        CHECK.run("innerProducts", () -> set.innerProducts(set));
        CHECK.run("distances", set::distances);
        CHECK.run("norms", set::norms);
        int[] idx = {n - 1, 0, n};
        CHECK.run("subset", () -> set.subset(idx), idx);
        CHECK.run("concat", () -> set.concat(set));
        double[] shiftBy = vector(r, k, FuzzValues::extreme);
        CHECK.run("perturb", () -> set.perturb(s.density(shiftBy)), shiftBy);
        CHECK.run("clr(grid)", () -> set.clr(s.lower(), x));
        if (mildRows && n <= 5) { // the per-row evaluations are the expensive part
            double[] grid = {s.lower(), x, s.upper() + 1};
            CHECK.run("pdf(grid)", () -> set.pdf(grid), grid);
            CHECK.run("cdf", () -> set.cdf(x));
            CHECK.run("tail", () -> set.tailProbability(x));
            CHECK.run("quantiles", () -> set.quantiles(p));
            CHECK.run("means", set::means);
        }
    }

    // ------------------------------------------------------------------ zero replacement, FDR

    @Property(tries = 8_000, seed = "9005", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void zeroReplacementAndFdr(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "zeroReplacementAndFdr seed=" + seed);
        double[] counts = vector(r, FuzzValues.size(r, 12), FuzzValues::nonNegative);
        double q = FuzzValues.probability(r);
        int prior = r.nextInt(ZeroReplacement.Prior.values().length + 1);
        ZeroReplacement z = prior < ZeroReplacement.Prior.values().length
                ? ZeroReplacement.bayesianMultiplicative(ZeroReplacement.Prior.values()[prior])
                : CHECK.run("multiplicative", () -> ZeroReplacement.multiplicative(q));
        if (z != null) {
            double[] out = CHECK.run("replace", () -> z.replace(counts), counts);
            if (out != null) {
                double sum = 0;
                for (double v : out) {
                    sum += v;
                }
                boolean closed = Math.abs(sum - 1) <= 1e-9 && Arrays.stream(out).allMatch(v -> v > 0);
                CHECK.run("replace closure", () -> {
                    if (!closed) {
                        throw new FuzzCheck.Violation("replace", "result is not a closed positive composition: "
                                + Arrays.toString(out) + " from " + Arrays.toString(counts), null);
                    }
                    return null;
                }, counts);
            }
            double[][] all = {counts, counts};
            CHECK.run("replaceAll", () -> z.replaceAll(all), (Object) all);
            CHECK.run("priorStrength", () -> z.priorStrength(counts.length, counts.length > 0 ? counts[0] : 1));
        }
        double[] pv = new double[counts.length];
        for (int i = 0; i < pv.length; i++) {
            pv[i] = r.nextInt(4) == 0 ? extreme(r) : Math.min(1, counts[i]);
        }
        CHECK.run("BenjaminiHochberg.adjust", () -> BenjaminiHochberg.adjust(pv), pv);
        CHECK.run("BenjaminiHochberg.reject", () -> BenjaminiHochberg.reject(pv, q), pv);
    }

    // ------------------------------------------------------------------ estimators

    private static final BayesSpace EST_SPLINES = BayesSpace.splines(0, 1, 3, 2);
    private static final BayesSpace EST_STEPS = BayesSpace.steps(0, 1, 4);
    private static final double[] EDGES = {0, 0.1, 0.25, 0.5, 0.6, 0.9, 1};

    @Property(tries = 100, seed = "9006", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void estimatorsOnCounts(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "estimatorsOnCounts seed=" + seed);
        BayesSpace s = r.nextBoolean() ? EST_STEPS : EST_SPLINES;
        double[] counts = vector(r, EDGES.length - 1, q -> {
            int c = q.nextInt(8);
            return c < 5 ? q.nextInt(31) : c < 6 ? nonNegative(q) : new double[] {0, 4.9e-324, 6e7, 1e308, 0.5}[q.nextInt(5)];
        });
        if (r.nextInt(3) == 0) { // an empty run at an end (read as censored under option 6)
            int from = r.nextBoolean() ? 0 : counts.length - 2;
            counts[from] = 0;
            counts[from + 1] = 0;
        }
        int option = r.nextInt(7);
        double setting = extreme(r);
        FuzzCheck.context(() -> "estimatorsOnCounts seed=" + seed + " space=" + s + " option=" + option + " setting=" + setting);
        PenalizedLikelihoodEstimator pl = CHECK.run("PL options", () -> configure(
                PenalizedLikelihoodEstimator.withDefaults(s).withParallel(false).withFractionalCounts(true), option, setting));
        if (pl != null) {
            estimate("PL fit", () -> pl.fit(EDGES, counts), EDGES, counts);
            if (r.nextInt(4) == 0) {
                double[][] batch = {counts, counts};
                estimate("PL fitAll", () -> pl.fitAll(EDGES, batch, null), EDGES, batch);
            }
        }
        SmoothingSplineEstimator ss = CHECK.run("SS options", () -> option % 2 == 0
                ? SmoothingSplineEstimator.withDefaults(s).withParallel(false)
                : SmoothingSplineEstimator.withDefaults(s).withParallel(false).withSmoothing(Math.abs(setting)));
        if (ss != null) {
            estimate("SS fit", () -> ss.fit(EDGES, counts), EDGES, counts);
        }
    }

    private static PenalizedLikelihoodEstimator configure(PenalizedLikelihoodEstimator e, int option, double v) {
        switch (option) {
            case 1:
                return e.withSmoothing(Math.abs(v));
            case 2:
                return e.withCriterion(SmoothingCriterion.values()[(int) (Math.abs(v) % SmoothingCriterion.values().length)]);
            case 3:
                return e.withCrossValidation(2 + (int) (Math.abs(v) % 4), 7L);
            case 4:
                return e.withTolerance(Math.abs(v)).withMaxIterations(5);
            case 5:
                return e.withZeroTotal(ZeroTotalPolicy.values()[(int) (Math.abs(v) % ZeroTotalPolicy.values().length)]);
            case 6:
                return e.withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.CENSORED);
            default:
                return e;
        }
    }

    @Property(tries = 150, seed = "9007", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void estimatorsOnSamples(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "estimatorsOnSamples seed=" + seed);
        double[] values = vector(r, FuzzValues.size(r, 25), q -> {
            int c = q.nextInt(7);
            return c < 5 ? q.nextDouble() : c == 5 ? new double[] {0, 1, 0.5, Double.MIN_VALUE, 1e-300,
                Math.nextDown(1.0)}[q.nextInt(6)] : extreme(q);
        });
        double[] w = vector(r, values.length, FuzzValues::nonNegative);
        int option = r.nextInt(6);
        double setting = extreme(r);
        FuzzCheck.context(() -> "estimatorsOnSamples seed=" + seed + " option=" + option + " setting=" + setting);
        PenalizedLikelihoodEstimator pl = CHECK.run("PL options", () -> configure(
                PenalizedLikelihoodEstimator.withDefaults(EST_SPLINES).withParallel(false), option, setting));
        if (pl != null) {
            estimate("PL fitSample", () -> pl.fitSample(values), values);
            estimate("PL fitSample weighted", () -> pl.fitSample(values, w), values, w);
            if (r.nextInt(4) == 0) {
                double[][] vs = {values, values};
                double[][] ws = {w, w};
                estimate("PL fitAllSamples", () -> pl.fitAllSamples(vs, ws, null), vs, ws);
            }
        }
    }
}
