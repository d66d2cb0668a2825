package io.densa.spatial.autocorrelation;

import static io.densa.spatial.Lattices.dense;
import static io.densa.spatial.Lattices.rookLattice;
import static io.densa.spatial.autocorrelation.AutocorrelationTestSupport.forEachPermutation;
import static io.densa.spatial.autocorrelation.AutocorrelationTestSupport.gearyDense;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.spatial.SpatialWeights;
import java.util.Random;
import org.junit.jupiter.api.Test;

class GearyCTest {
    private static final double[] ONE_TO_NINE = {1, 2, 3, 4, 5, 6, 7, 8, 9};

    @Test
    void valueOnTheRookGridByHand() {
        // By hand from Geary (1954): the 6 horizontal rook pairs differ by 1, the 6 vertical by 3,
        // so Σ_ij w_ij (x_i - x_j)² = 2 (6·1 + 6·9) = 120, Σ z² = 60, S0 = 24:
        // c = 8 · 120 / (2 · 24 · 60) = 1/3.
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(3, 3));
        assertEquals(1.0 / 3, GearyC.statistic(w, ONE_TO_NINE), 1e-14);
        GearyC.Result r = GearyC.test(w, ONE_TO_NINE);
        assertEquals(1.0 / 3, r.statistic(), 1e-14);
        assertEquals(1.0, r.normality().expectation(), 0);
        assertEquals(1.0, r.randomisation().expectation(), 0);
        assertEquals(1.77, r.kurtosis(), 1e-14);
        assertTrue(r.randomisation().pLess() < 0.05, "strong positive autocorrelation: small c");
    }

    @Test
    void allNineFactorialPermutationsGiveTheRandomisationMoments() {
        // E[c] = 1 and Var_R of Cliff & Ord (1981, from memory), checked exactly by enumerating
        // all 9! arrangements of 1..9 on the rook grid and computing c from its definition.
        double[][] w = dense(rookLattice(3, 3));
        double[] sum = new double[3];
        forEachPermutation(ONE_TO_NINE.clone(), p -> {
            double c = gearyDense(w, p);
            sum[0] += 1;
            sum[1] += c;
            sum[2] += c * c;
        });
        double mean = sum[1] / sum[0];
        double var = sum[2] / sum[0] - mean * mean;
        GearyC.Result r = GearyC.test(SpatialWeights.fromNeighbours(rookLattice(3, 3)), ONE_TO_NINE);
        assertEquals(1.0, mean, 1e-12);
        assertEquals(var, r.randomisation().variance(), 1e-12);
    }

    @Test
    void randomisationVarianceMatchesEnumerationWithSkewedValuesAndWeights() {
        // A second exact check with unequal weights (asymmetric, row-standardised) and skewed
        // values, so that every term of Var_R (S1, S2, b2) matters: all 8! arrangements.
        int[][] nb = rookLattice(2, 4);
        SpatialWeights w = SpatialWeights.fromNeighbours(nb).rowStandardised();
        double[][] wd = w.toMatrix();
        double[] x = {0.1, 0.5, 0.2, 7.0, 1.1, 0.3, 2.5, 0.05};
        double[] sum = new double[3];
        double[] sumI = new double[3];
        forEachPermutation(x.clone(), p -> {
            double c = gearyDense(wd, p);
            double i = AutocorrelationTestSupport.moranDense(wd, p);
            sum[0] += 1;
            sum[1] += c;
            sum[2] += c * c;
            sumI[1] += i;
            sumI[2] += i * i;
        });
        double mean = sum[1] / sum[0], var = sum[2] / sum[0] - mean * mean;
        double meanI = sumI[1] / sum[0], varI = sumI[2] / sum[0] - meanI * meanI;
        GearyC.Result g = GearyC.test(w, x);
        MoranI.Result m = MoranI.test(w, x);
        assertEquals(1.0, mean, 1e-12);
        assertEquals(var, g.randomisation().variance(), 1e-12);
        assertEquals(-1.0 / 7, meanI, 1e-12);
        assertEquals(varI, m.randomisation().variance(), 1e-12);
    }

    @Test
    void normalityVarianceMatchesSimulationOfIndependentNormals() {
        // Var_N (Cliff & Ord 1981, from memory) against 200,000 seeded draws of 9 iid N(0,1)
        // values on the rook grid; tolerance 2 % (sample-variance standard error ~ 0.3-0.5 %).
        double[][] w = dense(rookLattice(3, 3));
        GearyC.Result r = GearyC.test(SpatialWeights.fromNeighbours(rookLattice(3, 3)), ONE_TO_NINE);
        double varN = r.normality().variance();
        // By hand: ((2·48 + 272)·8 − 4·576) / (2·10·576) = 640 / 11520.
        assertEquals(640.0 / 11520, varN, 1e-15);
        int draws = 200_000;
        double[] mv = AutocorrelationTestSupport.normalSimulation(9, draws, 6, x -> gearyDense(w, x));
        double mean = mv[0], var = mv[1];
        assertEquals(1.0, mean, 4 * Math.sqrt(varN / draws));
        assertEquals(varN, var, 0.02 * varN);
    }

    @Test
    void permutationTestReproducibleAndThreadIndependent() {
        SpatialWeights w = SpatialWeights.fromNeighbours(rookLattice(15, 15));
        Random rnd = new Random(12);
        double[] v = new double[225];
        for (int i = 0; i < v.length; i++) {
            v[i] = rnd.nextGaussian() + 0.05 * (i / 15);
        }
        AutocorrelationOptions o = AutocorrelationOptions.withDefaults().withPermutations(2000, 99);
        GearyC.Result a = GearyC.test(w, v, o);
        assertEquals(a, GearyC.test(w, v, o));
        assertEquals(a, GearyC.test(w, v, o.withParallel(false)));
        AutocorrelationPermutation p = a.permutation().orElseThrow();
        // Permutation mean is E[c] = 1 within 4 standard errors.
        assertEquals(1.0, p.mean(), 4 * Math.sqrt(a.randomisation().variance() / 2000));
    }
}
