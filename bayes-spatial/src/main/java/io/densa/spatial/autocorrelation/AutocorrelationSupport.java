package io.densa.spatial.autocorrelation;

import io.densa.core.DensaException;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.ProgressCounter;
import io.densa.core.internal.Seeds;
import io.densa.spatial.SpatialWeights;
import io.densa.spatial.internal.Scaling;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.SplittableRandom;
import java.util.stream.Collectors;
import java.util.stream.IntStream;
import org.apache.commons.math3.special.Erf;

/**
 * Shared machinery of the autocorrelation statistics: input checks, island handling, the seeded
 * blocked permutation engine and p-values. Package-private.
 */
final class AutocorrelationSupport {
    /** Permutations per block; each block has its own generator, so results ignore threads. */
    static final int PERMUTATION_BLOCK = 64;

    private AutocorrelationSupport() {
    }

    /**
     * Weights after the island policy: kept[a] = original index of unit a; {@code weights} are
     * {@code original} normalised for the global statistics
     * ({@link SpatialWeights#normalisedForStatistics}), which do not depend on a common factor.
     */
    record Prepared(SpatialWeights weights, int[] kept, List<Integer> excluded, SpatialWeights original) {
    }

    /**
     * A scalar field ready for a statistic: weights after the island policy, deviations z from
     * the mean of the kept values in units of {@code scale} (a power of two: the deviations in the
     * values' own units are z · scale), Σ z², the kurtosis b2 and the excluded units. Every
     * statistic built on z (Moran's I, Geary's c, local Moran's I) is invariant to that scale.
     */
    record ScalarField(SpatialWeights weights, int[] kept, double[] z, double scale, double sumSq, double kurtosis,
            List<Integer> excluded, SpatialWeights original) {
        int size() {
            return z.length;
        }
    }

    /** Checks the values, applies the island policy and centres the kept values. */
    static ScalarField scalarField(SpatialWeights w, double[] values, IslandPolicy policy,
            int minUnits, String what) {
        checkValues(values, w);
        Prepared p = prepare(w, policy, minUnits, what);
        double[] x = select(values, p.kept());
        double scale = Scaling.powerOfTwoScale(x);
        double[] z = centre(x, scale, what);
        return new ScalarField(p.weights(), p.kept(), z, scale, sumSq(z), kurtosis(z), p.excluded(), p.original());
    }

    /**
     * A global statistic of a scalar field with its exact null expectation and its variances under
     * normality and randomisation, and the statistic of permuted values for the permutation test.
     */
    record GlobalStatistic(double value, double expectation, double varianceNormality,
            double varianceRandomisation, PermutedStatistic permuted) {
    }

    /** A global test: the field analysed, the statistic, its moments under both nulls and the permutation test. */
    record GlobalTest(ScalarField field, double statistic, AutocorrelationMoments normality,
            AutocorrelationMoments randomisation, Optional<AutocorrelationPermutation> permutation) {
    }

    /**
     * The test of a global statistic (Moran's I, Geary's c): the field after the island policy (at
     * least 4 units), the statistic and its moments from {@code statistic}, the normal-approximation
     * tests under normality and randomisation, and the permutation test if the options ask for one.
     */
    static GlobalTest globalTest(SpatialWeights weights, double[] values, AutocorrelationOptions options,
            String name, java.util.function.Function<ScalarField, GlobalStatistic> statistic) {
        Objects.requireNonNull(options, "options");
        ScalarField f = scalarField(weights, values, options.islandPolicy(), 4, "the " + name + " test");
        GlobalStatistic s = statistic.apply(f);
        AutocorrelationMoments normal = moments(s.value(), s.expectation(), s.varianceNormality(), name, "normality",
                f.size());
        AutocorrelationMoments random = moments(s.value(), s.expectation(), s.varianceRandomisation(), name,
                "randomisation", f.size());
        Optional<AutocorrelationPermutation> perm = permutationTest(f, options, s.value(), s.expectation(), name,
                s.permuted());
        return new GlobalTest(f, s.value(), normal, random, perm);
    }

    /** How the p-value of a global test was obtained (see {@link GlobalTestResult#pValue()}). */
    static String method(Optional<AutocorrelationPermutation> permutation) {
        return permutation.map(p -> "permutation (" + p.permutations() + " permutations, seed " + p.seed()
                + "), two-sided").orElse("randomisation (normal approximation), two-sided");
    }

    /** The permutation test of a global statistic if the options ask for one. */
    static Optional<AutocorrelationPermutation> permutationTest(ScalarField f, AutocorrelationOptions o,
            double observed, double expectation, String what, PermutedStatistic stat) {
        if (o.permutations() == 0) {
            return Optional.empty();
        }
        double[] sims = simulate(f.size(), o, f.weights().linkCount() + 2L * f.size(), what, stat);
        return Optional.of(summarise(observed, expectation, sims, o.seed()));
    }

    /** A statistic of the values permuted by perm (value of unit i is the original value of perm[i]). */
    interface PermutedStatistic {
        double evaluate(int[] perm);
    }

    /** Checks that the value array matches the weights and holds no NaN or infinity. */
    static void checkValues(double[] values, SpatialWeights w) {
        Objects.requireNonNull(values, "values");
        Objects.requireNonNull(w, "weights");
        if (values.length != w.size()) {
            throw new IllegalArgumentException("values has " + values.length + " entries but the weights have "
                    + w.size() + " units; give one value per unit");
        }
        for (int i = 0; i < values.length; i++) {
            if (!Double.isFinite(values[i])) {
                throw new IllegalArgumentException("value of unit " + i + " is " + values[i]
                        + "; every value must be finite");
            }
        }
    }

    /** Applies the island policy and checks the number of remaining units. */
    static Prepared prepare(SpatialWeights w, IslandPolicy policy, int minUnits, String what) {
        SpatialWeights cur = w;
        int[] kept = IntStream.range(0, w.size()).toArray();
        if (w.hasIslands()) {
            if (policy == IslandPolicy.ERROR) {
                throw new IllegalArgumentException(islandMessage(w.islands())
                        + "; use other weights or AutocorrelationOptions.withIslandPolicy(EXCLUDE)");
            }
            // Removing islands can empty the row of a unit whose only links pointed to islands
            // (asymmetric weights): repeat until no island is left.
            while (cur.hasIslands()) {
                int[] isl = cur.islands();
                boolean[] drop = new boolean[cur.size()];
                for (int i : isl) {
                    drop[i] = true;
                }
                int[] keepLocal = IntStream.range(0, cur.size()).filter(i -> !drop[i]).toArray();
                if (keepLocal.length < 2) {
                    throw new IllegalArgumentException("after excluding islands fewer than 2 units remain; "
                            + what + " is undefined");
                }
                int[] nk = new int[keepLocal.length];
                for (int a = 0; a < nk.length; a++) {
                    nk[a] = kept[keepLocal[a]];
                }
                kept = nk;
                cur = cur.restrictedTo(keepLocal);
            }
        }
        if (cur.size() < minUnits) {
            throw new IllegalArgumentException(what + " needs at least " + minUnits + " units, got " + cur.size()
                    + (cur.size() < w.size() ? " after excluding islands" : ""));
        }
        final int[] keptF = kept;
        boolean[] in = new boolean[w.size()];
        for (int i : keptF) {
            in[i] = true;
        }
        List<Integer> excluded = IntStream.range(0, w.size()).filter(i -> !in[i]).boxed()
                .collect(Collectors.toUnmodifiableList());
        if (cur.s0() <= 0) {
            throw new IllegalArgumentException("the weights have no positive entry (S0 = 0); " + what
                    + " is undefined");
        }
        return new Prepared(cur.normalisedForStatistics(), keptF, excluded, cur);
    }

    private static String islandMessage(int[] islands) {
        StringBuilder sb = new StringBuilder();
        int shown = Math.min(islands.length, 10);
        for (int a = 0; a < shown; a++) {
            sb.append(a == 0 ? "" : ", ").append(islands[a]);
        }
        if (islands.length > shown) {
            sb.append(", ... (").append(islands.length).append(" in all)");
        }
        return (islands.length == 1 ? "unit " : "units ") + sb + (islands.length == 1 ? " has" : " have")
                + " no neighbours (island" + (islands.length == 1 ? ")" : "s)");
    }

    /** Values of the kept units. */
    static double[] select(double[] values, int[] kept) {
        double[] out = new double[kept.length];
        for (int a = 0; a < kept.length; a++) {
            out[a] = values[kept[a]];
        }
        return out;
    }

    /**
     * Deviations (x_i − x̄) / scale from the mean, computed on the scaled values x_i / scale (exact
     * for a power of two); fails on a constant field: Σ z² ≤ n (10⁻¹³ max |x_i / scale|)², i.e.
     * the spread is at the rounding level of the values themselves.
     */
    static double[] centre(double[] x, double scale, String what) {
        int n = x.length;
        double inv = 1 / scale;
        double mean = 0, max = 0;
        double[] z = new double[n];
        for (int i = 0; i < n; i++) {
            z[i] = x[i] * inv;
            mean += z[i];
            max = Math.max(max, Math.abs(z[i]));
        }
        mean /= n;
        double m2 = 0;
        for (int i = 0; i < n; i++) {
            z[i] -= mean;
            m2 += z[i] * z[i];
        }
        if (!(m2 > n * Math.pow(1e-13 * max, 2))) {
            throw new IllegalArgumentException("the values are constant (zero variance, all equal to " + mean * scale
                    + "); " + what + " is undefined");
        }
        return z;
    }

    /**
     * R permuted statistics; permutation r belongs to block r / {@link #PERMUTATION_BLOCK}, whose
     * generator is {@code Seeds.stream(seed, block)} (SplitMix64 stream derivation in core) and which starts from the identity permutation.
     */
    static double[] simulate(int n, AutocorrelationOptions o, long workPerPermutation, String what,
            PermutedStatistic stat) {
        int permutations = o.permutations();
        long seed = o.seed();
        double[] sims = new double[permutations];
        int blocks = (permutations + PERMUTATION_BLOCK - 1) / PERMUTATION_BLOCK;
        boolean par = o.parallel() && Kernels.parallelWorth((long) permutations * workPerPermutation);
        ProgressCounter progress = new ProgressCounter(o.progressListener(), what + " permutations",
                permutations);
        Kernels.forEachBlock(blocks, par, b -> {
            SplittableRandom rng = Seeds.stream(seed, b);
            int[] perm = IntStream.range(0, n).toArray();
            int r1 = Math.min(permutations, (b + 1) * PERMUTATION_BLOCK);
            for (int r = b * PERMUTATION_BLOCK; r < r1; r++) {
                Seeds.shuffle(perm, rng);
                sims[r] = stat.evaluate(perm);
            }
            progress.advance(r1 - b * PERMUTATION_BLOCK);
        });
        return sims;
    }

    /** Pseudo p-values and moments of the permutation distribution. */
    static AutocorrelationPermutation summarise(double observed, double expectation, double[] sims, long seed) {
        int r = sims.length;
        double tol = 1e-11 * (Math.abs(observed) + Math.abs(expectation));
        double dev = Math.abs(observed - expectation) - tol;
        int ge = 0, le = 0, two = 0;
        double mean = 0;
        for (double s : sims) {
            mean += s;
            if (s >= observed - tol) {
                ge++;
            }
            if (s <= observed + tol) {
                le++;
            }
            if (Math.abs(s - expectation) >= dev) {
                two++;
            }
        }
        mean /= r;
        double ss = 0;
        for (double s : sims) {
            ss += (s - mean) * (s - mean);
        }
        double var = r > 1 ? ss / (r - 1) : 0.0;
        return new AutocorrelationPermutation(r, seed, mean, var, (1.0 + two) / (r + 1), (1.0 + ge) / (r + 1),
                (1.0 + le) / (r + 1));
    }

    /** Normal-approximation test from analytic moments. */
    static AutocorrelationMoments moments(double statistic, double expectation, double variance, String what,
            String assumption, int n) {
        // Relative test: a variance that is zero up to rounding (e.g. every pair linked equally,
        // where I = -1/(n - 1) for every arrangement) must not give a huge meaningless z.
        if (!(variance > 1e-10 * (variance + expectation * expectation)) || !Double.isFinite(variance)) {
            throw new DensaException("the variance of " + what + " under " + assumption + " is " + variance
                    + " for these weights and values: the statistic's null distribution is degenerate"
                    + " (e.g. every pair of units linked with equal weight)",
                    new AutocorrelationDiagnostics(what, assumption, variance, n));
        }
        double z = (statistic - expectation) / Math.sqrt(variance);
        double upper = upperTail(z);
        double lower = upperTail(-z);
        return new AutocorrelationMoments(expectation, variance, z, Math.min(1.0, 2 * Math.min(upper, lower)),
                upper, lower);
    }

    /** 1 − Φ(z) = ½ erfc(z / √2). */
    static double upperTail(double z) {
        return 0.5 * Erf.erfc(z / Math.sqrt(2.0));
    }

    /** Σ z⁴ · n / (Σ z²)²: the sample kurtosis b2 of Cliff &amp; Ord. */
    static double kurtosis(double[] z) {
        double m2 = 0, m4 = 0;
        for (double v : z) {
            double v2 = v * v;
            m2 += v2;
            m4 += v2 * v2;
        }
        return z.length * m4 / (m2 * m2);
    }

    static double sumSq(double[] z) {
        double s = 0;
        for (double v : z) {
            s += v * v;
        }
        return s;
    }

    static int[] identity(int n) {
        int[] a = new int[n];
        Arrays.setAll(a, i -> i);
        return a;
    }
}
