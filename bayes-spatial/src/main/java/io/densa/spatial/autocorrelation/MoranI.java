package io.densa.spatial.autocorrelation;

import io.densa.core.DensitySet;
import io.densa.core.TestResult;
import io.densa.spatial.SpatialWeights;
import io.densa.spatial.internal.Scaling;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * Global Moran's I of a scalar field and of densities, with moments under normality and
 * randomisation and a seeded permutation test.
 *
 * <h2>Scalar field</h2>
 * With z_i = x_i − x̄ and weights W (Moran (1950), Notes on continuous stochastic phenomena,
 * Biometrika 37; moments from Cliff &amp; Ord (1981), Spatial Processes — from memory):
 * <pre>
 *   I = (n / S0) Σ_i Σ_j w_ij z_i z_j / Σ_i z_i²,          E[I] = −1/(n − 1),
 *   Var_N[I] = (n² S1 − n S2 + 3 S0²) / ((n² − 1) S0²) − E[I]²                  (normality),
 *   Var_R[I] = [n((n² − 3n + 3) S1 − n S2 + 3 S0²) − b2((n² − n) S1 − 2n S2 + 6 S0²)]
 *              / ((n − 1)(n − 2)(n − 3) S0²) − E[I]²                             (randomisation),
 * </pre>
 * with b2 = n Σ z_i⁴ / (Σ z_i²)² and S0, S1, S2 of {@link SpatialWeights}. E[I] and Var_R are the
 * exact mean and variance of I over all n! permutations of the values; Var_N assumes
 * independent normal values. The test needs n ≥ 4 units (Var_R divides by (n − 1)(n − 2)(n − 3)).
 *
 * <h2>Densities</h2>
 * The density form is derived here, not taken from a published source: Moran's I with the
 * product z_i z_j of centred values replaced by the B2 inner product of the centred densities.
 * For densities X_1..X_n with ⊕-mean X̄ (inner products computed on coordinates: B2 is
 * Euclidean in the orthonormal coordinates):
 * <pre>
 *   I_B = (n / S0) Σ_i Σ_j w_ij ⟨X_i ⊖ X̄, X_j ⊖ X̄⟩_B / Σ_i ‖X_i ⊖ X̄‖²_B.
 * </pre>
 * For a one-coordinate space (K = 1) this is exactly the scalar Moran's I of the coordinate (the
 * B2 inner product is then the product of the single coordinates; checked in the tests). In
 * general it is the average of the K coordinate-wise Moran's I weighted by the coordinates'
 * variances, and it does not depend on the orthonormal basis chosen. Its permutation
 * expectation is still −1/(n − 1) (whole densities are permuted over the units); its
 * significance is judged by the permutation test.
 *
 * <p>Inputs are not modified; methods are thread-safe.
 */
public final class MoranI {
    private MoranI() {
    }

    /**
     * Moran's I of a scalar field with its tests.
     *
     * @param statistic     I
     * @param units         number of units analysed (n, after excluding islands if asked)
     * @param excludedUnits original indices of the units excluded as islands (empty if none)
     * @param s0            S0 of the weights analysed
     * @param s1            S1 of the weights analysed
     * @param s2            S2 of the weights analysed
     * @param kurtosis      b2 = n Σ z⁴ / (Σ z²)²
     * @param normality     moments and z-test under normality
     * @param randomisation moments and z-test under randomisation
     * @param permutation   permutation test, present when permutations were requested
     */
    public record Result(double statistic, int units, List<Integer> excludedUnits, double s0, double s1, double s2,
            double kurtosis, AutocorrelationMoments normality, AutocorrelationMoments randomisation,
            Optional<AutocorrelationPermutation> permutation) implements GlobalTestResult {
    }

    /**
     * Moran's I of densities with its permutation test.
     *
     * @param statistic     I_B
     * @param units         number of units analysed
     * @param excludedUnits original indices of the units excluded as islands (empty if none)
     * @param expectation   permutation expectation −1/(n − 1)
     * @param permutation   permutation test, present when permutations were requested
     */
    public record DensityResult(double statistic, int units, List<Integer> excludedUnits, double expectation,
            Optional<AutocorrelationPermutation> permutation) implements TestResult {
        /**
         * The two-sided permutation p-value (Moran's I of densities is tested by permutation only).
         *
         * @throws IllegalStateException if no permutations were requested
         */
        @Override
        public double pValue() {
            return permutation.orElseThrow(() -> new IllegalStateException("Moran's I of densities has a p-value"
                    + " only from a permutation test; request one with AutocorrelationOptions.withPermutations"))
                    .pTwoSided();
        }

        @Override
        public String method() {
            return permutation.isPresent() ? AutocorrelationSupport.method(permutation)
                    : "none (no permutations requested)";
        }
    }

    /**
     * Moran's I alone (islands are an error).
     *
     * @param weights spatial weights of n ≥ 2 units
     * @param values  n finite, not all equal values (not modified)
     * @throws IllegalArgumentException on a size mismatch, a non-finite value (naming the unit),
     *                                  a constant field or islands
     */
    public static double statistic(SpatialWeights weights, double[] values) {
        AutocorrelationSupport.ScalarField f = AutocorrelationSupport.scalarField(weights, values,
                IslandPolicy.ERROR, 2, "Moran's I");
        return statistic(f.weights(), f.z(), f.sumSq());
    }

    /** {@link #test(SpatialWeights, double[], AutocorrelationOptions)} with default options. */
    public static Result test(SpatialWeights weights, double[] values) {
        return test(weights, values, AutocorrelationOptions.withDefaults());
    }

    /**
     * Moran's I with moments under normality and randomisation and, if requested, a
     * permutation test.
     *
     * @param weights spatial weights
     * @param values  one finite value per unit (not modified); not all equal
     * @param options permutations, seed, island policy, parallelism
     * @throws IllegalArgumentException on a size mismatch, a non-finite value (naming the unit),
     *                                  a constant field, islands under the ERROR policy, or fewer
     *                                  than 4 units
     * @throws io.densa.core.DensaException if a null variance is not positive (degenerate
     *                                      weights such as every pair linked equally)
     */
    public static Result test(SpatialWeights weights, double[] values, AutocorrelationOptions options) {
        AutocorrelationSupport.GlobalTest t = AutocorrelationSupport.globalTest(weights, values, options, "Moran's I",
                f -> {
            SpatialWeights w = f.weights();
            double[] z = f.z();
            double m2 = f.sumSq();
            double stat = statistic(w, z, m2);
            int n = f.size();
            double s0 = w.s0(), s1 = w.s1(), s2 = w.s2(); // of the normalised weights (scale-free formulas)
            double b2 = f.kurtosis();
            double nn = n;
            double e = -1.0 / (nn - 1);
            double s02 = s0 * s0;
            double varN = (nn * nn * s1 - nn * s2 + 3 * s02) / ((nn * nn - 1) * s02) - e * e;
            double varR = (nn * ((nn * nn - 3 * nn + 3) * s1 - nn * s2 + 3 * s02)
                    - b2 * ((nn * nn - nn) * s1 - 2 * nn * s2 + 6 * s02))
                    / ((nn - 1) * (nn - 2) * (nn - 3) * s02) - e * e;
            int[] rs = w.rowStarts();
            int[] cs = w.columnIndices();
            double[] vs = w.linkWeights();
            double scale = n / (s0 * m2);
            return new AutocorrelationSupport.GlobalStatistic(stat, e, varN, varR, pi -> {
                double s = 0;
                for (int i = 0; i < n; i++) {
                    double lag = 0;
                    for (int q = rs[i]; q < rs[i + 1]; q++) {
                        lag += vs[q] * z[pi[cs[q]]];
                    }
                    s += z[pi[i]] * lag;
                }
                return scale * s;
            });
        });
        AutocorrelationSupport.ScalarField f = t.field();
        SpatialWeights ow = f.original();
        return new Result(t.statistic(), f.size(), f.excluded(), ow.s0(), ow.s1(), ow.s2(), f.kurtosis(),
                t.normality(), t.randomisation(), t.permutation());
    }

    /** (n/S0) Σ w_ij z_i z_j / Σ z². */
    static double statistic(SpatialWeights w, double[] z, double sumSq) {
        int[] rs = w.rowStarts();
        int[] cs = w.columnIndices();
        double[] vs = w.linkWeights();
        double s = 0;
        for (int i = 0; i < z.length; i++) {
            double lag = 0;
            for (int q = rs[i]; q < rs[i + 1]; q++) {
                lag += vs[q] * z[cs[q]];
            }
            s += z[i] * lag;
        }
        return z.length / w.s0() * s / sumSq;
    }

    // ------------------------------------------------------------------ densities

    /**
     * Moran's I of densities alone (islands are an error).
     *
     * @param weights   spatial weights of n units
     * @param densities n densities, one per unit, not all equal
     * @throws IllegalArgumentException on a size mismatch, islands, or all densities equal
     */
    public static double statistic(SpatialWeights weights, DensitySet densities) {
        Objects.requireNonNull(densities, "densities");
        checkSize(weights, densities);
        AutocorrelationSupport.prepare(weights, IslandPolicy.ERROR, 2, "Moran's I of densities");
        int k = densities.dimension();
        double[] z = centredRows(densities.coordinatesRowMajor(), densities.size(), k);
        return densityStatistic(weights.rowStarts(), weights.columnIndices(), weights.linkWeights(), weights.s0(), z,
                k, AutocorrelationSupport.identity(densities.size()));
    }

    /**
     * Moran's I of densities with, if requested, a permutation test in which whole densities are
     * permuted over the units.
     *
     * @param weights   spatial weights of n units
     * @param densities n densities, one per unit, not all equal
     * @param options   permutations, seed, island policy, parallelism
     * @throws IllegalArgumentException on a size mismatch, islands under the ERROR policy, fewer
     *                                  than 3 units, or all densities equal
     */
    public static DensityResult test(SpatialWeights weights, DensitySet densities, AutocorrelationOptions options) {
        Objects.requireNonNull(densities, "densities");
        Objects.requireNonNull(options, "options");
        checkSize(weights, densities);
        AutocorrelationSupport.Prepared p = AutocorrelationSupport.prepare(weights, options.islandPolicy(), 3,
                "Moran's I of densities");
        SpatialWeights w = p.weights();
        DensitySet d = p.excluded().isEmpty() ? densities : densities.subset(p.kept());
        int n = d.size(), k = d.dimension();
        double[] z = centredRows(d.coordinatesRowMajor(), n, k);
        int[] rs = w.rowStarts();
        int[] cs = w.columnIndices();
        double[] vs = w.linkWeights();
        double s0 = w.s0();
        double stat = densityStatistic(rs, cs, vs, s0, z, k, AutocorrelationSupport.identity(n));
        double e = -1.0 / (n - 1);
        Optional<AutocorrelationPermutation> perm = Optional.empty();
        if (options.permutations() > 0) {
            double[] sims = AutocorrelationSupport.simulate(n, options, (w.linkCount() + 2L * n) * k,
                    "Moran's I of densities", pi -> densityStatistic(rs, cs, vs, s0, z, k, pi));
            perm = Optional.of(AutocorrelationSupport.summarise(stat, e, sims, options.seed()));
        }
        return new DensityResult(stat, n, p.excluded(), e, perm);
    }

    private static void checkSize(SpatialWeights weights, DensitySet densities) {
        Objects.requireNonNull(weights, "weights");
        if (densities.size() != weights.size()) {
            throw new IllegalArgumentException("the density set has " + densities.size()
                    + " densities but the weights have " + weights.size() + " units; give one density per unit");
        }
    }

    /**
     * Row-major coordinates minus their column means, divided by the power of two of the largest
     * |coordinate| (exact; I_B does not depend on a common scale), so that coordinates near 1e300
     * or 1e-300 neither overflow nor underflow; fails if every density is the same.
     */
    private static double[] centredRows(double[] c, int n, int k) {
        double inv = 1 / Scaling.powerOfTwoScale(c);
        double[] mean = new double[k];
        double scale = 0;
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                double v = c[i * k + j] * inv;
                mean[j] += v;
                scale = Math.max(scale, Math.abs(v));
            }
        }
        for (int j = 0; j < k; j++) {
            mean[j] /= n;
        }
        double[] z = new double[n * k];
        double ss = 0;
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                double v = c[i * k + j] * inv - mean[j];
                z[i * k + j] = v;
                ss += v * v;
            }
        }
        if (!(ss > (double) n * k * Math.pow(1e-13 * scale, 2))) {
            throw new IllegalArgumentException("all densities are equal (zero B2 variance); Moran's I of densities"
                    + " is undefined");
        }
        return z;
    }

    /** I_B with unit i holding centred row pi[i], the weights in compressed-row form (rs, cs, vs), S0 = s0. */
    private static double densityStatistic(int[] rs, int[] cs, double[] vs, double s0, double[] z, int k, int[] pi) {
        int n = rs.length - 1;
        double num = 0, den = 0;
        for (int i = 0; i < n; i++) {
            int oi = pi[i] * k;
            for (int q = rs[i]; q < rs[i + 1]; q++) {
                int oj = pi[cs[q]] * k;
                double dot = 0;
                for (int t = 0; t < k; t++) {
                    dot += z[oi + t] * z[oj + t];
                }
                num += vs[q] * dot;
            }
            for (int t = 0; t < k; t++) {
                den += z[oi + t] * z[oi + t];
            }
        }
        return n / s0 * num / den;
    }
}
