package io.densa.core;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.stat.correlation.Covariance;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * Batch results of {@link DensitySet} equal the per-{@link Density} results, for every space;
 * covariance and cross products are checked against Apache Commons Math {@code Covariance} and
 * EJML {@code CommonOps_DDRM}. Relative tolerance 1e-12 (batch and single paths use the same
 * formulas in a different summation order).
 */
class DensitySetTest {
    private static final double REL = 1e-12;

    static DensitySet randomSet(BayesSpace s, int n, long seed) {
        Random rnd = new Random(seed);
        double[][] c = new double[n][];
        String[] ids = new String[n];
        for (int i = 0; i < n; i++) {
            c[i] = TestSpaces.randomCoordinates(s, rnd, 1.5);
            ids[i] = "obs-" + i;
        }
        return DensitySet.of(s, c, ids);
    }

    private static void close(double expected, double actual, String what) {
        assertEquals(expected, actual, REL * Math.max(1, Math.abs(expected)), what);
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("io.densa.core.TestSpaces#spaces")
    void algebraMatchesSingleDensities(String name, BayesSpace s) {
        int n = 40;
        DensitySet set = randomSet(s, n, 31);
        Density sum = s.neutral();
        for (int i = 0; i < n; i++) {
            sum = sum.perturb(set.get(i));
        }
        Density mean = sum.power(1.0 / n);
        assertTrue(set.mean().distance(mean) < REL, "⊕-mean");
        DensitySet c = set.centred();
        DMatrixRMaj g = set.gram(), d = set.distances();
        double[] norms = set.norms();
        for (int i = 0; i < n; i++) {
            assertTrue(c.get(i).distance(set.get(i).minus(set.mean())) < REL);
            assertEquals("obs-" + i, c.id(i));
            close(set.get(i).norm(), norms[i], "norm");
            for (int j = 0; j < n; j++) {
                close(set.get(i).inner(set.get(j)), g.get(i, j), "gram");
                assertEquals(set.get(i).distance(set.get(j)), d.get(i, j), 1e-7, "distance"); // √ of a difference
            }
            assertEquals(0.0, d.get(i, i));
        }
        Density shift = set.get(3);
        DensitySet p = set.perturb(shift);
        assertTrue(p.get(5).distance(set.get(5).perturb(shift)) < REL);
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("io.densa.core.TestSpaces#spaces")
    void covarianceAndCrossProductsMatchLibraries(String name, BayesSpace s) {
        DensitySet set = randomSet(s, 60, 32);
        double[][] cov = new Covariance(set.coordinates()).getCovarianceMatrix().getData();
        DMatrixRMaj mine = set.covariance();
        for (int i = 0; i < s.dimension(); i++) {
            for (int j = 0; j < s.dimension(); j++) {
                close(cov[i][j], mine.get(i, j), "covariance");
            }
        }
        DMatrixRMaj m = set.coordinateMatrix();
        DMatrixRMaj ctc = new DMatrixRMaj(s.dimension(), s.dimension());
        CommonOps_DDRM.multTransA(m, m, ctc);
        DMatrixRMaj cp = set.crossProducts(false);
        for (int i = 0; i < ctc.data.length; i++) {
            close(ctc.data[i], cp.data[i], "crossProducts");
        }
        DMatrixRMaj gram = new DMatrixRMaj(60, 60);
        CommonOps_DDRM.multTransB(m, m, gram);
        DMatrixRMaj g = set.gram();
        for (int i = 0; i < gram.data.length; i++) {
            close(gram.data[i], g.data[i], "gram");
        }
        // inner products with another set: EJML's C Dᵀ, and each entry Density.inner of the pair
        DensitySet other = randomSet(s, 7, 34);
        DMatrixRMaj cross = new DMatrixRMaj(60, 7);
        CommonOps_DDRM.multTransB(m, other.coordinateMatrix(), cross);
        DMatrixRMaj ip = set.innerProducts(other);
        assertEquals(60, ip.numRows);
        assertEquals(7, ip.numCols);
        for (int i = 0; i < 60; i++) {
            for (int j = 0; j < 7; j++) {
                close(cross.get(i, j), ip.get(i, j), "innerProducts");
                close(set.get(i).inner(other.get(j)), ip.get(i, j), "innerProducts");
            }
        }
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("io.densa.core.TestSpaces#spaces")
    void evaluationMatchesSingleDensities(String name, BayesSpace s) {
        int n = 25;
        DensitySet set = randomSet(s, n, 33);
        double[] grid = TestSpaces.grid(s, 37);
        DMatrixRMaj pdf = set.pdf(grid), clr = set.clr(grid);
        double x = s.lower() + 0.37 * (s.upper() - s.lower());
        double[] cdf = set.cdf(x), tail = set.tailProbability(x), means = set.means();
        double[] q05 = set.quantiles(0.05), q99 = set.quantiles(0.99);
        for (int i = 0; i < n; i++) {
            Density f = set.get(i);
            double[] fp = f.pdf(grid), fc = f.clr(grid);
            for (int j = 0; j < grid.length; j++) {
                assertEquals(fp[j], pdf.get(i, j), REL * fp[j] + 1e-300, "pdf row " + i + " at " + grid[j]);
                close(fc[j], clr.get(i, j), "clr");
            }
            close(f.cdf(x), cdf[i], "cdf");
            close(f.tailProbability(x), tail[i], "tail");
            close(f.mean(), means[i], "mean");
            close(f.quantile(0.05), q05[i], "quantile 0.05");
            close(f.quantile(0.99), q99[i], "quantile 0.99");
        }
        // the output-buffer variant and points outside the domain (pdf 0 there, as for Density)
        double[] out = new double[n * 3];
        set.pdf(new double[] {s.lower() - 1, x, s.upper() + 1}, out);
        for (int i = 0; i < n; i++) {
            assertEquals(0.0, out[3 * i]);
            assertEquals(set.get(i).pdf(x), out[3 * i + 1], REL * out[3 * i + 1]);
            assertEquals(0.0, out[3 * i + 2]);
        }
    }

    @ParameterizedTest(name = "{0}")
    @MethodSource("io.densa.core.TestSpaces#spaces")
    void subsetsConcatenationAndLists(String name, BayesSpace s) {
        DensitySet set = randomSet(s, 10, 34);
        DensitySet sub = set.subset(7, 2, 2);
        assertEquals(List.of("obs-7", "obs-2", "obs-2"), sub.ids());
        assertEquals(set.get(7), sub.get(0));
        DensitySet both = set.concat(DensitySet.of(List.of(s.neutral())));
        assertEquals(11, both.size());
        assertEquals("#0", both.id(10));
        assertEquals(s.neutral(), both.get(10));
        List<Density> list = new ArrayList<>(set.toList());
        DensitySet back = DensitySet.of(list);
        assertArrayEquals(set.coordinatesRowMajor(), back.coordinatesRowMajor());
        DensitySet fromMatrix = DensitySet.of(s, set.coordinateMatrix(), null);
        assertArrayEquals(set.coordinatesRowMajor(), fromMatrix.coordinatesRowMajor());
        DensitySet rowMajor = DensitySet.ofRowMajor(s, set.coordinatesRowMajor(), 10, null);
        assertEquals(set.coordinate(4, 1), rowMajor.coordinate(4, 1));
    }
}
