package io.densa.spatial.uncertainty;

import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.Reference;
import java.util.Random;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.junit.jupiter.api.Test;

/**
 * The node rule of {@link UncertaintyOptions.Evaluation#NODE_RULE} against the space's exact
 * methods ({@link Density#quantile}, {@link Density#tailProbability}, {@link Density#mean}; the
 * reference here): the same draws of many locations evaluated both ways, and its error estimate
 * against Commons Math integration.
 */
class NodeRuleAccuracyTest {

    /**
     * Max |node − exact| per quantity (quantiles, exceedances, mean) over every draw of many
     * locations; the shape factor has unit trace, so the spread is the kriging standard deviation
     * in B2 units.
     */
    static double[] compare(BayesSpace space, double[] probs, double[] thresholds, double spread, double noise,
            long seed, int locations, int[] exactCount) {
        int k = space.dimension();
        Random rnd = new Random(seed);
        double len = space.upper() - space.lower(), mid = 0.5 * (space.lower() + space.upper());
        // a smooth shape: mostly location and spread of the density, plus a little of every coordinate
        double[] mu0 = bump(space, mid, 0.15 * len);
        double[] mu1 = bump(space, mid + 0.02 * len, 0.15 * len);
        double[] sd1 = bump(space, mid, 0.17 * len);
        double[] f = new double[k * k];
        double tr = 0;
        for (int i = 0; i < k; i++) {
            f[i * k] = mu1[i] - mu0[i];
            f[i * k + 1 % k] += sd1[i] - mu0[i];
            for (int j = 2; j < k; j++) {
                f[i * k + j] = noise * rnd.nextGaussian();
            }
        }
        for (double v : f) {
            tr += v * v;
        }
        for (int i = 0; i < f.length; i++) {
            f[i] /= Math.sqrt(tr);
        }
        UncertaintyOptions o = UncertaintyOptions.withSeed(seed).withDraws(50).withQuantiles(probs)
                .withExceedances(thresholds).withMean(true);
        DrawEngine node = new DrawEngine(space, f, k, o);
        DrawEngine exact = new DrawEngine(space, f, k, o.withEvaluation(UncertaintyOptions.Evaluation.EXACT));
        DrawEngine.Scratch sn = node.scratch();
        DrawEngine.Scratch se = exact.scratch();
        double[] worst = new double[node.quantities];
        for (int loc = 0; loc < locations; loc++) {
            double m = mid + (rnd.nextDouble() - 0.5) * 0.4 * len;
            double sd = (0.06 + 0.12 * rnd.nextDouble()) * len;
            double[] c = bump(space, m, sd);
            node.evaluate(c, 0, spread * spread, loc, sn);
            exact.evaluate(c, 0, spread * spread, loc, se);
            exactCount[0] += sn.exact;
            exactCount[1] += o.draws() + 1;
            for (int q = 0; q < node.quantities; q++) {
                for (int d = 0; d <= o.draws(); d++) {
                    worst[q] = Math.max(worst[q], Math.abs(sn.values[q][d] - se.values[q][d]));
                }
            }
        }
        System.out.println(space + ", spread " + spread + ": largest differences " + java.util.Arrays.toString(worst)
                + "; " + exactCount[0] + " of " + exactCount[1] + " draws evaluated exactly");
        return worst;
    }

    static double[] bump(BayesSpace space, double m, double sd) {
        return space.project(x -> Math.exp(-0.5 * Math.pow((x - m) / sd, 2))).density().coordinates();
    }

    /**
     * Quantiles within 10⁻⁴ of the domain's length, exceedance probabilities within 10⁻⁵ and means
     * within 10⁻⁵ of the length (the rule's tolerance is 10⁻⁴ of the mass; what it keeps is smaller).
     */
    static void assertAccurate(BayesSpace space, double[] w, int quantiles) {
        double len = space.upper() - space.lower();
        for (int q = 0; q < w.length; q++) {
            double tol = q < quantiles ? 1e-4 * len : q == w.length - 1 ? 1e-5 * len : 1e-5;
            assertTrue(w[q] <= tol, space + ": quantity " + q + " differs by " + w[q] + " > " + tol);
        }
    }

    @Test
    void cubicSplinesAsInStudyTwo() {
        BayesSpace s = BayesSpace.splines(0, Math.log(150), 4, 8);
        for (double spread : new double[] {0.5, 1, 2, 5}) {
            int[] count = new int[2];
            double[] w = compare(s, new double[] {0.05, 0.5, 0.99}, new double[] {Math.log(15)}, spread, 0.05, 1, 20,
                    count);
            assertAccurate(s, w, 3);
            // the rule and its refinements take almost every draw, peaked ones too (spread 5: 23 of
            // 1,020 exact; 549 with the unrefined rule alone, 96 at spread 2); the differences above
            // include the refined draws
            assertTrue(count[0] < 0.05 * count[1], "draws left to the exact methods: " + count[0] + " of "
                    + count[1]);
        }
    }

    @Test
    void otherBasesAndReferences() {
        BayesSpace[] spaces = {BayesSpace.splines(0, 1, 4, 29), BayesSpace.polynomials(-1, 2, 2),
            BayesSpace.polynomials(-1, 2, 5), BayesSpace.steps(0, 1, 10), BayesSpace.splines(0, 1, 3, 10),
            BayesSpace.splines(0, 1, 4, 6).withReference(Reference.normal(0.5, 0.3)),
            BayesSpace.splines(0, 1, 4, 6).withReference(Reference.uniform())};
        double[] spreads = {0.5, 0.3, 0.3, 0.5, 0.5, 0.5, 0.5};
        for (int i = 0; i < spaces.length; i++) {
            double t = spaces[i].lower() + 0.6 * (spaces[i].upper() - spaces[i].lower());
            double[] w = compare(spaces[i], new double[] {0.5, 0.99}, new double[] {t}, spreads[i], 0.02, 2 + i, 8,
                    new int[2]);
            assertAccurate(spaces[i], w, 2);
        }
    }

    /**
     * The panel error estimate safety · (q!)⁴/((2q+1)((2q)!)³) · (2q)! e_{2q}(|β|) exp(c_max) of
     * {@link NodeRule} is never below the true error of the 4-point Gauss–Legendre rule for exp of
     * random cubics on one panel; the true integral by the 48-point Gauss–Legendre rule of Commons
     * Math ({@link GaussIntegratorFactory#legendre}), exact for these entire integrands
     * to rounding.
     */
    @Test
    void errorEstimateIsConservative() {
        NodeRule nr = new NodeRule(BayesSpace.splines(0, 1, 4, 0), new double[0]);
        int q = nr.q;
        Random rnd = new Random(9);
        double[] beta = new double[q - 1];
        double[] series = new double[2 * q + 1];
        double minRatio = Double.POSITIVE_INFINITY;
        int tried = 0;
        GaussIntegrator reference = new GaussIntegratorFactory().legendre(48, 0, 1);
        for (int t = 0; t < 3000; t++) {
            double scale = new double[] {0.5, 1, 2, 4, 8}[t % 5];
            double b1 = scale * rnd.nextGaussian(), b2 = scale * rnd.nextGaussian(), b3 = scale * rnd.nextGaussian();
            java.util.function.DoubleUnaryOperator c = u -> b1 * (u - 0.5) + b2 * Math.pow(u - 0.5, 2)
                    + b3 * Math.pow(u - 0.5, 3);
            double exact = reference.integrate(u -> Math.exp(c.applyAsDouble(u)));
            double rule = 0, hi = Double.NEGATIVE_INFINITY;
            java.util.Arrays.fill(beta, 0);
            double left = 0, right = 0;
            for (int i = 0; i < q; i++) {
                double v = c.applyAsDouble(nr.un[i]);
                rule += nr.uw[i] * Math.exp(v);
                hi = Math.max(hi, v);
                left += nr.endWeights[i] * v;
                right += nr.endWeights[q + i] * v;
                for (int m = 0; m < q - 1; m++) {
                    beta[m] += nr.taylor[m * q + i] * v;
                }
            }
            hi = Math.max(hi, Math.max(left, right));
            double err = Math.abs(rule - exact);
            if (err < 1e-13 * exact) {
                continue;
            }
            tried++;
            double est = nr.ruleConstant * nr.errorFactor(beta, series) * Math.exp(hi);
            minRatio = Math.min(minRatio, est / err);
        }
        System.out.printf("panel error estimate / true error over %d cubics: at least %.3f%n", tried, minRatio);
        assertTrue(tried > 1000);
        assertTrue(minRatio >= 1, "the estimate fell below the true error: ratio " + minRatio);
    }
}
