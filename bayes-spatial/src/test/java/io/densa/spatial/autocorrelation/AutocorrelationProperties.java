package io.densa.spatial.autocorrelation;

import static io.densa.spatial.Lattices.rookLattice;
import static org.junit.jupiter.api.Assertions.assertEquals;

import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import java.util.Random;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.constraints.DoubleRange;
import net.jqwik.api.constraints.LongRange;

/**
 * Invariances that follow from the definitions of Moran (1950), Geary (1954) and Anselin (1995)
 * (from memory): the statistics depend on the values only through their standardised deviations,
 * on the weights only up to a common factor, and not on how the units are numbered.
 */
class AutocorrelationProperties {
    private static final SpatialWeights GRID = SpatialWeights.fromNeighbours(rookLattice(4, 4));

    @Provide
    Arbitrary<double[]> fields() {
        return Arbitraries.doubles().between(-50, 50).array(double[].class).ofSize(16)
                .filter(v -> spread(v) > 1e-3);
    }

    @Property(tries = 60, seed = "20261201")
    void invariantUnderAffineChangeOfValues(@ForAll("fields") double[] v,
            @ForAll @DoubleRange(min = 0.01, max = 100) double scale, @ForAll @DoubleRange(min = -1e3, max = 1e3)
            double shift, @ForAll boolean flip) {
        double a = flip ? -scale : scale;
        double[] t = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            t[i] = a * v[i] + shift;
        }
        assertEquals(MoranI.statistic(GRID, v), MoranI.statistic(GRID, t), 1e-9);
        assertEquals(GearyC.statistic(GRID, v), GearyC.statistic(GRID, t), 1e-9);
        double[] lv = LocalMoran.statistics(GRID, v), lt = LocalMoran.statistics(GRID, t);
        for (int i = 0; i < v.length; i++) {
            assertEquals(lv[i], lt[i], 1e-8 * (1 + Math.abs(lv[i])));
        }
    }

    @Property(tries = 40, seed = "7")
    void invariantUnderCommonScalingOfWeights(@ForAll("fields") double[] v,
            @ForAll @DoubleRange(min = 0.01, max = 1e3) double c) {
        double[][] m = GRID.toMatrix();
        for (double[] row : m) {
            for (int j = 0; j < row.length; j++) {
                row[j] *= c;
            }
        }
        SpatialWeights scaled = SpatialWeights.fromMatrix(m);
        MoranI.Result a = MoranI.test(GRID, v), b = MoranI.test(scaled, v);
        assertEquals(a.statistic(), b.statistic(), 1e-10);
        assertEquals(a.randomisation().variance(), b.randomisation().variance(), 1e-10);
        assertEquals(a.normality().variance(), b.normality().variance(), 1e-10);
        GearyC.Result g = GearyC.test(GRID, v), h = GearyC.test(scaled, v);
        assertEquals(g.statistic(), h.statistic(), 1e-10);
        assertEquals(g.randomisation().variance(), h.randomisation().variance(), 1e-10);
    }

    @Property(tries = 40, seed = "11")
    void invariantUnderRenumberingOfUnits(@ForAll("fields") double[] v, @ForAll @LongRange(min = 0, max = 1000)
            long seed) {
        int n = v.length;
        Random rnd = new Random(seed);
        int[] perm = new int[n];
        for (int i = 0; i < n; i++) {
            perm[i] = i;
        }
        for (int i = n - 1; i > 0; i--) {
            int j = rnd.nextInt(i + 1);
            int t = perm[i];
            perm[i] = perm[j];
            perm[j] = t;
        }
        // Unit i of the renumbered problem is unit perm[i] of the original one.
        double[][] m = SpatialWeights.nearestNeighbours(randomPoints(n, seed), 3, SpatialWeights.Symmetry.DIRECTED)
                .toMatrix();
        double[][] pm = new double[n][n];
        double[] pv = new double[n];
        for (int i = 0; i < n; i++) {
            pv[i] = v[perm[i]];
            for (int j = 0; j < n; j++) {
                pm[i][j] = m[perm[i]][perm[j]];
            }
        }
        SpatialWeights w = SpatialWeights.fromMatrix(m), pw = SpatialWeights.fromMatrix(pm);
        assertEquals(w.s1(), pw.s1(), 1e-12);
        assertEquals(w.s2(), pw.s2(), 1e-12);
        MoranI.Result a = MoranI.test(w, v), b = MoranI.test(pw, pv);
        assertEquals(a.statistic(), b.statistic(), 1e-12);
        assertEquals(a.randomisation().variance(), b.randomisation().variance(), 1e-12);
        assertEquals(GearyC.statistic(w, v), GearyC.statistic(pw, pv), 1e-12);
        double[] l = LocalMoran.statistics(w, v), pl = LocalMoran.statistics(pw, pv);
        double sum = 0;
        for (int i = 0; i < n; i++) {
            assertEquals(l[perm[i]], pl[i], 1e-10 * (1 + Math.abs(pl[i])));
            sum += l[i];
        }
        // Anselin (1995): Σ_i I_i = S0 · I.
        assertEquals(w.s0() * a.statistic(), sum, 1e-10 * (1 + Math.abs(sum)));
    }

    private static Locations randomPoints(int n, long seed) {
        Random rnd = new Random(seed + 1);
        double[] x = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = rnd.nextDouble();
            y[i] = rnd.nextDouble();
        }
        return Locations.planar(x, y);
    }

    private static double spread(double[] v) {
        double lo = Double.POSITIVE_INFINITY, hi = Double.NEGATIVE_INFINITY;
        for (double x : v) {
            lo = Math.min(lo, x);
            hi = Math.max(hi, x);
        }
        return hi - lo;
    }
}
