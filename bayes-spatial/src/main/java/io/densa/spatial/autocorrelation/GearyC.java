package io.densa.spatial.autocorrelation;

import io.densa.spatial.SpatialWeights;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * Geary's contiguity ratio c of a scalar field, with moments under normality and randomisation
 * and a seeded permutation test.
 *
 * <p>Geary (1954), The contiguity ratio and statistical mapping, The Incorporated Statistician 5
 * (from memory); moments from Cliff &amp; Ord (1981), Spatial Processes (from memory). With
 * z_i = x_i − x̄ and b2 = n Σ z⁴ / (Σ z²)²:
 * <pre>
 *   c = (n − 1) Σ_i Σ_j w_ij (x_i − x_j)² / (2 S0 Σ_i z_i²),        E[c] = 1,
 *   Var_N[c] = [(2 S1 + S2)(n − 1) − 4 S0²] / (2 (n + 1) S0²),
 *   Var_R[c] = [(n − 1) S1 (n² − 3n + 3 − (n − 1) b2)
 *               − ¼ (n − 1) S2 (n² + 3n − 6 − (n² − n + 2) b2)
 *               + S0² (n² − 3 − (n − 1)² b2)] / (n (n − 2)(n − 3) S0²).
 * </pre>
 * c &lt; 1 indicates positive spatial autocorrelation (neighbours alike), c &gt; 1 negative, so
 * {@link AutocorrelationMoments#pLess()} and {@link AutocorrelationPermutation#pLess()} are the
 * one-sided p-values for positive autocorrelation. The test needs n ≥ 4 units.
 *
 * <p>Inputs are not modified; methods are thread-safe.
 */
public final class GearyC {
    private GearyC() {
    }

    /**
     * Geary's c with its tests.
     *
     * @param statistic     c
     * @param units         number of units analysed
     * @param excludedUnits original indices of the units excluded as islands (empty if none)
     * @param kurtosis      b2
     * @param normality     moments and z-test under normality
     * @param randomisation moments and z-test under randomisation
     * @param permutation   permutation test, present when permutations were requested
     */
    public record Result(double statistic, int units, List<Integer> excludedUnits, double kurtosis,
            AutocorrelationMoments normality, AutocorrelationMoments randomisation,
            Optional<AutocorrelationPermutation> permutation) implements GlobalTestResult {
    }

    /**
     * Geary's c alone (islands are an error).
     *
     * @throws IllegalArgumentException on a size mismatch, a non-finite value (naming the unit),
     *                                  a constant field or islands
     */
    public static double statistic(SpatialWeights weights, double[] values) {
        AutocorrelationSupport.ScalarField f = AutocorrelationSupport.scalarField(weights, values,
                IslandPolicy.ERROR, 2, "Geary's c");
        int n = f.size();
        SpatialWeights w = f.weights();
        return (n - 1) * squaredDifferences(w.rowStarts(), w.columnIndices(), w.linkWeights(), f.z(),
                AutocorrelationSupport.identity(n))
                / (2 * f.weights().s0() * f.sumSq());
    }

    /** {@link #test(SpatialWeights, double[], AutocorrelationOptions)} with default options. */
    public static Result test(SpatialWeights weights, double[] values) {
        return test(weights, values, AutocorrelationOptions.withDefaults());
    }

    /**
     * Geary's c with moments under normality and randomisation and, if requested, a
     * permutation test.
     *
     * @throws IllegalArgumentException on a size mismatch, a non-finite value (naming the unit),
     *                                  a constant field, islands under the ERROR policy, or fewer
     *                                  than 4 units
     * @throws io.densa.core.DensaException if a null variance is not positive
     */
    public static Result test(SpatialWeights weights, double[] values, AutocorrelationOptions options) {
        AutocorrelationSupport.GlobalTest t = AutocorrelationSupport.globalTest(weights, values, options, "Geary's c",
                f -> {
            SpatialWeights w = f.weights();
            double[] z = f.z();
            int n = f.size();
            double nn = n;
            double m2 = f.sumSq();
            double b2 = f.kurtosis();
            double s0 = w.s0(), s1 = w.s1(), s2 = w.s2();
            double scale = (nn - 1) / (2 * s0 * m2);
            int[] rs = w.rowStarts();
            int[] cs = w.columnIndices();
            double[] vs = w.linkWeights();
            double stat = scale * squaredDifferences(rs, cs, vs, z, AutocorrelationSupport.identity(n));
            double s02 = s0 * s0;
            double varN = ((2 * s1 + s2) * (nn - 1) - 4 * s02) / (2 * (nn + 1) * s02);
            double varR = ((nn - 1) * s1 * (nn * nn - 3 * nn + 3 - (nn - 1) * b2)
                    - 0.25 * (nn - 1) * s2 * (nn * nn + 3 * nn - 6 - (nn * nn - nn + 2) * b2)
                    + s02 * (nn * nn - 3 - (nn - 1) * (nn - 1) * b2))
                    / (nn * (nn - 2) * (nn - 3) * s02);
            return new AutocorrelationSupport.GlobalStatistic(stat, 1.0, varN, varR,
                    pi -> scale * squaredDifferences(rs, cs, vs, z, pi));
        });
        AutocorrelationSupport.ScalarField f = t.field();
        return new Result(t.statistic(), f.size(), f.excluded(), f.kurtosis(), t.normality(), t.randomisation(),
                t.permutation());
    }

    /** Σ_i Σ_j w_ij (z_pi[i] − z_pi[j])², the weights in compressed-row form (rs, cs, vs). */
    private static double squaredDifferences(int[] rs, int[] cs, double[] vs, double[] z, int[] pi) {
        double s = 0;
        for (int i = 0; i < z.length; i++) {
            double zi = z[pi[i]];
            for (int q = rs[i]; q < rs[i + 1]; q++) {
                double d = zi - z[pi[cs[q]]];
                s += vs[q] * d * d;
            }
        }
        return s;
    }
}
