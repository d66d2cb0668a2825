package io.densa.spatial.scan;

import io.densa.core.TestResult;
import io.densa.core.internal.CountSampling;
import io.densa.core.internal.Kernels;
import io.densa.core.internal.Seeds;
import io.densa.spatial.Locations;
import java.util.Arrays;
import java.util.Objects;
import java.util.SplittableRandom;

/**
 * Kulldorff's spatial scan statistic for raised counts under the Poisson model (Kulldorff (1997),
 * A spatial scan statistic, Communications in Statistics – Theory and Methods 26(6), 1481–1496).
 *
 * <p><b>Zones.</b> For every unit i (the centre) the units are taken in order of distance from i
 * (ties by index) and each prefix {i, nearest, second nearest, …} is a zone as long as its share
 * of the expected counts is at most the maximum share (default 50 %): the circular windows of the
 * paper, centred on the units' locations.
 *
 * <p><b>Statistic.</b> With C observed events in all, expected counts rescaled to total C (the
 * test is conditional on C), and a zone z holding c observed and e expected events, the
 * log-likelihood ratio of "raised rate inside z" against "one rate everywhere" is
 * <pre>  LLR(z) = c ln(c/e) + (C − c) ln((C − c)/(C − e))   if c &gt; e,   0 otherwise</pre>
 * (0 ln 0 = 0). The most likely cluster is the zone with the largest LLR (the first found, centres
 * in index order and smaller zones first, when several are equal).
 *
 * <p><b>p-value.</b> Monte Carlo (Dwass 1957, as in the paper): R replicates distribute the C events
 * over the units multinomially with probabilities proportional to the expected counts; the
 * maximum LLR over all zones is computed for each, and p = (1 + #{replicates with max ≥ observed
 * max}) / (R + 1). With 999 replicates p ranges from 0.001 to 1. Each replicate draws from its
 * own SplitMix64 stream of the seed.
 *
 * <p>Cost: O(n²) memory and time per replicate for n units (every centre's ordered list up to the
 * maximum share). Immutable and thread-safe; inputs are not modified.
 */
public final class SpatialScan {
    private static final int REPLICATES_PER_BLOCK = 8;

    private final double maxShare;
    private final int replicates;
    private final long seed;

    private SpatialScan(double maxShare, int replicates, long seed) {
        this.maxShare = maxShare;
        this.replicates = replicates;
        this.seed = seed;
    }

    /** Zones up to 50 % of the expected counts, 999 replicates, seed 1. */
    public static SpatialScan withDefaults() {
        return new SpatialScan(0.5, 999, 1);
    }

    /**
     * Largest share of the total expected count a zone may hold.
     *
     * @param share in (0, 1]
     */
    public SpatialScan withMaxShare(double share) {
        if (!(share > 0 && share <= 1)) {
            throw new IllegalArgumentException("maximum zone share must be in (0, 1], got " + share);
        }
        return new SpatialScan(share, replicates, seed);
    }

    /**
     * Monte Carlo replicates and their seed.
     *
     * @param replicates at least 19
     */
    public SpatialScan withReplicates(int replicates, long seed) {
        if (replicates < 19) {
            throw new IllegalArgumentException("Monte Carlo replicates must be at least 19, got " + replicates);
        }
        return new SpatialScan(maxShare, replicates, seed);
    }

    /** Largest zone share. */
    public double maxShare() {
        return maxShare;
    }

    /** Monte Carlo replicates. */
    public int replicates() {
        return replicates;
    }

    /** Seed of the replicates. */
    public long seed() {
        return seed;
    }

    /**
     * A zone.
     *
     * @param centre             unit the zone is centred on
     * @param members            its units, centre first then by distance (a copy is returned)
     * @param observed           observed events c in the zone
     * @param expected           expected events in the zone, as given
     * @param expectedConditional expected events rescaled to the observed total (the e of the statistic)
     * @param excess             observed − expected (as given)
     * @param relativeRisk       (c/e)/((C − c)/(C − e)) with the rescaled e; infinite when every event
     *                           is inside the zone
     * @param logLikelihoodRatio LLR(z)
     */
    public record Cluster(int centre, int[] members, long observed, double expected, double expectedConditional,
            double excess, double relativeRisk, double logLikelihoodRatio) {
        /** Canonical constructor: copies the members. */
        public Cluster {
            members = members.clone();
        }

        /** The members (a copy). */
        @Override
        public int[] members() {
            return members.clone();
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof Cluster c && centre == c.centre && Arrays.equals(members, c.members)
                    && observed == c.observed && Double.compare(expected, c.expected) == 0
                    && Double.compare(expectedConditional, c.expectedConditional) == 0
                    && Double.compare(excess, c.excess) == 0 && Double.compare(relativeRisk, c.relativeRisk) == 0
                    && Double.compare(logLikelihoodRatio, c.logLikelihoodRatio) == 0;
        }

        @Override
        public int hashCode() {
            return 31 * Objects.hash(centre, observed, expected, logLikelihoodRatio) + Arrays.hashCode(members);
        }

        @Override
        public String toString() {
            return "Cluster[centre=" + centre + ", members=" + Arrays.toString(members) + ", observed=" + observed
                    + ", expected=" + expected + ", excess=" + excess + ", relativeRisk=" + relativeRisk + ", LLR="
                    + logLikelihoodRatio + "]";
        }
    }

    /**
     * Result of the scan.
     *
     * @param mostLikely    the zone with the largest LLR; when no zone has raised counts: no members, centre −1,
     *                      relative risk 1, LLR 0 and p = 1
     * @param pValue        Monte Carlo p-value of the test of no cluster
     * @param replicates    replicates run
     * @param seed          their seed
     * @param maxShare      largest zone share
     * @param zones         number of zones scanned (a set reached from two centres counts twice)
     * @param totalObserved C
     * @param totalExpected sum of the expected counts as given
     */
    public record Result(Cluster mostLikely, double pValue, int replicates, long seed, double maxShare, long zones,
            long totalObserved, double totalExpected) implements TestResult {
        /** The test statistic: the most likely cluster's log-likelihood ratio (0 when no zone has raised counts). */
        @Override
        public double statistic() {
            return mostLikely.logLikelihoodRatio();
        }

        /** "Monte Carlo (B replicates, seed S), upper tail". */
        @Override
        public String method() {
            return "Monte Carlo (" + replicates + " replicates, seed " + seed + "), upper tail";
        }
    }

    /**
     * Scans for the most likely cluster of raised counts.
     *
     * @param locations one location per unit (centroids)
     * @param observed  n counts ≥ 0, at least one positive (not modified)
     * @param expected  n finite expected counts &gt; 0 (not modified)
     */
    public Result test(Locations locations, long[] observed, double[] expected) {
        Objects.requireNonNull(locations, "locations");
        Objects.requireNonNull(observed, "observed");
        Objects.requireNonNull(expected, "expected");
        int n = locations.size();
        if (observed.length != n || expected.length != n) {
            throw new IllegalArgumentException("observed has " + observed.length + " and expected " + expected.length
                    + " values; expected one per location (" + n + ")");
        }
        long total = 0;
        double totalExpected = 0;
        for (int i = 0; i < n; i++) {
            if (observed[i] < 0) {
                throw new IllegalArgumentException("observed count of unit " + i + " is " + observed[i]
                        + "; counts must be >= 0");
            }
            if (!(expected[i] > 0) || Double.isInfinite(expected[i])) {
                throw new IllegalArgumentException("expected count of unit " + i + " is " + expected[i]
                        + "; expected counts must be finite and > 0");
            }
            total = Math.addExact(total, observed[i]);
            totalExpected += expected[i];
        }
        if (total == 0) {
            throw new IllegalArgumentException("no events observed in any unit: the scan needs at least one");
        }
        double[] e = new double[n];
        for (int i = 0; i < n; i++) {
            e[i] = expected[i] * (total / totalExpected);
        }
        int[][] order = zones(locations, e, total * maxShare * (1 + 1e-12));
        long zoneCount = 0;
        for (int[] o : order) {
            zoneCount += o.length;
        }
        double big = total;
        // observed maximum and its zone
        int bestCentre = -1;
        int bestSize = 0;
        double best = 0;
        for (int i = 0; i < n; i++) {
            double c = 0;
            double ez = 0;
            int[] o = order[i];
            for (int m = 0; m < o.length; m++) {
                c += observed[o[m]];
                ez += e[o[m]];
                double llr = llr(c, ez, big);
                if (llr > best) {
                    best = llr;
                    bestCentre = i;
                    bestSize = m + 1;
                }
            }
        }
        Cluster cluster;
        if (bestCentre < 0) {
            cluster = new Cluster(-1, new int[0], 0, 0, 0, 0, 1, 0);
        } else {
            int[] members = Arrays.copyOf(order[bestCentre], bestSize);
            long c = 0;
            double ez = 0;
            double eg = 0;
            for (int u : members) {
                c += observed[u];
                ez += e[u];
                eg += expected[u];
            }
            double rr = c == total ? Double.POSITIVE_INFINITY : (c / ez) / ((total - c) / (total - ez));
            cluster = new Cluster(bestCentre, members, c, eg, ez, c - eg, rr, best);
        }
        if (best <= 0) {
            return new Result(cluster, 1.0, replicates, seed, maxShare, zoneCount, total, totalExpected);
        }
        double[] maxima = new double[replicates];
        int blocks = (replicates + REPLICATES_PER_BLOCK - 1) / REPLICATES_PER_BLOCK;
        boolean parallel = Kernels.parallelWorth(zoneCount * (long) replicates * 4);
        double observedMax = best;
        long events = total;
        Kernels.forEachBlock(blocks, parallel, blk -> {
            long[] sim = new long[n];
            int end = Math.min(replicates, (blk + 1) * REPLICATES_PER_BLOCK);
            for (int r = blk * REPLICATES_PER_BLOCK; r < end; r++) {
                SplittableRandom rng = Seeds.stream(seed, r);
                CountSampling.multinomial(events, e, rng, sim);
                maxima[r] = maximum(order, sim, e, big, observedMax);
            }
        });
        int atLeast = 0;
        for (double m : maxima) {
            if (m >= best) {
                atLeast++;
            }
        }
        return new Result(cluster, (1.0 + atLeast) / (replicates + 1.0), replicates, seed, maxShare, zoneCount, total,
                totalExpected);
    }

    /** Largest LLR over all zones of one replicate; stops early once it reaches {@code stopAt}. */
    private static double maximum(int[][] order, long[] counts, double[] e, double total, double stopAt) {
        double best = 0;
        for (int[] o : order) {
            double c = 0;
            double ez = 0;
            for (int u : o) {
                c += counts[u];
                ez += e[u];
                if (c > ez) {
                    double llr = llr(c, ez, total);
                    if (llr > best) {
                        best = llr;
                        if (best >= stopAt) {
                            return best;
                        }
                    }
                }
            }
        }
        return best;
    }

    /** Kulldorff's Poisson LLR of a zone with c observed and e expected of C, 0 unless c &gt; e. */
    static double llr(double c, double e, double total) {
        if (!(c > e)) {
            return 0;
        }
        double out = c * Math.log(c / e);
        double rest = total - c;
        if (rest > 0) {
            out += rest * Math.log(rest / (total - e));
        }
        return out;
    }

    /** For each centre, the units by distance (ties by index) while the cumulative expected ≤ limit. */
    private static int[][] zones(Locations loc, double[] e, double limit) {
        int n = e.length;
        int[][] out = new int[n][];
        Integer[] idx = new Integer[n];
        double[] d = new double[n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                idx[j] = j;
                d[j] = loc.distance(i, j);
            }
            final int centre = i;
            Arrays.sort(idx, (a, b) -> {
                if (a == centre || b == centre) {
                    return a == centre ? (b == centre ? 0 : -1) : 1;
                }
                int c = Double.compare(d[a], d[b]);
                return c != 0 ? c : Integer.compare(a, b);
            });
            double cum = 0;
            int m = 0;
            while (m < n && cum + e[idx[m]] <= limit) {
                cum += e[idx[m]];
                m++;
            }
            int[] o = new int[m];
            for (int t = 0; t < m; t++) {
                o[t] = idx[t];
            }
            out[i] = o;
        }
        return out;
    }
}
