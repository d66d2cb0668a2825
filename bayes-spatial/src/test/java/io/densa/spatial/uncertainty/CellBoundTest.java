package io.densa.spatial.uncertainty;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The shortcuts of the node rule's engine change no number: the per-location bound that skips
 * the per-draw error estimates (checked to dominate every draw's estimate, and to give the same
 * values and the same exactly evaluated draws as computing the estimates; the bound is loose, so
 * it is required to skip the estimates only for smooth draws in the study-2 space), and the
 * quantile search interleaved over draws (the same values as the one-density search).
 */
class CellBoundTest {
    private static final double[] PROBS = {0.05, 0.5, 0.99};

    /** A K × K factor of unit trace: location and spread of the density plus a little of every coordinate. */
    private static double[] factor(BayesSpace space, Random rnd) {
        int k = space.dimension();
        double len = space.upper() - space.lower(), mid = 0.5 * (space.lower() + space.upper());
        double[] mu0 = NodeRuleAccuracyTest.bump(space, mid, 0.15 * len);
        double[] mu1 = NodeRuleAccuracyTest.bump(space, mid + 0.02 * len, 0.15 * len);
        double[] sd1 = NodeRuleAccuracyTest.bump(space, mid, 0.17 * len);
        double[] f = new double[k * k];
        double tr = 0;
        for (int i = 0; i < k; i++) {
            f[i * k] = mu1[i] - mu0[i];
            f[i * k + 1 % k] += sd1[i] - mu0[i];
            for (int j = 2; j < k; j++) {
                f[i * k + j] = 0.05 * rnd.nextGaussian();
            }
        }
        for (double v : f) {
            tr += v * v;
        }
        for (int i = 0; i < f.length; i++) {
            f[i] /= Math.sqrt(tr);
        }
        return f;
    }

    private static double[] location(BayesSpace space, Random rnd) {
        double len = space.upper() - space.lower(), mid = 0.5 * (space.lower() + space.upper());
        return NodeRuleAccuracyTest.bump(space, mid + (rnd.nextDouble() - 0.5) * 0.4 * len,
                (0.06 + 0.12 * rnd.nextDouble()) * len);
    }

    @Test
    void boundChangesNoValueAndSkipsTheEstimatesOfSmoothDraws() {
        BayesSpace[] spaces = {BayesSpace.splines(0, Math.log(150), 4, 8), BayesSpace.splines(0, 1, 4, 29),
            BayesSpace.polynomials(-1, 2, 2)};
        for (BayesSpace space : spaces) {
            Random rnd = new Random(3);
            double[] f = factor(space, rnd);
            int k = space.dimension();
            UncertaintyOptions o = UncertaintyOptions.withSeed(5).withDraws(100).withQuantiles(PROBS)
                    .withExceedances(space.lower() + 0.6 * (space.upper() - space.lower())).withMean(true);
            DrawEngine fast = new DrawEngine(space, f, k, o);
            DrawEngine full = new DrawEngine(space, f, k, o, false);
            DrawEngine.Scratch sf = fast.scratch();
            DrawEngine.Scratch sl = full.scratch();
            for (double spread : new double[] {0.1, 0.5, 1, 2, 5}) {
                long before = sf.bounded;
                for (int loc = 0; loc < 6; loc++) {
                    double[] c = location(space, rnd);
                    fast.evaluate(c, 0, spread * spread, loc, sf);
                    full.evaluate(c, 0, spread * spread, loc, sl);
                    assertEquals(sl.exact, sf.exact, space + " spread " + spread);
                    for (int q = 0; q < fast.quantities; q++) {
                        for (int d = 0; d < fast.cols; d++) {
                            assertEquals(sl.values[q][d], sf.values[q][d], 0.0, space + " spread " + spread
                                    + " quantity " + q + " draw " + d);
                        }
                    }
                }
                if (spread <= 0.1 && space == spaces[0]) {
                    assertTrue(sf.bounded - before > 0, space + ": the bound skips the estimates at spread " + spread);
                }
            }
        }
    }

    @Test
    void boundDominatesEveryDrawsEstimate() {
        BayesSpace space = BayesSpace.splines(0, Math.log(150), 4, 8);
        Random rnd = new Random(4);
        double[] f = factor(space, rnd);
        int k = space.dimension();
        UncertaintyOptions o = UncertaintyOptions.withSeed(6).withDraws(100).withQuantiles(0.5);
        DrawEngine full = new DrawEngine(space, f, k, o, false);
        DrawEngine.Scratch s = full.scratch();
        int finite = 0;
        for (double spread : new double[] {0.05, 0.3, 1, 3}) {
            for (int loc = 0; loc < 20; loc++) {
                full.evaluate(location(space, rnd), 0, spread * spread, loc, s);
                double bound = full.cellBound(s);
                for (int d = 0; d < full.cols; d++) {
                    assertTrue(bound >= s.err[d], "spread " + spread + ", draw " + d + ": bound " + bound
                            + " < estimate " + s.err[d]);
                }
                finite += bound < Double.POSITIVE_INFINITY ? 1 : 0;
            }
        }
        assertTrue(finite > 40, "the bound is finite for most locations: " + finite);
    }

    @Test
    void blockQuantilesAgreeWithTheOneDensitySearch() {
        BayesSpace space = BayesSpace.splines(0, Math.log(150), 4, 8);
        double len = space.upper() - space.lower();
        double worst = 0;
        long typical = 0, guarded = 0;
        Random rnd = new Random(8);
        double[] f = factor(space, rnd);
        int k = space.dimension();
        UncertaintyOptions o = UncertaintyOptions.withSeed(9).withDraws(120).withQuantiles(0.5);
        DrawEngine e = new DrawEngine(space, f, k, o);
        DrawEngine.Scratch s = e.scratch();
        NodeRule nr = e.rule;
        int n = e.cols;
        double[] out = new double[n];
        double[] lag = new double[nr.q];
        for (double spread : new double[] {0.2, 1, 4}) {
            e.evaluate(location(space, rnd), 0, spread * spread, 0, s);
            for (double p : new double[] {1e-6, 0.05, 0.5, 0.99, 1 - 1e-9}) {
                long before = s.work.fallbacks;
                s.work.quantiles(p, s.mass, s.prefix, s.g, s.y, s.shift, n, out);
                if (p >= 0.05 && p <= 0.99) {
                    typical += n;
                    guarded += s.work.fallbacks - before;
                }
                double[] mass = flat(s.mass, n), g = flat(s.g, n), y = flat(s.y, n);
                for (int d = 0; d < n; d++) {
                    double one = nr.quantile(p, mass, d, n, s.total[d], g, y, d, s.shift[d], lag);
                    assertEquals(one, out[d], 1e-10 * len, "p " + p + ", draw " + d);
                    worst = Math.max(worst, Math.abs(one - out[d]) / len);
                }
            }
        }
        System.out.println("block against one-density quantile search: largest difference " + worst
                + " of the domain; guarded search for " + guarded + " of " + typical + " searches at p in [0.05, 0.99]");
        // the unguarded steps are the fast path: they settle nearly every search of the usual probabilities
        assertTrue(guarded <= 0.02 * typical, guarded + " of " + typical);
    }

    /** The first n columns of the rows, row after row (the node-major layout of the one-density search). */
    private static double[] flat(double[][] rows, int n) {
        double[] out = new double[rows.length * n];
        for (int i = 0; i < rows.length; i++) {
            System.arraycopy(rows[i], 0, out, i * n, n);
        }
        return out;
    }

    /**
     * The Bernstein weights reproduce the interpolating polynomial: Σ_i b_i C(n, i) u^i (1 − u)^{n−i}
     * equals the Lagrange interpolant of the node values at random points (the Bernstein basis
     * identity; Farouki &amp; Rajan (1988), Comput. Aided Geom. Des. 5), for the node counts in use.
     */
    /**
     * The shift of each draw (its largest node value, taken over the nodes that can hold it) equals
     * the largest of all its node values, at small and large kriging variances.
     */
    @Test
    void shiftIsTheLargestNodeValue() {
        BayesSpace space = BayesSpace.splines(0, Math.log(150), 4, 8);
        Random rnd = new Random(12);
        DrawEngine e = new DrawEngine(space, factor(space, rnd), space.dimension(),
                UncertaintyOptions.withSeed(3).withDraws(150).withQuantiles(0.5));
        DrawEngine.Scratch s = e.scratch();
        int n = e.cols;
        for (double spread : new double[] {0.05, 0.5, 3, 20}) {
            for (int rep = 0; rep < 5; rep++) {
                e.evaluate(location(space, rnd), 0, spread * spread, rep, s);
                for (int d = 0; d < n; d++) {
                    double big = Double.NEGATIVE_INFINITY;
                    for (double[] row : s.y) {
                        big = Math.max(big, row[d]);
                    }
                    assertEquals(big, s.shift[d], 0.0, "spread " + spread + ", draw " + d);
                }
            }
        }
    }

    @Test
    void bernsteinWeightsReproduceTheInterpolant() {
        Random rnd = new Random(3);
        for (BayesSpace space : new BayesSpace[] {BayesSpace.splines(0, 1, 4, 6), BayesSpace.polynomials(0, 1, 5),
            BayesSpace.splines(0, 1, 6, 4)}) {
            NodeRule nr = new NodeRule(space, new double[0]);
            int q = nr.q, n = q - 1;
            double[] w = QuantileSearch.bernsteinWeights(nr.power, q);
            for (int rep = 0; rep < 50; rep++) {
                double[] g = new double[q];
                for (int i = 0; i < q; i++) {
                    g[i] = Math.exp(3 * rnd.nextGaussian());
                }
                double u = rnd.nextDouble();
                double lagrange = 0;
                for (int i = 0; i < q; i++) {
                    double l = 1;
                    for (int j = 0; j < q; j++) {
                        if (j != i) {
                            l *= (u - nr.un[j]) / (nr.un[i] - nr.un[j]);
                        }
                    }
                    lagrange += g[i] * l;
                }
                double bern = 0, scale = 0;
                for (int i = 0; i <= n; i++) {
                    double b = 0;
                    for (int j = 0; j < q; j++) {
                        b += w[i * q + j] * g[j];
                    }
                    double c = 1;
                    for (int t = 1; t <= i; t++) {
                        c = c * (n - i + t) / t;
                    }
                    bern += b * c * Math.pow(u, i) * Math.pow(1 - u, n - i);
                    scale = Math.max(scale, g[i]);
                }
                assertEquals(lagrange, bern, 1e-10 * scale, space + ", u " + u);
            }
        }
    }
}
