package io.densa.spatial.uncertainty;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * {@link EstimateUncertainty}: intervals for the median and a tail probability of estimated
 * densities, checked against the true values of the law that generated the counts (a normal law
 * restricted to the domain; its quantile and tail probability from Commons Math's
 * {@link NormalDistribution}) and against an independent derivation of their spread, the delta
 * method (Casella &amp; Berger (2002), Statistical Inference, 2nd ed., §5.5.4: Var g(ĉ) ≈ ∇gᵀ Σ ∇g),
 * with ∇g from central differences of {@link Density#quantile} (the space's adaptive quadrature,
 * not the engine's node rule).
 */
class EstimateUncertaintyTest {
    static final double A = 0;
    static final double B = 100;
    static final int BINS = 50;
    static final double MU = 45;
    static final double SD = 12;
    static final double T = 60;

    static final NormalDistribution NORMAL = new NormalDistribution(null, MU, SD);
    static final double LO = NORMAL.cumulativeProbability(A);
    static final double HI = NORMAL.cumulativeProbability(B);

    /** Counts of n events from the normal law restricted to [A, B], binned in BINS equal bins. */
    static int[][] counts(int units, int n, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        int[][] c = new int[units][BINS];
        double h = (B - A) / BINS;
        for (int u = 0; u < units; u++) {
            for (int e = 0; e < n; e++) {
                double x = NORMAL.inverseCumulativeProbability(LO + rng.nextDouble() * (HI - LO));
                c[u][(int) Math.min(BINS - 1, Math.floor((x - A) / h))]++;
            }
        }
        return c;
    }

    static BatchEstimate estimate(int units, int n, long seed) {
        double[] edges = new double[BINS + 1];
        for (int j = 0; j <= BINS; j++) {
            edges[j] = A + (B - A) * j / BINS;
        }
        String[] ids = new String[units];
        Arrays.setAll(ids, i -> "r" + i);
        return PenalizedLikelihoodEstimator.withDefaults(BayesSpace.splines(A, B, 4, 8)).fitAll(edges,
                counts(units, n, seed), ids);
    }

    /**
     * Measured (seed 20261205): coverage 0.860 for the median and 0.905 for P(X &gt; 60). The
     * estimates' medians average 45.08 against the true 45.00 with an empirical SD of 0.715 over
     * the replicates, and the draws' SD averages 0.678 (0.95 of it: about 0.88 expected coverage).
     */
    @Test
    void nominalNinetyPercentIntervalsCoverTheTruth() {
        double trueMedian = NORMAL.inverseCumulativeProbability(LO + 0.5 * (HI - LO));
        double trueTail = (HI - NORMAL.cumulativeProbability(T)) / (HI - LO);
        int reps = 200;
        BatchEstimate est = estimate(reps, 400, 20261205L);
        List<UnitUncertainty> u = EstimateUncertainty.summarise(est, UncertaintyOptions.withSeed(3).withQuantiles(0.5)
                .withExceedances(T).withDraws(400));
        int coverMedian = 0, coverTail = 0;
        for (UnitUncertainty x : u) {
            DerivedInterval m = x.quantiles().get(0);
            DerivedInterval p = x.exceedances().get(0);
            coverMedian += m.lower() <= trueMedian && trueMedian <= m.upper() ? 1 : 0;
            coverTail += p.lower() <= trueTail && trueTail <= p.upper() ? 1 : 0;
            assertTrue(m.lower() <= m.estimate() && m.estimate() <= m.upper(), x.id() + " " + m);
        }
        System.out.printf("coverage of nominal 90 %%: median %.3f, P(X > %.0f) %.3f (%d replicates of 400 events)%n",
                coverMedian / (double) reps, T, coverTail / (double) reps, reps);
        // binomial tolerance: 200 replicates, three standard deviations of a 0.9 proportion (0.064)
        assertTrue(Math.abs(coverMedian / (double) reps - 0.9) <= 0.064, "median coverage " + coverMedian);
        assertTrue(Math.abs(coverTail / (double) reps - 0.9) <= 0.064, "tail coverage " + coverTail);
    }

    @Test
    void spreadOfTheMedianAgreesWithTheDeltaMethod() {
        BatchEstimate est = estimate(4, 400, 7L);
        List<UnitUncertainty> u = EstimateUncertainty.summarise(est, UncertaintyOptions.withSeed(11).withQuantiles(0.5)
                .withDraws(4000));
        BayesSpace space = est.densities().space();
        int k = space.dimension();
        for (int i = 0; i < 4; i++) {
            double[] c = est.densities().get(i).coordinates();
            double[] cov = est.diagnostics().get(i).covariance();
            double[] g = new double[k];
            double step = 1e-4;
            for (int j = 0; j < k; j++) {
                double[] up = c.clone();
                double[] down = c.clone();
                up[j] += step;
                down[j] -= step;
                g[j] = (space.density(up).quantile(0.5) - space.density(down).quantile(0.5)) / (2 * step);
            }
            double var = 0;
            for (int a = 0; a < k; a++) {
                for (int b = 0; b < k; b++) {
                    var += g[a] * cov[a * k + b] * g[b];
                }
            }
            DerivedInterval m = u.get(i).quantiles().get(0);
            System.out.printf("unit %d: median %.3f, sd of the draws %.4f, delta method %.4f%n", i, m.estimate(), m.sd(),
                    Math.sqrt(var));
            // Monte Carlo error of an sd from 4,000 draws ≈ 1.1 %; the rest is the median's nonlinearity
            assertEquals(1.0, m.sd() / Math.sqrt(var), 0.05, "unit " + i);
            assertEquals(est.densities().get(i).quantile(0.5), m.estimate(), 1e-6, "plug-in median of unit " + i);
        }
    }

    @Test
    void zeroCovarianceGivesThePlugInAndBadCovarianceIsNamed() {
        BatchEstimate est = estimate(2, 300, 5L);
        BayesSpace space = est.densities().space();
        int k = space.dimension();
        EstimationDiagnostics d0 = est.diagnostics().get(0);
        EstimationDiagnostics zero = withCovariance(d0, new double[k * k]);
        BatchEstimate exact = new BatchEstimate(est.densities().subset(new int[] {0}), List.of(zero));
        UnitUncertainty z = EstimateUncertainty.summarise(exact, UncertaintyOptions.withSeed(1).withQuantiles(0.5))
                .get(0);
        DerivedInterval m = z.quantiles().get(0);
        assertEquals(0.0, m.sd(), 1e-9);
        assertEquals(m.estimate(), m.lower(), 1e-9);
        assertEquals(m.estimate(), m.upper(), 1e-9);
        double[] nan = new double[k * k];
        nan[3] = Double.NaN;
        BatchEstimate bad = new BatchEstimate(est.densities().subset(new int[] {0}), List.of(withCovariance(d0, nan)));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> EstimateUncertainty.summarise(bad, UncertaintyOptions.withSeed(1).withQuantiles(0.5)));
        assertTrue(e.getMessage().contains("unit " + d0.id()), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> EstimateUncertainty.summarise(est,
                UncertaintyOptions.withSeed(1)));
    }

    @Test
    void parallelAndSerialRunsAgreeAndOneUnitIsTheFirstOfABatch() {
        BatchEstimate est = estimate(20, 200, 9L);
        UncertaintyOptions o = UncertaintyOptions.withSeed(5).withQuantiles(0.25, 0.5).withExceedances(60).withMean(true);
        List<UnitUncertainty> all = EstimateUncertainty.summarise(est, o.withParallel(false));
        assertEquals(all, EstimateUncertainty.summarise(est, o.withParallel(true)));
        assertEquals(all.get(0), EstimateUncertainty.summarise(est.unit(0), o));
    }

    /**
     * Densities with given covariances (e.g. a residual's against a baseline) give what an estimate
     * with those densities and covariances gives, bit for bit; counts and shapes are checked.
     */
    @Test
    void givenCovariancesGiveTheEstimatePath() {
        BatchEstimate est = estimate(6, 200, 13L);
        int k = est.densities().space().dimension();
        UncertaintyOptions o = UncertaintyOptions.withSeed(3).withQuantiles(0.5).withExceedances(60).withMean(true);
        List<double[][]> cov = new java.util.ArrayList<>();
        for (EstimationDiagnostics d : est.diagnostics()) {
            double[][] c = new double[k][k];
            for (int a = 0; a < k; a++) {
                for (int b = 0; b < k; b++) {
                    c[a][b] = d.covariance()[a * k + b];
                }
            }
            cov.add(c);
        }
        List<UnitUncertainty> given = EstimateUncertainty.summarise(est.densities(), cov, o);
        List<UnitUncertainty> fromEstimate = EstimateUncertainty.summarise(est, o);
        for (int i = 0; i < given.size(); i++) {
            assertEquals(fromEstimate.get(i).quantiles(), given.get(i).quantiles());
            assertEquals(fromEstimate.get(i).exceedances(), given.get(i).exceedances());
            assertEquals(fromEstimate.get(i).mean(), given.get(i).mean());
        }
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> EstimateUncertainty.summarise(est.densities(), cov.subList(0, 5), o));
        assertTrue(e.getMessage().contains("6 densities but 5 covariances"), e.getMessage());
        List<double[][]> bad = new java.util.ArrayList<>(cov);
        bad.set(2, new double[k][k - 1]);
        e = assertThrows(IllegalArgumentException.class, () -> EstimateUncertainty.summarise(est.densities(), bad, o));
        assertTrue(e.getMessage().contains("covariance row 0 must have " + k), e.getMessage());
        double[][] asym = new double[k][k];
        asym[0][1] = 1;
        bad.set(2, asym);
        e = assertThrows(IllegalArgumentException.class, () -> EstimateUncertainty.summarise(est.densities(), bad, o));
        assertTrue(e.getMessage().contains("not symmetric"), e.getMessage());
        double[][] indefinite = new double[k][k];
        indefinite[0][0] = 1;
        indefinite[1][1] = -0.5;
        bad.set(2, indefinite);
        e = assertThrows(IllegalArgumentException.class, () -> EstimateUncertainty.summarise(est.densities(), bad, o));
        assertTrue(e.getMessage().contains("not positive semi-definite"), e.getMessage());
    }

    /**
     * Circular and sample estimates go through the same path: on a circle of 365 days (periodic
     * cubic splines, counts of a seasonal law) and for raw samples (a normal sample on [0, 100]),
     * every interval holds its plug-in value, probabilities stay in [0, 1] and the intervals narrow
     * as the data grow (the SD of the median of 2,000 values against 200: about √10 smaller for a
     * root-n quantity, accepted from 2 to 5).
     */
    @Test
    void circularAndSampleEstimates() {
        BayesSpace circle = BayesSpace.periodicSplines(0, 365, 4, 12);
        double[] edges = weeks();
        SplittableRandom rng = new SplittableRandom(17);
        int[][] counts = new int[3][52];
        for (int[] c : counts) {
            for (int e = 0; e < 300; e++) {
                double day = (330 + 40 * rng.nextGaussian() + 365 * 4) % 365; // a winter season across 1 January
                c[(int) Math.min(51, day / (365.0 / 52))]++;
            }
        }
        BatchEstimate season = PenalizedLikelihoodEstimator.withDefaults(circle).fitAll(edges, counts,
                new String[] {"a", "b", "c"});
        for (UnitUncertainty x : EstimateUncertainty.summarise(season, UncertaintyOptions.withSeed(2)
                .withQuantiles(0.5).withExceedances(300).withDraws(300))) {
            DerivedInterval q = x.quantiles().get(0);
            DerivedInterval p = x.exceedances().get(0);
            assertTrue(q.lower() <= q.estimate() && q.estimate() <= q.upper() && q.width() > 0, x.toString());
            assertTrue(0 <= p.lower() && p.lower() <= p.estimate() && p.estimate() <= p.upper() && p.upper() <= 1,
                    x.toString());
        }
        double[][] values = new double[2][];
        for (int u = 0; u < 2; u++) {
            values[u] = new double[u == 0 ? 200 : 2000];
            for (int i = 0; i < values[u].length; i++) {
                values[u][i] = NORMAL.inverseCumulativeProbability(LO + rng.nextDouble() * (HI - LO));
            }
        }
        BatchEstimate samples = PenalizedLikelihoodEstimator.withDefaults(BayesSpace.splines(A, B, 4, 8))
                .fitAllSamples(values, null, new String[] {"small", "large"});
        List<UnitUncertainty> s = EstimateUncertainty.summarise(samples, UncertaintyOptions.withSeed(4)
                .withQuantiles(0.5).withDraws(1000));
        double ratio = s.get(0).quantiles().get(0).sd() / s.get(1).quantiles().get(0).sd();
        assertTrue(ratio > 2 && ratio < 5, "SD ratio " + ratio);
    }

    /**
     * The circular mean on a circle of 365 days: counts of a wrapped normal law (mean direction μ,
     * Mardia &amp; Jupp (2000), Directional Statistics, §3.5.7: the wrapped normal's mean direction is
     * μ), half of the replicates with μ = 2 days so that intervals cross the cut point at day 0:
     * nominal 90 % intervals cover μ (unrolled around each estimate) within the binomial tolerance,
     * and the node rule agrees with the exact evaluation ({@link Density#circularMean()} per draw).
     */
    @Test
    void circularMeanIntervalsCoverTheTrueMeanDirectionAcrossTheCut() {
        BayesSpace circle = BayesSpace.periodicSplines(0, 365, 4, 12);
        double[] edges = weeks();
        int reps = 200;
        double[] mu = new double[reps];
        SplittableRandom rng = new SplittableRandom(23);
        int[][] counts = new int[reps][52];
        for (int u = 0; u < reps; u++) {
            mu[u] = u % 2 == 0 ? 2 : 200;
            for (int e = 0; e < 300; e++) {
                double day = ((mu[u] + 40 * rng.nextGaussian()) % 365 + 365) % 365;
                counts[u][(int) Math.min(51, day / (365.0 / 52))]++;
            }
        }
        String[] ids = new String[reps];
        Arrays.setAll(ids, i -> "r" + i);
        BatchEstimate est = PenalizedLikelihoodEstimator.withDefaults(circle).fitAll(edges, counts, ids);
        UncertaintyOptions o = UncertaintyOptions.withSeed(8).withMean(true).withDraws(400);
        List<UnitUncertainty> u = EstimateUncertainty.summarise(est, o);
        int cover = 0, crossing = 0;
        for (int i = 0; i < reps; i++) {
            DerivedInterval m = u.get(i).mean();
            double truth = m.estimate() + Math.IEEEremainder(mu[i] - m.estimate(), 365);
            cover += m.lower() <= truth && truth <= m.upper() ? 1 : 0;
            crossing += m.lower() < 0 || m.upper() >= 365 ? 1 : 0;
            assertEquals(est.densities().get(i).circularMean(), m.estimate(), 1e-6, "plug-in of " + ids[i]);
        }
        System.out.printf("circular mean: coverage of nominal 90 %% %.3f (%d intervals cross the cut)%n",
                cover / (double) reps, crossing);
        assertTrue(Math.abs(cover / (double) reps - 0.9) <= 0.064, "coverage " + cover);
        assertTrue(crossing > 10, "intervals across the cut: " + crossing);
        BatchEstimate few = new BatchEstimate(est.densities().subset(0, 1), est.diagnostics().subList(0, 2));
        List<UnitUncertainty> rule = EstimateUncertainty.summarise(few, o);
        List<UnitUncertainty> exact = EstimateUncertainty.summarise(few, o.withEvaluation(
                UncertaintyOptions.Evaluation.EXACT));
        for (int i = 0; i < 2; i++) {
            assertEquals(exact.get(i).mean().mean(), rule.get(i).mean().mean(), 1e-6);
            assertEquals(exact.get(i).mean().sd(), rule.get(i).mean().sd(), 1e-6);
        }
    }

    /** Edges of 52 equal bins of the circle of 365 days. */
    static double[] weeks() {
        double[] edges = new double[53];
        for (int j = 0; j <= 52; j++) {
            edges[j] = 365.0 * j / 52;
        }
        return edges;
    }

    static EstimationDiagnostics withCovariance(EstimationDiagnostics d, double[] cov) {
        return new EstimationDiagnostics(d.id(), d.status(), d.reason(), d.smoothing(), d.smoothingChosen(), d.criterion(),
                d.criterionValue(), d.effectiveDegreesOfFreedom(), d.logLikelihood(), d.total(), d.iterations(), cov,
                Arrays.stream(cov).sum(), d.extrapolationShare());
    }
}
