package io.densa.spatial.spacetime;

import io.densa.core.DensaException;
import java.util.Objects;

/**
 * The empirical space–time trace-semivariogram of densities over spatial × temporal lag classes:
 * for the pairs (i, j) whose spatial lag falls in class s and temporal lag in class t,
 * <pre>γ̂(s, t) = 1 / (2 N(s, t)) Σ ‖X_i ⊖ X_j‖²_B,</pre>
 * with N(s, t) the number of pairs. The B2 norm is the Euclidean norm of the clr coordinates in
 * the space's orthonormal basis, so ‖X_i ⊖ X_j‖²_B = Σ_k (c_ik − c_jk)². This is the
 * trace-variogram of Giraldo, Delicado &amp; Mateu (2011), Ordinary kriging for function-valued
 * spatial data, Environ. Ecol. Stat. 18 (from memory), taken over space–time lags as for scalar
 * data in Cressie &amp; Wikle (2011), Statistics for Spatio-Temporal Data, Wiley, §4.1 (from memory).
 *
 * <p>Lag classes are {@link LagBins}: class 0 holds lag exactly 0 on that axis, so the pairs of one
 * unit at different times (spatial class 0) estimate the temporal margin γ(0, u), the pairs of one
 * period (temporal class 0) the spatial margin γ(h, 0). Each class also records the mean spatial
 * and temporal lag of its pairs, at which a model is fitted. The pair (0, 0) class stays empty:
 * {@link SpaceTimeData} holds one density per location and time.
 *
 * <p>Cost: one pass over the n(n − 1)/2 pairs, O(n² K). Immutable and thread-safe; arrays are
 * copied out.
 */
public final class SpaceTimeVariogram {
    private final LagBins spatial;
    private final LagBins temporal;
    private final double[] gamma;
    private final long[] count;
    private final double[] meanH;
    private final double[] meanU;

    private SpaceTimeVariogram(LagBins spatial, LagBins temporal, double[] gamma, long[] count, double[] meanH,
            double[] meanU) {
        this.spatial = spatial;
        this.temporal = temporal;
        this.gamma = gamma;
        this.count = count;
        this.meanH = meanH;
        this.meanU = meanU;
    }

    /**
     * Bins every pair of observations.
     *
     * @throws DensaException if a class's sum of squared distances overflows a double (rescale the
     *                        coordinates)
     */
    public static SpaceTimeVariogram of(SpaceTimeData data, LagBins spatial, LagBins temporal) {
        Objects.requireNonNull(data, "data");
        Objects.requireNonNull(spatial, "spatial");
        Objects.requireNonNull(temporal, "temporal");
        int n = data.size();
        int k = data.densities().dimension();
        double[] c = data.densities().coordinatesRowMajor();
        int ns = spatial.size(), nt = temporal.size();
        double[] sum = new double[ns * nt];
        long[] cnt = new long[ns * nt];
        double[] sh = new double[ns * nt];
        double[] su = new double[ns * nt];
        for (int i = 0; i < n; i++) {
            for (int j = i + 1; j < n; j++) {
                double u = data.temporalLag(i, j);
                int bt = temporal.classOf(u);
                if (bt < 0) {
                    continue;
                }
                double h = data.spatialLag(i, j);
                int bs = spatial.classOf(h);
                if (bs < 0) {
                    continue;
                }
                double d2 = 0;
                int oi = i * k, oj = j * k;
                for (int q = 0; q < k; q++) {
                    double d = c[oi + q] - c[oj + q];
                    d2 += d * d;
                }
                int b = bs * nt + bt;
                sum[b] += d2;
                cnt[b]++;
                sh[b] += h;
                su[b] += u;
            }
        }
        double[] g = new double[ns * nt];
        for (int b = 0; b < g.length; b++) {
            if (cnt[b] == 0) {
                g[b] = Double.NaN;
                sh[b] = Double.NaN;
                su[b] = Double.NaN;
                continue;
            }
            g[b] = sum[b] / (2.0 * cnt[b]);
            sh[b] /= cnt[b];
            su[b] /= cnt[b];
            if (!Double.isFinite(g[b])) {
                throw new DensaException("the squared B2 distances of the pairs in lag class (space " + (b / nt)
                        + ", time " + (b % nt) + ") sum beyond the double range; rescale the densities' coordinates",
                        new SpaceTimeDiagnostics("space-time semivariance", b, g[b]));
            }
        }
        return new SpaceTimeVariogram(spatial, temporal, g, cnt, sh, su);
    }

    /** The spatial lag classes. */
    public LagBins spatialBins() {
        return spatial;
    }

    /** The temporal lag classes. */
    public LagBins temporalBins() {
        return temporal;
    }

    private int index(int s, int t) {
        if (s < 0 || s >= spatial.size() || t < 0 || t >= temporal.size()) {
            throw new IllegalArgumentException("lag class (" + s + ", " + t + ") is outside 0.." + spatial.count()
                    + " x 0.." + temporal.count());
        }
        return s * temporal.size() + t;
    }

    /** γ̂ of spatial class s and temporal class t; NaN when the class holds no pair. */
    public double semivariance(int s, int t) {
        return gamma[index(s, t)];
    }

    /** Number of pairs N(s, t). */
    public long count(int s, int t) {
        return count[index(s, t)];
    }

    /** Mean spatial lag of the class's pairs; NaN when empty. */
    public double meanSpatialLag(int s, int t) {
        return meanH[index(s, t)];
    }

    /** Mean temporal lag of the class's pairs; NaN when empty. */
    public double meanTemporalLag(int s, int t) {
        return meanU[index(s, t)];
    }

    /** Number of non-empty classes. */
    public int nonEmptyClasses() {
        int m = 0;
        for (long c : count) {
            if (c > 0) {
                m++;
            }
        }
        return m;
    }

    /** Largest γ̂ over the non-empty classes (0 when every class is empty). */
    double maxSemivariance() {
        double m = 0;
        for (int b = 0; b < gamma.length; b++) {
            if (count[b] > 0) {
                m = Math.max(m, gamma[b]);
            }
        }
        return m;
    }

    /** The non-empty classes as rows {mean h, mean u, γ̂, N}, skipping lag (0, 0). */
    double[][] rows() {
        double[][] r = new double[nonEmptyClasses()][];
        int m = 0;
        for (int b = 0; b < gamma.length; b++) {
            if (count[b] > 0 && !(meanH[b] == 0 && meanU[b] == 0)) {
                r[m++] = new double[] {meanH[b], meanU[b], gamma[b], count[b]};
            }
        }
        return java.util.Arrays.copyOf(r, m);
    }

    @Override
    public String toString() {
        return "SpaceTimeVariogram[" + spatial + " x " + temporal + ", " + nonEmptyClasses() + " non-empty classes]";
    }
}
