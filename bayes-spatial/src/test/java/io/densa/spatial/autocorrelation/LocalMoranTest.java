package io.densa.spatial.autocorrelation;

import static io.densa.spatial.Lattices.rookLattice;
import static io.densa.spatial.autocorrelation.AutocorrelationTestSupport.forEachPermutation;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import io.densa.core.BenjaminiHochberg;

import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

class LocalMoranTest {
    private static final double[] ONE_TO_NINE = {1, 2, 3, 4, 5, 6, 7, 8, 9};
    private static final double[] SKEWED = {0.3, 4.1, 0.2, 0.9, 7.5, 0.05, 1.7, 0.6, 2.2};

    @Test
    void localStatisticsSumToS0TimesGlobalI() {
        // Anselin (1995, from memory): with I_i = (z_i / m2) Σ_j w_ij z_j and m2 = Σ z² / n,
        // Σ_i I_i = n Σ w_ij z_i z_j / Σ z² = S0 · I. Checked for binary, row-standardised and
        // asymmetric (directed kNN) weights.
        Random rnd = new Random(21);
        int n = 64;
        double[][] xy = new double[n][2];
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            xy[i][0] = rnd.nextDouble();
            xy[i][1] = rnd.nextDouble();
            v[i] = rnd.nextGaussian() + 3 * xy[i][1];
        }
        List<SpatialWeights> all = List.of(SpatialWeights.fromNeighbours(rookLattice(8, 8)),
                SpatialWeights.fromNeighbours(rookLattice(8, 8)).rowStandardised(),
                SpatialWeights.nearestNeighbours(Locations.planar(xy), 3, SpatialWeights.Symmetry.DIRECTED));
        AutocorrelationOptions o = AutocorrelationOptions.withDefaults().withPermutations(99, 1);
        for (SpatialWeights w : all) {
            double global = MoranI.statistic(w, v);
            LocalMoran.Result r = LocalMoran.test(w, v, o);
            assertEquals(w.s0() * global, r.sum(), 1e-11);
            double direct = 0;
            for (double li : LocalMoran.statistics(w, v)) {
                direct += li;
            }
            assertEquals(r.sum(), direct, 1e-11);
        }
        // Row-standardised without islands: S0 = n, so the mean of the I_i is I.
        SpatialWeights rs = all.get(1);
        assertEquals(n, rs.s0(), 1e-12);
        assertEquals(MoranI.statistic(rs, v), LocalMoran.test(rs, v, o).sum() / n, 1e-12);
    }

    @Test
    void randomisationMomentsMatchEnumerationOfAllPermutations() {
        // E[I_i] = -w_i/(n-1) and Var[I_i] under total randomisation (Anselin 1995, from memory):
        // exact check by enumerating all 9! arrangements of skewed values on the rook grid.
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        double[][] wd = w.toMatrix();
        int n = 9;
        double[] s1 = new double[n], s2 = new double[n];
        long[] count = new long[1];
        forEachPermutation(SKEWED.clone(), p -> {
            double mean = 0, m2 = 0;
            for (double x : p) {
                mean += x;
            }
            mean /= n;
            for (double x : p) {
                m2 += (x - mean) * (x - mean);
            }
            m2 /= n;
            for (int i = 0; i < n; i++) {
                double lag = 0;
                for (int j = 0; j < n; j++) {
                    lag += wd[i][j] * (p[j] - mean);
                }
                double li = (p[i] - mean) / m2 * lag;
                s1[i] += li;
                s2[i] += li * li;
            }
            count[0]++;
        });
        LocalMoran.Result r = LocalMoran.test(w, SKEWED, AutocorrelationOptions.withDefaults().withPermutations(9, 1));
        for (int i = 0; i < n; i++) {
            double mean = s1[i] / count[0];
            double var = s2[i] / count[0] - mean * mean;
            LocalMoran.Unit u = r.units().get(i);
            assertEquals(mean, u.expectation(), 1e-12, "unit " + i);
            assertEquals(-w.rowSum(i) / (n - 1), u.expectation(), 1e-15);
            assertEquals(var, u.variance(), 1e-11, "unit " + i);
        }
    }

    @Test
    void conditionalPermutationPValuesMatchExactEnumeration() {
        // Conditional permutation (Anselin 1995): x_i fixed, the other 8 values permuted. For the
        // corner unit 0 (2 neighbours: 8·7 = 56 equally likely ordered draws) and the centre unit 4
        // (4 neighbours: 1,680 draws) the exact p-values and mean are enumerated here; the
        // Monte Carlo pseudo p-values with R = 20,000 must agree within 4 binomial standard errors.
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        int r = 20_000;
        LocalMoran.Result res = LocalMoran.test(w, SKEWED, AutocorrelationOptions.withDefaults().withPermutations(r, 3));
        double mean = 0;
        for (double x : SKEWED) {
            mean += x;
        }
        mean /= 9;
        double m2 = 0;
        for (double x : SKEWED) {
            m2 += (x - mean) * (x - mean);
        }
        m2 /= 9;
        final double m2f = m2;
        for (int unit : new int[] {0, 4}) {
            LocalMoran.Unit u = res.units().get(unit);
            int[] nb = w.neighbours(unit);
            double[] others = new double[8];
            int m = 0;
            for (int j = 0; j < 9; j++) {
                if (j != unit) {
                    others[m++] = SKEWED[j] - mean;
                }
            }
            double zi = SKEWED[unit] - mean;
            double[] acc = new double[4];
            enumerateOrdered(others, nb.length, new int[nb.length], new boolean[8], 0, draw -> {
                double lag = 0;
                for (double d : draw) {
                    lag += d;
                }
                double li = zi / m2f * lag;
                acc[0]++;
                acc[1] += li;
                if (li >= u.statistic() - 1e-12) {
                    acc[2]++;
                }
                if (li <= u.statistic() + 1e-12) {
                    acc[3]++;
                }
            });
            double exactGreater = acc[2] / acc[0], exactLess = acc[3] / acc[0];
            assertEquals(acc[1] / acc[0], u.conditionalExpectation(), 1e-12);
            assertEquals(exactGreater, u.pGreater(), 4 * Math.sqrt(exactGreater * (1 - exactGreater) / r) + 2.0 / r);
            assertEquals(exactLess, u.pLess(), 4 * Math.sqrt(exactLess * (1 - exactLess) / r) + 2.0 / r);
        }
    }

    private static void enumerateOrdered(double[] pool, int k, int[] chosen, boolean[] used, int depth,
            java.util.function.Consumer<double[]> body) {
        if (depth == k) {
            double[] d = new double[k];
            for (int a = 0; a < k; a++) {
                d[a] = pool[chosen[a]];
            }
            body.accept(d);
            return;
        }
        for (int j = 0; j < pool.length; j++) {
            if (!used[j]) {
                used[j] = true;
                chosen[depth] = j;
                enumerateOrdered(pool, k, chosen, used, depth + 1, body);
                used[j] = false;
            }
        }
    }

    @Test
    void resultsAreReproducibleAndIndependentOfThreads() {
        // 600 units: several blocks of units, run in parallel and serially.
        int rows = 20, cols = 30;
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(rows, cols)).rowStandardised();
        Random rnd = new Random(4);
        double[] v = new double[rows * cols];
        for (int i = 0; i < v.length; i++) {
            v[i] = rnd.nextGaussian() + ((i / cols < 5 && i % cols < 5) ? 3 : 0);
        }
        AutocorrelationOptions o = AutocorrelationOptions.withDefaults().withPermutations(999, 123);
        LocalMoran.Result a = LocalMoran.test(w, v, o);
        assertEquals(a, LocalMoran.test(w, v, o));
        assertEquals(a, LocalMoran.test(w, v, o.withParallel(false)));
        // The planted hot spot (top-left 5 x 5 block) is found: its interior units are high-high
        // and significant after FDR control at 5 %.
        LocalMoran.Unit centre = a.units().get(2 * cols + 2);
        assertEquals(LocalMoran.Quadrant.HIGH_HIGH, centre.quadrant());
        assertTrue(centre.adjustedPValue() <= 0.05, "adjusted p " + centre.adjustedPValue());
        assertTrue(a.significant(0.05).contains(centre));
        double[] two = a.units().stream().mapToDouble(LocalMoran.Unit::pTwoSided).toArray();
        double[] adj = a.units().stream().mapToDouble(LocalMoran.Unit::adjustedPValue).toArray();
        assertArrayEquals(BenjaminiHochberg.adjust(two), adj, 0);
    }

    @Test
    void quadrantsFollowTheSignsOfValueAndLag() {
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        // Values 1..9: unit 0 is low among low (lag z1 + z3 = -4), unit 8 high among high.
        LocalMoran.Result r = LocalMoran.test(w, ONE_TO_NINE, AutocorrelationOptions.withDefaults().withPermutations(9, 1));
        assertEquals(LocalMoran.Quadrant.LOW_LOW, r.units().get(0).quadrant());
        assertEquals(-4, r.units().get(0).lag(), 1e-14);
        assertEquals(LocalMoran.Quadrant.HIGH_HIGH, r.units().get(8).quadrant());
        assertEquals(LocalMoran.Quadrant.NONE, r.units().get(4).quadrant());
        // A single high value among lows is high-low; its neighbours are low-high.
        double[] spike = {1, 1, 1, 1, 10, 1, 1, 1, 2};
        LocalMoran.Result s = LocalMoran.test(w, spike, AutocorrelationOptions.withDefaults().withPermutations(9, 1));
        assertEquals(LocalMoran.Quadrant.HIGH_LOW, s.units().get(4).quadrant());
        assertEquals(LocalMoran.Quadrant.LOW_HIGH, s.units().get(1).quadrant());
        assertTrue(s.units().get(4).statistic() < 0);
    }

    @Test
    void benjaminiHochbergByHand() {
        // Benjamini & Hochberg (1995, from memory), computed by hand: p = (0.01, 0.04, 0.03, 0.20),
        // m = 4; sorted m·p/rank = 0.04, 0.06, 0.0533.., 0.20; step-up minima from the top give
        // 0.04, 0.0533.., 0.0533.., 0.20 in the sorted order.
        double[] adj = BenjaminiHochberg.adjust(new double[] {0.01, 0.04, 0.03, 0.20});
        assertArrayEquals(new double[] {0.04, 0.16 / 3, 0.16 / 3, 0.20}, adj, 1e-15);
        assertArrayEquals(new double[] {1.0, 1.0}, BenjaminiHochberg.adjust(new double[] {0.9, 1.0}), 0);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> BenjaminiHochberg.adjust(new double[] {0.1, Double.NaN}));
        assertTrue(e.getMessage().matches("p-value 1 is NaN; p-values must be in \\[0, 1\\]"), e.getMessage());
    }

    @Test
    void islandsExcludedKeepOriginalIndices() {
        int[][] nb = new int[10][];
        nb[0] = new int[0];
        int[][] grid = rookLattice(3, 3);
        for (int i = 0; i < 9; i++) {
            nb[i + 1] = java.util.Arrays.stream(grid[i]).map(j -> j + 1).toArray();
        }
        double[] v = new double[10];
        v[0] = 50;
        System.arraycopy(SKEWED, 0, v, 1, 9);
        SpatialWeights w = SpatialWeights.fromNeighbours(nb);
        AutocorrelationOptions o = AutocorrelationOptions.withDefaults().withPermutations(99, 2);
        assertThrows(IllegalArgumentException.class, () -> LocalMoran.test(w, v, o));
        LocalMoran.Result r = LocalMoran.test(w, v, o.withIslandPolicy(IslandPolicy.EXCLUDE));
        assertEquals(List.of(0), r.excludedUnits());
        assertEquals(9, r.units().size());
        assertEquals(1, r.units().get(0).index());
        double[] direct = LocalMoran.statistics(SpatialWeights.fromNeighbours(grid), SKEWED);
        for (int i = 0; i < 9; i++) {
            assertEquals(direct[i], r.units().get(i).statistic(), 1e-14);
        }
    }
}
