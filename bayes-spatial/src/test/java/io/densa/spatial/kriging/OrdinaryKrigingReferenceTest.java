package io.densa.spatial.kriging;

import static org.junit.jupiter.api.Assertions.assertEquals;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import io.densa.spatial.variogram.VariogramModel;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

/**
 * With K = 1 kriging of densities is scalar kriging of the single coordinate. Reference: the
 * seven-sample ordinary-kriging example of Isaaks &amp; Srivastava (1989), An Introduction to
 * Applied Geostatistics, ch. 12 (values from memory; re-derived in
 * {@link #textbookDigitsFromAnIndependentCommonsMathSolve}), with
 * C(h) = 10 e^{−0.3h}, i.e. exponential(sill 10, practical range 10) in our convention.
 */
public class OrdinaryKrigingReferenceTest {
    /** Public (with its data) for the edge-case tests of the spatial package; JUnit creates instances. */
    public OrdinaryKrigingReferenceTest() {
    }

    /** Sample locations. */
    public static final double[][] XY = {{61, 139}, {63, 140}, {64, 129}, {68, 128}, {71, 140}, {73, 141}, {75, 128}};
    static final double[] V = {477, 696, 227, 646, 606, 791, 783};
    /** The target. */
    public static final double X0 = 65, Y0 = 137;
    static final BayesSpace K1 = BayesSpace.polynomials(0, 1, 1);

    /** The sample values as the single coordinate of K = 1 densities. */
    public static DensitySet data() {
        double[][] c = new double[V.length][];
        for (int i = 0; i < V.length; i++) {
            c[i] = new double[] {V[i]};
        }
        return DensitySet.of(K1, c);
    }

    static KrigingPrediction krige(VariogramModel model) {
        return Kriging.ordinary(Locations.planar(XY), data(), model, KrigingOptions.withDefaults())
                .predictWithWeights(X0, Y0);
    }

    @Test
    void spaceHasOneCoordinate() {
        assertEquals(1, K1.dimension());
    }

    @Test
    void baseCaseWeightsEstimateAndVariance() {
        KrigingPrediction p = krige(VariogramModel.exponential(10, 10));
        // Isaaks & Srivastava (1989), An Introduction to Applied Geostatistics, ch. 12 (from memory)
        double[] w = {0.1729, 0.3178, 0.1287, 0.0864, 0.1511, 0.0572, 0.0858};
        for (int i = 0; i < w.length; i++) {
            assertEquals(w[i], p.weights()[i], 5e-4, "weight " + i);
        }
        assertEquals(592.73, p.density().coordinate(0), 0.01);
        assertEquals(8.956, p.variance(), 0.001);
    }

    @Test
    void otherModelRowsOfTheTable() {
        // Isaaks & Srivastava (1989), An Introduction to Applied Geostatistics, ch. 12, table of
        // alternative models (from memory)
        KrigingPrediction sill20 = krige(VariogramModel.exponential(20, 10));
        assertEquals(593, sill20.density().coordinate(0), 0.5);
        assertEquals(592.73, sill20.density().coordinate(0), 0.01); // weights do not depend on the sill
        assertEquals(17.91, sill20.variance(), 0.01);
        KrigingPrediction gauss = krige(VariogramModel.gaussian(10, 10));
        assertEquals(559.37, gauss.density().coordinate(0), 0.01);
        assertEquals(4.781, gauss.variance(), 0.001);
        KrigingPrediction nug = krige(VariogramModel.exponential(5, 10).withNugget(5));
        assertEquals(596.78, nug.density().coordinate(0), 0.01);
        assertEquals(10.306, nug.variance(), 0.001);
        KrigingPrediction range20 = krige(VariogramModel.exponential(10, 20));
        assertEquals(572.39, range20.density().coordinate(0), 0.01);
        assertEquals(5.758, range20.variance(), 0.001);
    }

    /** The textbook bordered system [C 1; 1' 0][λ; μ] = [c0; 1] solved directly with EJML. */
    static double[] directSolve(VariogramModel model) {
        int n = XY.length;
        DMatrixRMaj a = new DMatrixRMaj(n + 1, n + 1);
        DMatrixRMaj b = new DMatrixRMaj(n + 1, 1);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                a.set(i, j, model.covariance(Math.hypot(XY[i][0] - XY[j][0], XY[i][1] - XY[j][1])));
            }
            a.set(i, n, 1);
            a.set(n, i, 1);
            b.set(i, 0, model.covariance(Math.hypot(XY[i][0] - X0, XY[i][1] - Y0)));
        }
        b.set(n, 0, 1);
        DMatrixRMaj x = new DMatrixRMaj(n + 1, 1);
        CommonOps_DDRM.solve(a, b, x);
        double est = 0, var = model.sill();
        for (int i = 0; i < n; i++) {
            est += x.get(i) * V[i];
            var -= x.get(i) * b.get(i);
        }
        var -= x.get(n);
        double[] out = new double[n + 3];
        for (int i = 0; i <= n; i++) {
            out[i] = x.get(i);
        }
        out[n + 1] = est;
        out[n + 2] = var;
        return out;
    }

    @Test
    void agreesWithDirectEjmlSolveToTenDigits() {
        VariogramModel[] models = {VariogramModel.exponential(10, 10), VariogramModel.gaussian(10, 10),
            VariogramModel.exponential(5, 10).withNugget(5), VariogramModel.spherical(10, 15),
            VariogramModel.matern(10, 4, 1.5), VariogramModel.matern(10, 4, 0.8)};
        for (VariogramModel m : models) {
            double[] d = directSolve(m);
            KrigingPrediction p = krige(m);
            for (int i = 0; i < XY.length; i++) {
                assertEquals(d[i], p.weights()[i], 1e-10, m + " weight " + i);
            }
            assertEquals(d[XY.length + 1], p.density().coordinate(0), 1e-10 * 600, m + " estimate");
            assertEquals(d[XY.length + 2], p.variance(), 1e-10, m + " variance");
        }
    }

    /** The direct solve reproduces the textbook Lagrange multiplier μ = −0.9066 (covariance form). */
    @Test
    void lagrangeMultiplierOfTheTextbook() {
        assertEquals(-0.9066, directSolve(VariogramModel.exponential(10, 10))[XY.length], 5e-4);
    }

    /**
     * Second derivation of the textbook digits, independent of the library and of EJML: the
     * bordered system [C 1; 1ᵀ 0][λ; μ] = [c0; 1] with the covariance written out here and solved by
     * Commons Math's LU decomposition; estimate Σ λ_i v_i, variance C(0) − λᵀc0 − μ. Each row
     * asserts the digits Isaaks &amp; Srivastava (1989) print.
     */
    @Test
    void textbookDigitsFromAnIndependentCommonsMathSolve() {
        double[] base = luSolve(h -> 10 * Math.exp(-0.3 * h), 10);
        double[] w = {0.1729, 0.3178, 0.1287, 0.0864, 0.1511, 0.0572, 0.0858};
        for (int i = 0; i < w.length; i++) {
            assertEquals(w[i], base[i], 5e-5, "weight " + i);
        }
        assertEquals(592.73, base[XY.length], 0.005);
        assertEquals(8.956, base[XY.length + 1], 0.0005);
        double[] sill20 = luSolve(h -> 20 * Math.exp(-0.3 * h), 20);
        assertEquals(17.91, sill20[XY.length + 1], 0.005);
        double[] gauss = luSolve(h -> 10 * Math.exp(-3 * (h / 10) * (h / 10)), 10);
        assertEquals(559.37, gauss[XY.length], 0.005);
        assertEquals(4.781, gauss[XY.length + 1], 0.0005);
        double[] nug = luSolve(h -> h == 0 ? 10 : 5 * Math.exp(-0.3 * h), 10);
        assertEquals(596.78, nug[XY.length], 0.005);
        assertEquals(10.306, nug[XY.length + 1], 0.0005);
        double[] range20 = luSolve(h -> 10 * Math.exp(-0.15 * h), 10);
        assertEquals(572.39, range20[XY.length], 0.005);
        assertEquals(5.758, range20[XY.length + 1], 0.0005);
    }

    /** λ (n values), then the estimate and the variance, from Commons Math LU. */
    private static double[] luSolve(java.util.function.DoubleUnaryOperator cov, double c0) {
        int n = XY.length;
        double[][] a = new double[n + 1][n + 1];
        double[] b = new double[n + 1];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                a[i][j] = cov.applyAsDouble(Math.hypot(XY[i][0] - XY[j][0], XY[i][1] - XY[j][1]));
            }
            a[i][n] = 1;
            a[n][i] = 1;
            b[i] = cov.applyAsDouble(Math.hypot(XY[i][0] - X0, XY[i][1] - Y0));
        }
        b[n] = 1;
        double[] x = new org.apache.commons.math3.linear.LUDecomposition(
                new org.apache.commons.math3.linear.Array2DRowRealMatrix(a)).getSolver()
                .solve(new org.apache.commons.math3.linear.ArrayRealVector(b)).toArray();
        double[] out = new double[n + 2];
        double var = c0 - x[n];
        for (int i = 0; i < n; i++) {
            out[i] = x[i];
            out[n] += x[i] * V[i];
            var -= x[i] * b[i];
        }
        out[n + 1] = var;
        return out;
    }
}
