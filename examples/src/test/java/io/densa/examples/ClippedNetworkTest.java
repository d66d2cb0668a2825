package io.densa.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.DetectionLimits;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.core.estimate.PenalizedLikelihoodEstimator.EmptyEnds;
import io.densa.regression.Fpca;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.variogram.VariogramFitOptions;
import io.densa.spatial.variogram.VariogramFitting;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.random.MersenneTwister;
import org.apache.commons.math3.random.RandomGenerator;
import org.junit.jupiter.api.Test;

/**
 * A monitor network in which some units have long runs of empty bins at the low end because
 * their values are clipped at a detection limit, estimated with every default, then used for
 * leave-one-out ordinary kriging and FPCA. Invented data from a seeded generator (below); the
 * checks compare with the true densities of the generator and with the mean-density baseline.
 *
 * <h2>The simulated network</h2>
 * 56 units at uniform random places in a 100 km × 100 km square. Each unit's values (a log
 * concentration on [0, 5], 40 equal bins) come from a normal N(μ_i, σ_i²) restricted to the domain,
 * mixed with a uniform background of weight ε = 0.001 (one value in a thousand anywhere in the
 * domain), with μ_i = 2.6 + 0.9 Z1(s_i) and σ_i = 0.5 exp(0.15 Z2(s_i)), Z1 and Z2 independent
 * zero-mean unit-variance Gaussian fields with exponential covariance exp(−h / 35 km) (drawn by the
 * Cholesky factor, Commons Math). Unit i has N_i ∈ [1,000, 4,000] values (uniform). Up to eight
 * units, the first in index order whose 1 % quantile lies between bin edges 10 and 16, have a
 * detection limit L_i at the bin edge just below that quantile (edge 10 to 15) and report every value below it
 * as L_i: they have 10–15 empty low bins and a spike in the bin at L_i, and about 1 % of their values
 * are clipped. The true density of unit i is the law of its values before clipping; the background
 * makes it small but not arbitrarily small where the unit has no data (the expected count of an
 * empty background bin is about 0.03–0.1), so that an estimate which settles at the level "no event
 * expected here" is close to the truth and one that dives is not.
 *
 * <h2>Reproduced failure and acceptance</h2>
 * Ten networks (seeds 1–10), each estimated several ways. With the plain penalised likelihood (reference
 * prior 0, every bin read as recorded; smoothing by marginal likelihood: the default before the
 * reference prior) the clipped
 * units' clr dives far below the truth where they have no data and those units rule the B2
 * geometry: leave-one-out ordinary kriging (exponential model fitted by Cressie WLS on the default
 * empirical trace-variogram) is no better than the mean density of the other units on three
 * networks, and the FPCA first-component share moves away from that of the true densities.
 * Measured, seeds 1–10: MSE ratio 0.69–0.98 (mean 0.80), share deviation −0.129 … +0.134 (mean
 * |·| 0.048), lowest clr of a clipped unit −24 … −267 (below −50 on six networks).
 *
 * <p>With every default (unit-information reference prior; runs of empty bins at an end of a unit
 * with at least 10 events per bin read as censored, {@link EmptyEnds#CENSORED_IF_DENSE}), the
 * detection limits NOT declared, and the FPCA corrected for estimation error
 * ({@link Fpca#fit(BatchEstimate)}): MSE ratio 0.31–0.742 (mean 0.465), within 0.75 on every network;
 * share deviation −0.019 … +0.017 (mean |·| 0.0085), within 0.02 on every network; lowest clr of a
 * clipped unit −4.8 … −6.6; no unit flagged as extrapolated (measured 2026-12-05). Declaring the
 * clipped units' true limits ({@link DetectionLimits}) gives the same numbers: the clipped units'
 * empty runs end at their limits, so the default reads them as the declared limits do, and the
 * unclipped units' empty ends are read alike in both runs.
 *
 * <p>Every bin read as recorded ({@link EmptyEnds#COUNTED}, the default before 2026-12-05), limits not
 * declared: MSE ratio 0.33–0.748 (mean 0.48), share deviation −0.038 … +0.001 (mean |·| 0.020),
 * within 0.02 on 6 of the 10; lowest clr of a clipped unit −6.7 … −10.8. The clipped units' values
 * below the limit are recorded at the limit, a spike the true law does not have, and nothing in the
 * counts tells it from a density that rises there. On seed 8 the ratio is set by the far tails of
 * the unclipped units as much as by the clipped ones: the same network without any clipping gives
 * 0.749 counted and 0.734 with the default (whose censored reading also stops the single background
 * events beyond a unit's empty upper end from setting the level of its tail).
 *
 * <p>What kriging could attain: the same leave-one-out ordinary kriging (default variogram and
 * fit) applied to the true densities of the generator gives MSE ratios 0.30–0.68; seed 8 is the
 * network with the weakest spatial signal (0.684), so the bound 0.75 leaves the estimates only
 * 0.066 there. The gap between the estimates' ratio and the true densities' ratio (seeds 1–10):
 * every default +0.006 … +0.058 (mean +0.022, measured 2026-12-05); every bin read as recorded
 * +0.006 … +0.098 (mean +0.042); the plain penalised likelihood +0.133 … +0.560 (mean +0.352),
 * measured 2026-12-03. With every bin read as recorded (2026-12-03) on seed 8 the estimates were not
 * worse kriged than the truth — the kriging
 * MSE of the estimates is below that of the true densities (8.1 against 9.0, squared B2 norm) —
 * but estimation removes more of the between-unit spread the mean-density baseline pays for
 * (baseline MSE 10.7 against 13.2): the four clipped units, which sit at the high end of the
 * network's locations μ, carry their censored mass in a smooth, heavier low tail (clr about −3.5
 * at 0 against the generator's −4.5: the counts say only how much mass lies below the limit, and
 * the roughness penalty continues the clr with the least curvature where the truth has a
 * Gaussian tail and then the flat background), which makes them less extreme than the truth.
 * Other variogram families on seed 8: spherical 0.738 and Gaussian 0.744 (truth 0.669, 0.672), but
 * both are worse than the exponential on most other networks (e.g. seed 1: 0.358 and 0.361 against
 * 0.318), so the default stays.
 *
 * <p>Candidates measured before the correction and the limits (seeds 1–10, not adopted): reference
 * prior weight 0.25 (mean |share deviation| 0.026) or 4 (0.043) instead of 1.
 */
class ClippedNetworkTest {
    static final double A = 0;
    static final double B = 5;
    static final int BINS = 40;
    static final int UNITS = 56;
    static final double BACKGROUND = 0.001;
    static final int MAX_CLIPPED = 8;

    /** One simulated network. */
    record Network(double[] x, double[] y, double[] mu, double[] sd, int[][] counts, boolean[] clipped,
            double[] limits) {
        int clippedCount() {
            int c = 0;
            for (boolean b : clipped) {
                c += b ? 1 : 0;
            }
            return c;
        }
    }

    static double[] edges() {
        double[] e = new double[BINS + 1];
        for (int i = 0; i <= BINS; i++) {
            e[i] = i == BINS ? B : A + (B - A) * i / BINS;
        }
        return e;
    }

    /** Zero-mean unit-variance Gaussian field with covariance exp(−h / range) at the points. */
    static double[] field(double[] x, double[] y, double range, RandomGenerator rng) {
        int n = x.length;
        double[][] c = new double[n][n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                c[i][j] = Math.exp(-Math.hypot(x[i] - x[j], y[i] - y[j]) / range) + (i == j ? 1e-10 : 0);
            }
        }
        RealMatrix l = new CholeskyDecomposition(new Array2DRowRealMatrix(c, false)).getL();
        double[] z = new double[n];
        for (int i = 0; i < n; i++) {
            z[i] = rng.nextGaussian();
        }
        return l.operate(z);
    }

    static Network generate(long seed) {
        return generate(seed, MAX_CLIPPED);
    }

    /** A network with at most maxClipped clipped units (0: none; the same places, fields and values otherwise). */
    static Network generate(long seed, int maxClipped) {
        RandomGenerator rng = new MersenneTwister(seed);
        int n = UNITS;
        double[] x = new double[n];
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = 100 * rng.nextDouble();
            y[i] = 100 * rng.nextDouble();
        }
        double[] z1 = field(x, y, 35, rng);
        double[] z2 = field(x, y, 35, rng);
        double h = (B - A) / BINS;
        double[] mu = new double[n];
        double[] sd = new double[n];
        int[][] counts = new int[n][BINS];
        boolean[] clipped = new boolean[n];
        double[] limits = new double[n];
        java.util.Arrays.fill(limits, Double.NaN);
        int nClipped = 0;
        for (int i = 0; i < n; i++) {
            mu[i] = 2.6 + 0.9 * z1[i];
            sd[i] = 0.5 * Math.exp(0.15 * z2[i]);
            NormalDistribution normal = new NormalDistribution(null, mu[i], sd[i]);
            double limit = A;
            int bin = (int) Math.floor((normal.inverseCumulativeProbability(0.01) - A) / h);
            if (nClipped < maxClipped && bin >= 10 && bin <= 15) {
                clipped[i] = true;
                nClipped++;
                limit = A + h * bin;
                limits[i] = limit;
            }
            int total = 1000 + rng.nextInt(3001);
            for (int e = 0; e < total; e++) {
                double v;
                if (rng.nextDouble() < BACKGROUND) {
                    v = A + (B - A) * rng.nextDouble();
                } else {
                    do {
                        v = mu[i] + sd[i] * rng.nextGaussian();
                    } while (v < A || v > B);
                }
                v = Math.max(v, limit);
                counts[i][(int) Math.min(BINS - 1, Math.floor((v - A) / h))]++;
            }
        }
        return new Network(x, y, mu, sd, counts, clipped, limits);
    }

    /** The true densities (law before clipping) projected onto the space. */
    static DensitySet truth(Network net, BayesSpace space) {
        double[][] c = new double[UNITS][];
        for (int i = 0; i < UNITS; i++) {
            NormalDistribution normal = new NormalDistribution(null, net.mu()[i], net.sd()[i]);
            double mass = normal.cumulativeProbability(B) - normal.cumulativeProbability(A);
            c[i] = space.projectLogPdf(
                    t -> Math.log((1 - BACKGROUND) * normal.density(t) / mass + BACKGROUND / (B - A)))
                    .density().coordinates();
        }
        return DensitySet.of(space, c);
    }

    /** {MSE of leave-one-out ordinary kriging / MSE of the leave-one-out mean density, kriging MSE}. */
    static double[] looRatio(Network net, DensitySet d) {
        Locations loc = Locations.planar(net.x(), net.y());
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, d, VariogramOptions.withDefaults());
        VariogramModel model = VariogramFitting.fit(ev, VariogramFitOptions.withDefaults()).model();
        double mse = Kriging.ordinary(loc, d, model).crossValidate()
                .meanSquaredError();
        double[][] c = d.coordinates();
        int n = c.length;
        int k = c[0].length;
        double[] sum = new double[k];
        for (double[] row : c) {
            for (int j = 0; j < k; j++) {
                sum[j] += row[j];
            }
        }
        double base = 0;
        for (double[] row : c) {
            for (int j = 0; j < k; j++) {
                double e = row[j] - (sum[j] - row[j]) / (n - 1);
                base += e * e / n;
            }
        }
        return new double[] {mse / base, mse};
    }

    static double firstShare(DensitySet d) {
        return Fpca.fit(d).explainedVariance()[0];
    }

    static double minClr(Density f) {
        double m = Double.POSITIVE_INFINITY;
        for (int i = 0; i <= 500; i++) {
            m = Math.min(m, f.clr(A + (B - A) * i / 500));
        }
        return m;
    }

    /** Outcome of one network under one estimator. */
    record Outcome(double ratio, double trueRatio, double share, double trueShare, double minClippedClr,
            List<String> flagged, List<String> clippedIds) {
        double shareDelta() {
            return share - trueShare;
        }

        /** How much worse the estimates' LOO ratio is than the true densities' (the attainable one). */
        double ratioGap() {
            return ratio - trueRatio;
        }

        @Override
        public String toString() {
            return String.format(Locale.ROOT, "LOO MSE ratio %.3f (true densities %.3f, gap %+.3f), FPCA share %.4f vs"
                    + " true %.4f (delta %+.4f), lowest clr of clipped units %.1f, flagged %s (clipped %s)", ratio,
                    trueRatio, ratioGap(), share, trueShare, shareDelta(), minClippedClr, flagged, clippedIds);
        }
    }

    /**
     * One network: estimated with the estimator, the clipped units' detection limits declared or
     * not; FPCA of the estimates corrected for estimation error ({@link Fpca#fit(BatchEstimate)})
     * or not ({@link Fpca#fit(DensitySet)}).
     */
    static Outcome run(long seed, PenalizedLikelihoodEstimator estimator, boolean declareLimits,
            boolean correctedFpca) {
        return run(generate(seed), estimator, declareLimits, correctedFpca);
    }

    static Outcome run(Network net, PenalizedLikelihoodEstimator estimator, boolean declareLimits,
            boolean correctedFpca) {
        BayesSpace space = estimator.space();
        String[] ids = new String[UNITS];
        List<String> clippedIds = new ArrayList<>();
        for (int i = 0; i < UNITS; i++) {
            ids[i] = "u" + i;
            if (net.clipped()[i]) {
                clippedIds.add(ids[i]);
            }
        }
        BatchEstimate est = declareLimits
                ? estimator.fitAll(edges(), net.counts(), ids, DetectionLimits.lower(net.limits()))
                : estimator.fitAll(edges(), net.counts(), ids);
        for (EstimationDiagnostics d : est.diagnostics()) {
            assertTrue(d.converged(), d.toString());
        }
        DensitySet dens = est.densities();
        double minClr = Double.POSITIVE_INFINITY;
        for (int i = 0; i < UNITS; i++) {
            if (net.clipped()[i]) {
                minClr = Math.min(minClr, minClr(dens.get(i)));
            }
        }
        double share = correctedFpca ? Fpca.fit(est).explainedVariance()[0] : firstShare(dens);
        DensitySet truth = truth(net, space);
        return new Outcome(looRatio(net, dens)[0], looRatio(net, truth)[0], share, firstShare(truth), minClr,
                est.extrapolatedIds(), clippedIds);
    }

    static BayesSpace space() {
        return BayesSpace.splines(A, B, 4, 8);
    }

    /**
     * The generator does what the class documentation says: eight clipped units with 10–15 empty
     * low bins, 1,000–4,000 values per unit.
     */
    @Test
    void generatorMakesTheDescribedNetwork() {
        Network net = generate(1);
        assertEquals(MAX_CLIPPED, net.clippedCount());
        for (int i = 0; i < UNITS; i++) {
            int total = 0;
            for (int c : net.counts()[i]) {
                total += c;
            }
            assertTrue(total >= 1000 && total <= 4000, "unit " + i + ": " + total + " values");
            if (net.clipped()[i]) {
                int empty = 0;
                while (net.counts()[i][empty] == 0) {
                    empty++;
                }
                assertTrue(empty >= 10 && empty <= 15, "clipped unit " + i + ": " + empty + " empty low bins");
            }
        }
    }

    static final int NETWORKS = 10;

    static Outcome[] runAll(PenalizedLikelihoodEstimator estimator, boolean declareLimits, boolean correctedFpca) {
        return runAll(estimator, declareLimits, correctedFpca, MAX_CLIPPED);
    }

    static Outcome[] runAll(PenalizedLikelihoodEstimator estimator, boolean declareLimits, boolean correctedFpca,
            int maxClipped) {
        Outcome[] out = new Outcome[NETWORKS];
        for (int s = 0; s < NETWORKS; s++) {
            out[s] = run(generate(s + 1, maxClipped), estimator, declareLimits, correctedFpca);
            System.out.println((maxClipped == 0 ? "unclipped" : "clipped") + " network seed " + (s + 1)
                    + ", reference prior " + estimator.referencePriorWeight() + ", empty ends "
                    + estimator.emptyEnds() + (declareLimits ? ", limits declared" : "")
                    + (correctedFpca ? ", corrected FPCA" : "") + ": " + out[s]);
        }
        return out;
    }

    private static Outcome[] defaultsCache;

    /**
     * The ten networks with every default, the detection limits not declared (the data read as they
     * come; computed once, shared by the tests).
     */
    static synchronized Outcome[] withDefaults() {
        if (defaultsCache == null) {
            defaultsCache = runAll(PenalizedLikelihoodEstimator.withDefaults(space()), false, true);
        }
        return defaultsCache;
    }

    private static Outcome[] declaredCache;

    /** Every default with the clipped units' detection limits declared. */
    static synchronized Outcome[] declared() {
        if (declaredCache == null) {
            declaredCache = runAll(PenalizedLikelihoodEstimator.withDefaults(space()), true, true);
        }
        return declaredCache;
    }

    static double meanAbsShareDelta(Outcome[] o) {
        double m = 0;
        for (Outcome x : o) {
            m += Math.abs(x.shareDelta()) / o.length;
        }
        return m;
    }

    static double meanRatio(Outcome[] o) {
        double m = 0;
        for (Outcome x : o) {
            m += x.ratio() / o.length;
        }
        return m;
    }

    /**
     * The failure, reproduced with the plain penalised likelihood (reference prior 0) and compared
     * with the defaults on the same ten networks.
     */
    @Test
    void plainPenalisedLikelihoodReproducesTheFailure() {
        Outcome[] plain = runAll(PenalizedLikelihoodEstimator.withDefaults(space()).withReferencePrior(0)
                .withEmptyEnds(EmptyEnds.COUNTED), false, false);
        Outcome[] defaults = withDefaults();
        int diving = 0;
        double worst = 0;
        int flagged = 0;
        for (Outcome o : plain) {
            diving += o.minClippedClr() < -50 ? 1 : 0;
            worst = Math.max(worst, o.ratio());
            flagged += o.flagged().size();
        }
        assertTrue(diving >= 3, "networks with a clipped unit diving below -50: " + diving);
        assertTrue(worst >= 0.95, "kriging no better than the mean density on some network: worst ratio " + worst);
        assertTrue(meanRatio(plain) >= meanRatio(defaults) + 0.15,
                "mean ratio " + meanRatio(plain) + " vs defaults " + meanRatio(defaults));
        assertTrue(meanAbsShareDelta(plain) >= meanAbsShareDelta(defaults) + 0.01,
                "mean |share deviation| " + meanAbsShareDelta(plain) + " vs defaults " + meanAbsShareDelta(defaults));
        assertTrue(flagged >= 5 * NETWORKS, "units flagged as extrapolated: " + flagged);
        double least = Double.POSITIVE_INFINITY;
        for (Outcome o : plain) {
            least = Math.min(least, o.ratioGap());
        }
        assertTrue(least >= 0.1, "plain estimates kriged nearly as well as the true densities on some network: gap "
                + least);
        assertTrue(meanRatioGap(plain) >= meanRatioGap(defaults) + 0.2,
                "mean ratio gap " + meanRatioGap(plain) + " vs defaults " + meanRatioGap(defaults));
    }

    static double meanRatioGap(Outcome[] o) {
        double m = 0;
        for (Outcome x : o) {
            m += x.ratioGap() / o.length;
        }
        return m;
    }

    private static Outcome[] countedCache;

    /** Every default but every bin read as recorded ({@link EmptyEnds#COUNTED}), limits not declared. */
    static synchronized Outcome[] counted() {
        if (countedCache == null) {
            countedCache = runAll(PenalizedLikelihoodEstimator.withDefaults(space()).withEmptyEnds(EmptyEnds.COUNTED),
                    false, true);
        }
        return countedCache;
    }

    /**
     * The bounds with every default, the detection limits not declared: leave-one-out OK kriging MSE
     * ratio ≤ 0.75 and FPCA first-component share (corrected for estimation error) within 0.02 of the
     * true densities' share on every network; the ratio within 0.08 of that of the true densities
     * on every network (0.04 on average); no clipped unit's clr below −8; no unit flagged as
     * extrapolated.
     */
    @Test
    void acceptanceWithEveryDefault() {
        Outcome[] o = withDefaults();
        assertTrue(meanRatioGap(o) <= 0.04, "mean gap to the true densities' ratio " + meanRatioGap(o));
        for (Outcome x : o) {
            assertTrue(x.ratio() <= 0.75, x.toString());
            assertTrue(Math.abs(x.shareDelta()) <= 0.02, x.toString());
            assertTrue(x.ratioGap() <= 0.08, x.toString());
            assertTrue(x.minClippedClr() >= -8, x.toString());
            assertTrue(x.flagged().isEmpty(), x.toString());
        }
    }

    /**
     * Declaring the true limits does as well as the default's reading of the empty ends: shares within
     * 0.02 and ratios within 0.75 on every network.
     */
    @Test
    void declaredLimitsDoAboutAsWell() {
        Outcome[] o = declared();
        for (Outcome x : o) {
            assertTrue(Math.abs(x.shareDelta()) <= 0.02, x.toString());
            assertTrue(x.ratio() <= 0.75, x.toString());
            assertTrue(x.minClippedClr() >= -8, x.toString());
            assertTrue(x.flagged().isEmpty(), x.toString());
        }
        assertTrue(Math.abs(meanAbsShareDelta(o) - meanAbsShareDelta(withDefaults())) <= 0.005,
                "mean |share deviation| declared " + meanAbsShareDelta(o) + " vs every default "
                        + meanAbsShareDelta(withDefaults()));
    }

    /**
     * Every bin read as recorded (the reading before the censored one was the default), limits not
     * declared: kriging still meets its bound, but the clipped units' spikes bias the share (within
     * 0.02 on only some networks), and the default brings it closer on average.
     */
    @Test
    void readingEveryBinAsRecordedLetsTheSpikeBiasTheShare() {
        Outcome[] o = counted();
        int within = 0;
        for (Outcome x : o) {
            assertTrue(x.ratio() <= 0.75, x.toString());
            assertTrue(Math.abs(x.shareDelta()) <= 0.05, x.toString());
            assertTrue(x.minClippedClr() >= -12, x.toString());
            assertTrue(x.flagged().size() <= 1, x.toString());
            within += Math.abs(x.shareDelta()) <= 0.02 ? 1 : 0;
        }
        assertTrue(within <= NETWORKS - 2, "networks with the share within 0.02 when every bin is read as recorded: "
                + within);
        assertTrue(meanAbsShareDelta(o) >= meanAbsShareDelta(withDefaults()) + 0.005,
                "mean |share deviation| counted " + meanAbsShareDelta(o) + " vs every default "
                        + meanAbsShareDelta(withDefaults()));
    }

    /**
     * On the same networks without any clipped unit the default's censored reading of dense units'
     * empty ends costs nothing measurable: against reading every bin as recorded, each network's
     * kriging ratio moves by at most 0.02 and its share by at most 0.015, and on average the ratio is
     * no higher and the share no further from the truth (measured: mean ratio 0.463 against 0.465,
     * mean |share deviation| 0.0095 against 0.0089).
     */
    @Test
    void withoutClippingTheCensoredReadingCostsLittle() {
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space());
        Outcome[] censored = runAll(est, false, true, 0);
        Outcome[] counted = runAll(est.withEmptyEnds(EmptyEnds.COUNTED), false, true, 0);
        for (int s = 0; s < NETWORKS; s++) {
            assertTrue(Math.abs(censored[s].ratio() - counted[s].ratio()) <= 0.02, censored[s] + " vs " + counted[s]);
            assertTrue(Math.abs(censored[s].share() - counted[s].share()) <= 0.015, censored[s] + " vs " + counted[s]);
        }
        assertTrue(meanRatio(censored) <= meanRatio(counted) + 0.005, meanRatio(censored) + " vs " + meanRatio(counted));
        assertTrue(meanAbsShareDelta(censored) <= meanAbsShareDelta(counted) + 0.002,
                meanAbsShareDelta(censored) + " vs " + meanAbsShareDelta(counted));
    }
}
