package io.densa.core;

import static io.densa.core.FuzzValues.extreme;
import static io.densa.core.FuzzValues.mild;
import static io.densa.core.FuzzValues.vector;

import io.densa.core.estimate.PenalizedLikelihoodEstimator;
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
 * Seeded fuzz of the circle-specific operations in the manner of {@link FuzzProperties}: extreme
 * but finite coordinates, points far outside the period, NaN and infinite points, cut points and
 * probabilities at the ends, wrapped bin edges: finite output or an exception thrown by Densa, no
 * input modified (see {@link FuzzCheck}).
 */
class CircularFuzzProperties {
    private static final FuzzCheck CHECK = new FuzzCheck();
    private static final List<BayesSpace> SPACES = List.of(BayesSpace.periodicSplines(0, 365, 4, 12),
            BayesSpace.periodicSplines(-1e-3, 2e-3, 2, 3), BayesSpace.fourier(1e6, 7, 2),
            BayesSpace.fourier(0, 1, 1).withReference(Reference.uniform()),
            BayesSpace.periodicSplines(-3, 10, 3, new double[] {-3, -2.9, 0, 6.999}));

    @Provide
    Arbitrary<Long> cases() {
        return Arbitraries.longs();
    }

    private static double point(Random r, BayesSpace s) {
        switch (r.nextInt(6)) {
            case 0:
                return new double[] {Double.NaN, Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY, -0.0,
                        s.upper(), s.lower(), Math.nextDown(s.upper())}[r.nextInt(7)];
            case 1:
                return extreme(r);
            default:
                return FuzzValues.point(r, s.lower() - 3 * (s.upper() - s.lower()), s.upper() + 3 * (s.upper() - s.lower()));
        }
    }

    @Property(tries = 2_000, seed = "9101", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void circularEvaluation(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "circularEvaluation seed=" + seed);
        BayesSpace s = SPACES.get(r.nextInt(SPACES.size()));
        double[] x = FuzzValues.evaluationCoordinates(r, s.dimension());
        Density f = CHECK.run("density", () -> s.density(x), x);
        if (f == null) {
            return;
        }
        double pt = point(r, s), cut = point(r, s);
        double p = FuzzValues.probability(r);
        CHECK.run("pdf", () -> f.pdf(pt));
        CHECK.run("logPdf", () -> f.logPdf(pt));
        CHECK.run("clr", () -> f.clr(pt));
        CHECK.run("cdf", () -> f.cdf(pt));
        CHECK.run("tailProbability", () -> f.tailProbability(pt));
        CHECK.run("cdfFrom", () -> f.cdfFrom(cut, pt));
        CHECK.run("quantileFrom", () -> f.quantileFrom(cut, p));
        CHECK.run("circularMean", f::circularMean);
        CHECK.run("meanResultantLength", f::meanResultantLength);
        double[] grid = {pt, cut, s.lower()};
        CHECK.run("pdf(grid)", () -> f.pdf(grid), grid);
        CHECK.run("basisAt", () -> s.basisAt(pt));
    }

    @Property(tries = 120, seed = "9102", shrinking = ShrinkingMode.OFF, edgeCases = EdgeCasesMode.NONE)
    void circularEstimation(@ForAll("cases") long seed) {
        Random r = new Random(seed);
        FuzzCheck.context(() -> "circularEstimation seed=" + seed);
        BayesSpace s = SPACES.get(r.nextInt(SPACES.size()));
        double period = s.period();
        int bins = 2 + r.nextInt(8);
        double start = r.nextInt(3) == 0 ? extreme(r) : s.lower() + period * (r.nextDouble() * 4 - 2);
        double[] edges = new double[bins + 1];
        for (int i = 0; i <= bins; i++) {
            edges[i] = start + period * i / bins;
        }
        if (r.nextInt(5) == 0) {
            edges[bins] += period * new double[] {1e-13, -1e-13, 1e-9, 0.5}[r.nextInt(4)];
        }
        int[] counts = new int[bins];
        for (int j = 0; j < bins; j++) {
            counts[j] = r.nextInt(4) == 0 ? 0 : r.nextInt(r.nextBoolean() ? 5 : 100_000);
        }
        double[] sample = vector(r, 1 + r.nextInt(30), q -> q.nextInt(4) == 0 ? extreme(q) : start + 3 * period * mild(q));
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(s);
        CHECK.run("fit(counts)", () -> est.fit(edges, counts), edges, counts);
        CHECK.run("fitSample", () -> est.fitSample(sample), sample);
    }
}
