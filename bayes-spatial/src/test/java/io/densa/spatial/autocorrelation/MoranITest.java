package io.densa.spatial.autocorrelation;

import static io.densa.spatial.Lattices.dense;
import static io.densa.spatial.Lattices.rookLattice;
import static io.densa.spatial.autocorrelation.AutocorrelationTestSupport.forEachPermutation;
import static io.densa.spatial.autocorrelation.AutocorrelationTestSupport.moranDense;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

class MoranITest {
    private static final double[] ONE_TO_NINE = {1, 2, 3, 4, 5, 6, 7, 8, 9};

    @Test
    void workedExampleOnTheRookGrid() {
        // Moran (1950), Notes on continuous stochastic phenomena, Biometrika 37; moments from Cliff &
        // Ord (1981), Spatial Processes (from memory). 3 x 3 rook grid, binary weights, values 1..9
        // row-wise, computed by hand: deviations z = −4..4, Σz² = 60; the 12 rook edges give
        // Σ z_i z_j = 18 + 0 + 18 (rows) + 2 + 0 + 2 (columns) = 40, so Σ_ij w_ij z_i z_j = 80 and
        // I = (n / S0) · 80 / 60 = (9/24)(4/3) = 0.5 with S0 = 24, S1 = 48, S2 = 272 (see
        // SpatialWeightsTest); b2 = n Σz⁴ / (Σz²)² = 9 · 708 / 3600 = 1.77;
        // Var_N = (n²S1 − nS2 + 3S0²) / ((n² − 1) S0²) − E[I]² = 3168 / 46080 − 1/64 = 0.053125;
        // Var_R = 0.0596875 from the randomisation formula; the enumeration of all 9! arrangements
        // in this class confirms E[I] and Var_R.
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        MoranI.Result r = MoranI.test(w, ONE_TO_NINE);
        assertEquals(0.5, r.statistic(), 1e-14);
        assertEquals(24, r.s0(), 0);
        assertEquals(48, r.s1(), 0);
        assertEquals(272, r.s2(), 0);
        assertEquals(1.77, r.kurtosis(), 1e-14);
        assertEquals(-0.125, r.normality().expectation(), 1e-15);
        assertEquals(-0.125, r.randomisation().expectation(), 1e-15);
        assertEquals(0.053125, r.normality().variance(), 1e-14);
        assertEquals(0.0596875, r.randomisation().variance(), 1e-14);
        double z = (0.5 + 0.125) / Math.sqrt(0.0596875);
        assertEquals(z, r.randomisation().z(), 1e-12);
        // p-values against the normal distribution of Commons Math (general-purpose library).
        org.apache.commons.math3.distribution.NormalDistribution nd =
                new org.apache.commons.math3.distribution.NormalDistribution();
        assertEquals(1 - nd.cumulativeProbability(z), r.randomisation().pGreater(), 1e-12);
        assertEquals(nd.cumulativeProbability(z), r.randomisation().pLess(), 1e-12);
        assertEquals(2 * (1 - nd.cumulativeProbability(z)), r.randomisation().pTwoSided(), 1e-12);
        assertTrue(r.permutation().isEmpty());
        assertEquals(List.of(), r.excludedUnits());
    }

    @Test
    void allNineFactorialPermutationsGiveTheRandomisationMoments() {
        // Exact check of E[I] = -1/(n-1) and Var_R (Cliff & Ord 1981, from memory): enumerate all
        // 9! = 362,880 arrangements of 1..9 on the rook grid and compute I from its definition.
        double[][] w = dense(rookLattice(3, 3));
        double[] sum = new double[3];
        double[] x = ONE_TO_NINE.clone();
        forEachPermutation(x, p -> {
            double i = moranDense(w, p);
            sum[0] += 1;
            sum[1] += i;
            sum[2] += i * i;
        });
        assertEquals(362_880, sum[0], 0);
        double mean = sum[1] / sum[0];
        double var = sum[2] / sum[0] - mean * mean;
        MoranI.Result r = MoranI.test(SpatialWeights.fromNeighbours(rookLattice(3, 3)), ONE_TO_NINE);
        assertEquals(r.randomisation().expectation(), mean, 1e-12);
        assertEquals(-1.0 / 8, mean, 1e-12);
        assertEquals(r.randomisation().variance(), var, 1e-12);
        assertEquals(0.0596875, var, 1e-12);
    }

    @Test
    void permutationPValueMatchesTheExactPermutationDistribution() {
        // Exact one-sided permutation p-value by enumeration, against the Monte Carlo pseudo
        // p-value with R = 20,000 (tolerance 4 binomial standard errors).
        double[][] w = dense(rookLattice(3, 3));
        double obs = moranDense(w, ONE_TO_NINE);
        long[] count = new long[2];
        forEachPermutation(ONE_TO_NINE.clone(), p -> {
            count[0]++;
            if (moranDense(w, p) >= obs - 1e-12) {
                count[1]++;
            }
        });
        double exact = (double) count[1] / count[0];
        int r = 20_000;
        AutocorrelationPermutation perm = MoranI.test(SpatialWeights.fromNeighbours(rookLattice(3, 3)), ONE_TO_NINE,
                AutocorrelationOptions.withDefaults().withPermutations(r, 11)).permutation().orElseThrow();
        assertEquals(exact, perm.pGreater(), 4 * Math.sqrt(exact * (1 - exact) / r) + 1.0 / r);
        assertEquals(-0.125, perm.mean(), 4 * Math.sqrt(0.0596875 / r));
    }

    @Test
    void normalityVarianceMatchesSimulationOfIndependentNormals() {
        // Var_N is the variance of I for independent normal values (Cliff & Ord 1981, from
        // memory): 200,000 seeded draws of 9 iid N(0,1) values on the rook grid; the relative
        // standard error of a sample variance is about sqrt(2/N) = 0.3 %, tolerance 2 %.
        double[][] w = dense(rookLattice(3, 3));
        int draws = 200_000;
        double[] mv = AutocorrelationTestSupport.normalSimulation(9, draws, 5, x -> moranDense(w, x));
        double mean = mv[0], var = mv[1];
        assertEquals(-0.125, mean, 4 * Math.sqrt(0.053125 / draws));
        assertEquals(0.053125, var, 0.02 * 0.053125);
    }

    @Test
    void momentsAgreeWithThePermutationDistributionOnASimulatedCase() {
        // Simulated case (seeded): 80 random points, 5 nearest neighbours (union), skewed
        // (lognormal) values so that b2 is far from 3 and Var_R differs from Var_N. With
        // R = 20,000 permutations, the permutation mean must be within 4 standard errors of
        // E[I] = -1/(n-1) and the permutation variance within 4 % of Var_R (a sample variance has
        // relative standard error about sqrt(2/R) = 1 %).
        Random rnd = new Random(42);
        int n = 80;
        double[][] xy = new double[n][2];
        double[] values = new double[n];
        for (int i = 0; i < n; i++) {
            xy[i][0] = rnd.nextDouble();
            xy[i][1] = rnd.nextDouble();
            values[i] = Math.exp(1.2 * rnd.nextGaussian()) + 2 * xy[i][0];
        }
        SpatialWeights w = SpatialWeights.nearestNeighbours(Locations.planar(xy), 5, SpatialWeights.Symmetry.UNION);
        int r = 20_000;
        MoranI.Result res = MoranI.test(w, values, AutocorrelationOptions.withDefaults().withPermutations(r, 2024));
        AutocorrelationPermutation p = res.permutation().orElseThrow();
        double varR = res.randomisation().variance();
        double varN = res.normality().variance();
        assertTrue(res.kurtosis() > 5, "b2 = " + res.kurtosis());
        assertTrue(Math.abs(varR - varN) > 0.08 * varR, "Var_R and Var_N too close to discriminate");
        assertEquals(-1.0 / (n - 1), p.mean(), 4 * Math.sqrt(varR / r));
        assertEquals(varR, p.variance(), 0.04 * varR);
        assertEquals(r, p.permutations());
        assertEquals(2024, p.seed());
        // Statistic against the definition on the dense matrix.
        assertEquals(moranDense(w.toMatrix(), values), res.statistic(), 1e-13);
    }

    @Test
    void permutationTestIsReproducibleAndIdenticalInParallelAndSerial() {
        int side = 20;
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(side, side)).rowStandardised();
        Random rnd = new Random(3);
        double[] v = new double[side * side];
        for (int i = 0; i < v.length; i++) {
            v[i] = rnd.nextGaussian() + 0.1 * (i % side);
        }
        AutocorrelationOptions o = AutocorrelationOptions.withDefaults().withPermutations(999, 77);
        MoranI.Result a = MoranI.test(w, v, o);
        MoranI.Result b = MoranI.test(w, v, o);
        MoranI.Result serial = MoranI.test(w, v, o.withParallel(false));
        assertEquals(a, b);
        assertEquals(a, serial);
        MoranI.Result other = MoranI.test(w, v, AutocorrelationOptions.withDefaults().withPermutations(999, 78));
        assertNotEquals(a.permutation().orElseThrow().mean(), other.permutation().orElseThrow().mean());
    }

    @Test
    void densityMoranWithOneCoordinateIsScalarMoran() {
        // Definition (this class's javadoc): for K = 1 the B2 inner product is the product of the
        // single coordinates, so I_B is Moran's I of that coordinate.
        BayesSpace space = BayesSpace.polynomials(0, 1, 1);
        assertEquals(1, space.dimension());
        Random rnd = new Random(8);
        int n = 49;
        double[][] c = new double[n][1];
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            v[i] = rnd.nextGaussian() + (i / 7) * 0.3;
            c[i][0] = v[i];
        }
        DensitySet d = DensitySet.of(space, c);
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(7, 7));
        assertEquals(MoranI.statistic(w, v), MoranI.statistic(w, d), 1e-14);
        AutocorrelationOptions o = AutocorrelationOptions.withDefaults().withPermutations(499, 5);
        MoranI.DensityResult dr = MoranI.test(w, d, o);
        MoranI.Result sr = MoranI.test(w, v, o);
        assertEquals(sr.statistic(), dr.statistic(), 1e-14);
        assertEquals(-1.0 / (n - 1), dr.expectation(), 0);
        // Same seed, same permutations: the same pseudo p-values (continuous values, no ties).
        assertEquals(sr.permutation().orElseThrow().pGreater(), dr.permutation().orElseThrow().pGreater(), 0);
        assertEquals(sr.permutation().orElseThrow().pTwoSided(), dr.permutation().orElseThrow().pTwoSided(), 0);
        assertEquals(sr.permutation().orElseThrow().mean(), dr.permutation().orElseThrow().mean(), 1e-13);
    }

    @Test
    void densityMoranIsTheVarianceWeightedMeanOfCoordinateMoransAndBasisFree() {
        // Algebra of the definition: Σ_k (Σ w z_ik z_jk) / Σ_k Σ z_ik²; an orthogonal change of
        // coordinates (another orthonormal basis) leaves inner products, hence I_B, unchanged.
        BayesSpace space = BayesSpace.polynomials(0, 1, 2);
        Random rnd = new Random(9);
        int n = 36;
        double[][] c = new double[n][2];
        double[][] rot = new double[n][2];
        double cos = Math.cos(0.7), sin = Math.sin(0.7);
        for (int i = 0; i < n; i++) {
            c[i][0] = rnd.nextGaussian() + 0.2 * (i % 6);
            c[i][1] = 0.5 * rnd.nextGaussian() - 0.1 * (i / 6);
            rot[i][0] = cos * c[i][0] - sin * c[i][1];
            rot[i][1] = sin * c[i][0] + cos * c[i][1];
        }
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(6, 6));
        double ib = MoranI.statistic(w, DensitySet.of(space, c));
        double[] a = new double[n], b = new double[n];
        for (int i = 0; i < n; i++) {
            a[i] = c[i][0];
            b[i] = c[i][1];
        }
        double va = variance(a), vb = variance(b);
        double expected = (va * MoranI.statistic(w, a) + vb * MoranI.statistic(w, b)) / (va + vb);
        assertEquals(expected, ib, 1e-13);
        assertEquals(ib, MoranI.statistic(w, DensitySet.of(space, rot)), 1e-13);
    }

    @Test
    void islandsAreAnErrorByDefaultAndCanBeExcluded() {
        int[][] nb = new int[10][];
        System.arraycopy(rookLattice(3, 3), 0, nb, 0, 9);
        nb[9] = new int[0];
        SpatialWeights w = SpatialWeights.fromNeighbours(nb);
        double[] v = {1, 2, 3, 4, 5, 6, 7, 8, 9, 100};
        IllegalArgumentException e = org.junit.jupiter.api.Assertions.assertThrows(IllegalArgumentException.class,
                () -> MoranI.test(w, v));
        assertTrue(e.getMessage().matches("unit 9 has no neighbours \\(island\\).*EXCLUDE.*"), e.getMessage());
        MoranI.Result r = MoranI.test(w, v,
                AutocorrelationOptions.withDefaults().withIslandPolicy(IslandPolicy.EXCLUDE));
        assertEquals(List.of(9), r.excludedUnits());
        assertEquals(9, r.units());
        assertEquals(0.5, r.statistic(), 1e-14);
        assertEquals(0.0596875, r.randomisation().variance(), 1e-14);
    }

    private static double variance(double[] x) {
        double m = 0;
        for (double v : x) {
            m += v;
        }
        m /= x.length;
        double s = 0;
        for (double v : x) {
            s += (v - m) * (v - m);
        }
        return s;
    }
}
