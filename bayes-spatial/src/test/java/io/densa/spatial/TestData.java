package io.densa.spatial;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.variogram.VariogramModel;
import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;

/** Seeded invented data for tests (not reference values). */
public final class TestData {
    public static final BayesSpace K3 = BayesSpace.polynomials(-1, 1, 3);
    public static final BayesSpace K10 = BayesSpace.polynomials(0, 1, 10);

    private TestData() {
    }

    public static Locations uniformSquare(int n, double side, long seed) {
        Random r = new Random(seed);
        double[] x = new double[n], y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = side * r.nextDouble();
            y[i] = side * r.nextDouble();
        }
        return Locations.planar(x, y);
    }

    public static DensitySet independentCoordinates(BayesSpace space, int n, long seed) {
        Random r = new Random(seed);
        double[][] c = new double[n][space.dimension()];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < c[i].length; j++) {
                c[i][j] = r.nextGaussian();
            }
        }
        return DensitySet.of(space, c);
    }

    /**
     * Gaussian random field by Cholesky: each of the K coordinates is an independent zero-mean
     * field with covariance C(h)/K, so the trace-covariance of the densities is C(h).
     */
    public static DensitySet gaussianField(BayesSpace space, Locations loc, VariogramModel model, long seed) {
        int n = loc.size(), k = space.dimension();
        DMatrixRMaj c = new DMatrixRMaj(n, n);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                c.set(i, j, (i == j ? model.sill() : model.covariance(loc.distance(i, j))) / k);
            }
            c.add(i, i, 1e-10);
        }
        return correlatedCoordinates(space, c, seed);
    }

    /**
     * n densities whose K coordinates are independent zero-mean Gaussian vectors with the given
     * n × n covariance, sampled as L z with L the Cholesky factor (seeded).
     */
    public static DensitySet correlatedCoordinates(BayesSpace space, DMatrixRMaj c, long seed) {
        int n = c.numRows, k = space.dimension();
        CholeskyDecomposition_F64<DMatrixRMaj> chol = DecompositionFactory_DDRM.chol(n, true);
        if (!chol.decompose(c.copy())) {
            throw new IllegalStateException("covariance not positive definite");
        }
        DMatrixRMaj l = chol.getT(null);
        Random r = new Random(seed);
        double[][] out = new double[n][k];
        double[] z = new double[n];
        for (int col = 0; col < k; col++) {
            for (int i = 0; i < n; i++) {
                z[i] = r.nextGaussian();
            }
            for (int i = 0; i < n; i++) {
                double s = 0;
                for (int j = 0; j <= i; j++) {
                    s += l.get(i, j) * z[j];
                }
                out[i][col] = s;
            }
        }
        return DensitySet.of(space, out);
    }
}
