package io.densa.spatial.spacetime;

import io.densa.core.BayesSpace;
import io.densa.spatial.Locations;
import io.densa.spatial.TestData;
import java.util.Random;
import org.ejml.data.DMatrixRMaj;

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
        int n = panel[2].length;
        int k = space.dimension();
        DMatrixRMaj c = covariance(model, loc, panel[2]);
        for (int i = 0; i < n * n; i++) {
            c.data[i] /= k;
        }
        for (int i = 0; i < n; i++) {
            c.add(i, i, 1e-10);
        }
        return SpaceTimeData.of(loc, panel[2], TestData.correlatedCoordinates(space, c, seed));
    }
}
