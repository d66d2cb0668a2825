package io.densa.spatial.spacetime;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.variogram.VariogramModel;
import org.junit.jupiter.api.Test;

/** The empirical space–time trace-variogram against its definition. */
class SpaceTimeVariogramTest {
    private static SpaceTimeData small() {
        double[][] p = SpaceTimeFields.panel(7, 6, 501);
        return SpaceTimeFields.field(SpaceTimeFields.K10, p, SpaceTimeModel.separable(
                VariogramModel.exponential(1, 0.5), VariogramModel.exponential(1, 3), 0.1), 502);
    }

    @Test
    void pairCountsOfAPanelAreCombinatorial() {
        // 7 sites at distinct positions observed in periods 0..5: spatial class 0 (same site) at
        // time lag u holds 7 (6 - u) pairs, and every lag class together holds all C(42, 2) pairs when
        // the classes cover every lag
        SpaceTimeData d = small();
        SpaceTimeVariogram v = SpaceTimeVariogram.of(d, new LagBins(0.25, 8), new LagBins(1, 5));
        for (int u = 1; u <= 5; u++) {
            assertEquals(7L * (6 - u), v.count(0, u), "u " + u);
        }
        assertEquals(0, v.count(0, 0));
        long total = 0;
        for (int s = 0; s <= 8; s++) {
            for (int t = 0; t <= 5; t++) {
                total += v.count(s, t);
            }
        }
        assertEquals(42L * 41 / 2, total);
        assertTrue(Double.isNaN(v.semivariance(0, 0)));
    }

    @Test
    void semivarianceIsHalfTheMeanSquaredB2Distance() {
        // γ̂(s,t) = 1/(2N) Σ ||X_i - X_j||²_B (Giraldo, Delicado & Mateu (2011), Environ. Ecol. Stat. 18);
        // the B2 distance is computed here from the definition ||f - g||² = ∫ (clr f - clr g)² dx on
        // [0, 1] with the Lebesgue reference (Egozcue, Díaz-Barrero & Pawlowsky-Glahn (2006), Hilbert
        // space of probability density functions based on Aitchison geometry, Acta Math. Sin. 22(4) —
        // from memory), by composite Simpson on 6001 points, not from the coordinates
        SpaceTimeData d = small();
        LagBins sb = new LagBins(0.3, 3), tb = new LagBins(2, 2);
        SpaceTimeVariogram v = SpaceTimeVariogram.of(d, sb, tb);
        int m = 6000;
        double[] xs = new double[m + 1];
        for (int i = 0; i <= m; i++) {
            xs[i] = (double) i / m;
        }
        int n = d.size();
        double[][] clr = new double[n][];
        DensitySet ds = d.densities();
        for (int i = 0; i < n; i++) {
            Density f = ds.get(i);
            clr[i] = f.clr(xs);
        }
        double[][] sum = new double[4][3];
        long[][] cnt = new long[4][3];
        double[][] meanU = new double[4][3];
        for (int i = 0; i < n; i++) {
            for (int j = i + 1; j < n; j++) {
                double h = d.spatialLag(i, j), u = d.temporalLag(i, j);
                int s = h == 0 ? 0 : (int) Math.ceil(h / 0.3);
                int t = u == 0 ? 0 : (int) Math.ceil(u / 2);
                if (s > 3 || t > 2) {
                    continue;
                }
                double q = 0;
                for (int k = 0; k <= m; k++) {
                    double w = k == 0 || k == m ? 1 : k % 2 == 1 ? 4 : 2;
                    double e = clr[i][k] - clr[j][k];
                    q += w * e * e;
                }
                sum[s][t] += q / (3.0 * m);
                cnt[s][t]++;
                meanU[s][t] += u;
            }
        }
        int checked = 0;
        for (int s = 0; s <= 3; s++) {
            for (int t = 0; t <= 2; t++) {
                assertEquals(cnt[s][t], v.count(s, t), s + "," + t);
                if (cnt[s][t] > 0) {
                    // Simpson's rule error on degree-20 polynomials with h = 1/6000: about 1e-10 (h^4 scaling from 1e-8 observed at h = 1/2000)
                    assertEquals(sum[s][t] / (2 * cnt[s][t]), v.semivariance(s, t), 1e-8, s + "," + t);
                    assertEquals(meanU[s][t] / cnt[s][t], v.meanTemporalLag(s, t), 1e-12);
                    checked++;
                }
            }
        }
        assertTrue(checked >= 10, "classes checked " + checked);
    }

    @Test
    void badInputIsNamed() {
        assertThrows(IllegalArgumentException.class, () -> new LagBins(0, 3));
        assertThrows(IllegalArgumentException.class, () -> new LagBins(Double.NaN, 3));
        assertThrows(IllegalArgumentException.class, () -> new LagBins(1, 0));
        Locations loc = Locations.planar(new double[] {0, 1, 0}, new double[] {0, 0, 0});
        DensitySet ds = DensitySet.of(SpaceTimeFields.K10, new double[3][10]);
        IllegalArgumentException dup = assertThrows(IllegalArgumentException.class,
                () -> SpaceTimeData.of(loc, new double[] {2, 2, 2}, ds));
        assertTrue(dup.getMessage().contains("observations 0 and 2"), dup.getMessage());
        IllegalArgumentException nan = assertThrows(IllegalArgumentException.class,
                () -> SpaceTimeData.of(loc, new double[] {0, Double.NaN, 1}, ds));
        assertTrue(nan.getMessage().contains("observation 1"), nan.getMessage());
        assertThrows(IllegalArgumentException.class, () -> SpaceTimeData.of(loc, new double[] {0, 1}, ds));
        SpaceTimeData ok = SpaceTimeData.of(loc, new double[] {0, 1, 1}, ds);
        double[] t = ok.times();
        t[0] = 99;
        assertEquals(0, ok.time(0), "times are copied out");
        SpaceTimeVariogram v = SpaceTimeVariogram.of(ok, new LagBins(1, 1), new LagBins(1, 1));
        assertThrows(IllegalArgumentException.class, () -> v.semivariance(2, 0));
        assertEquals(v.count(1, 1), SpaceTimeVariogram.of(ok, new LagBins(1, 1), new LagBins(1, 1)).count(1, 1));
    }
}
