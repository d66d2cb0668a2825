package io.densa.spatial.spacetime;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.spatial.Locations;
import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.CholeskyDecomposition_F64;

/** Seeded invented space–time data for tests (not reference values). */
final class SpaceTimeFields {
    /** Polynomial clr space of dimension 10 on [0, 1]. */
    static final BayesSpace K10 = BayesSpace.polynomials(0, 1, 10);

    private SpaceTimeFields() {
    }

    /** Every one of {@code sites} random sites in the unit square observed at periods 0..periods−1. */
    static double[][] panel(int sites, int periods, long seed) {
        Random r = new Random(seed);
        double[] sx = new double[sites], sy = new double[sites];
        for (int i = 0; i < sites; i++) {
            sx[i] = r.nextDouble();
            sy[i] = r.nextDouble();
        }
        int n = sites * periods;
        double[][] out = new double[3][n];
        for (int t = 0; t < periods; t++) {
            for (int i = 0; i < sites; i++) {
                out[0][t * sites + i] = sx[i];
                out[1][t * sites + i] = sy[i];
                out[2][t * sites + i] = t;
            }
        }
        return out;
    }

    /** The model's covariance matrix of the observations (row-major n × n, EJML). */
    static DMatrixRMaj covariance(SpaceTimeModel model, Locations loc, double[] t) {
        int n = t.length;
        DMatrixRMaj c = new DMatrixRMaj(n, n);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                c.set(i, j, model.covariance(loc.distance(i, j), Math.abs(t[i] - t[j])));
            }
        }
        return c;
    }

    /**
     * A Gaussian space–time field of densities: each of the K coordinates is an independent
     * zero-mean field with covariance C(h, u) / K, so the trace-covariance is C(h, u); sampled as
     * L z with L the Cholesky factor (seeded).
     */
    static SpaceTimeData field(BayesSpace space, double[][] panel, SpaceTimeModel model, long seed) {
        Locations loc = Locations.planar(panel[0], panel[1]);
        int n = panel[2].length, k = space.dimension();
        DMatrixRMaj c = covariance(model, loc, panel[2]);
        for (int i = 0; i < n * n; i++) {
            c.data[i] /= k;
        }
        for (int i = 0; i < n; i++) {
            c.add(i, i, 1e-10);
        }
        CholeskyDecomposition_F64<DMatrixRMaj> chol = DecompositionFactory_DDRM.chol(n, true);
        if (!chol.decompose(c)) {
            throw new IllegalStateException("covariance not positive definite");
        }
        DMatrixRMaj l = chol.getT(null);
        Random r = new Random(seed);
        double[][] out = new double[n][k];
        double[] z = new double[n];
        for (int q = 0; q < k; q++) {
            for (int i = 0; i < n; i++) {
                z[i] = r.nextGaussian();
            }
            for (int i = 0; i < n; i++) {
                double s = 0;
                for (int j = 0; j <= i; j++) {
                    s += l.get(i, j) * z[j];
                }
                out[i][q] = s;
            }
        }
        return SpaceTimeData.of(loc, panel[2], DensitySet.of(space, out));
    }
}
