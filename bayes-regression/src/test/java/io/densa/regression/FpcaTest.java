package io.densa.regression;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import java.util.Random;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.SingularOps_DDRM;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.SingularValueDecomposition_F64;
import org.junit.jupiter.api.Test;

class FpcaTest {
    private final BayesSpace space = TestData.space8();

    private DensitySet sample(long seed, int n, double[] sds, double[][] v, double[] mean) {
        Random r = new Random(seed);
        int k = space.dimension();
        double[][] c = new double[n][k];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                double z = sds[j] * r.nextGaussian();
                for (int l = 0; l < k; l++) {
                    c[i][l] += z * v[j][l];
                }
            }
            for (int l = 0; l < k; l++) {
                c[i][l] += mean[l];
            }
        }
        return DensitySet.of(space, c);
    }

    /**
     * Reference: EJML singular value decomposition of the centred coordinate matrix (a
     * general-purpose library): eigenvalues = σ²/(n − 1), scores = U Σ up to the sign of each
     * component.
     */
    @Test
    void eigenvaluesAndScoresAgreeWithEjmlSvd() {
        Random r = new Random(11);
        int k = space.dimension();
        DensitySet data = sample(3, 300, new double[] {3, 2, 1.5, 1, 0.7, 0.5, 0.3, 0.1},
                TestData.orthogonal(r, k), new double[] {1, -1, 0.5, 0, 0, 0.2, 0, 0});
        Fpca f = Fpca.fit(data);
        DMatrixRMaj c = data.centred().coordinateMatrix();
        SingularValueDecomposition_F64<DMatrixRMaj> svd = DecompositionFactory_DDRM.svd(300, k, true, true, true);
        assertTrue(svd.decompose(c.copy()));
        DMatrixRMaj u = svd.getU(null, false);
        DMatrixRMaj w = svd.getW(null);
        DMatrixRMaj vt = svd.getV(null, true);
        SingularOps_DDRM.descendingOrder(u, false, w, vt, true);
        double[] ev = f.eigenvalues();
        Scores scores = f.scores(data, k);
        for (int j = 0; j < k; j++) {
            double s = w.get(j, j);
            assertEquals(s * s / 299, ev[j], 1e-10 * ev[0]);
            // align sign on the largest-magnitude loading
            double[] vj = f.componentCoordinates(j);
            double dot = 0;
            for (int l = 0; l < k; l++) {
                dot += vj[l] * vt.get(j, l);
            }
            assertEquals(1.0, Math.abs(dot), 1e-9);
            double sign = Math.signum(dot);
            for (int i = 0; i < 300; i++) {
                assertEquals(sign * u.get(i, j) * s, scores.get(i, j), 1e-9);
            }
        }
        double[] frac = f.explainedVariance();
        double sum = 0;
        for (double v : frac) {
            sum += v;
        }
        assertEquals(1.0, sum, 1e-12);
        assertEquals(f.totalVariance(), sumSquares(c) / 299, 1e-10);
    }

    private static double sumSquares(DMatrixRMaj m) {
        double s = 0;
        for (double v : m.data) {
            s += v * v;
        }
        return s;
    }

    /**
     * Simulation recovery (fixed seed): n = 20,000 densities from known components with variances
     * 4, 2, 1, 0.25, … The sampling error of an eigenvalue is about λ √(2/n) ≈ 1 %; we allow 5 %
     * for the first three and require |⟨ξ̂_j, ξ_j⟩| &gt; 0.99 (well separated eigenvalues).
     */
    @Test
    void recoversKnownComponentsAndEigenvalues() {
        Random r = new Random(5);
        int k = space.dimension();
        double[][] v = TestData.orthogonal(r, k);
        double[] sds = {2, Math.sqrt(2), 1, 0.5, 0.3, 0.2, 0.1, 0.05};
        DensitySet data = sample(7, 20_000, sds, v, new double[k]);
        Fpca f = Fpca.fit(data);
        double[] ev = f.eigenvalues();
        for (int j = 0; j < 3; j++) {
            assertEquals(sds[j] * sds[j], ev[j], 0.05 * sds[j] * sds[j], "eigenvalue " + j);
            double[] vj = f.componentCoordinates(j);
            double dot = 0;
            for (int l = 0; l < k; l++) {
                dot += vj[l] * v[j][l];
            }
            assertTrue(Math.abs(dot) > 0.99, "component " + j + " alignment " + dot);
            Density truth = space.density(v[j]);
            assertTrue(Math.min(f.component(j).distance(truth), f.component(j).perturb(truth).norm()) < 0.15);
        }
        // a smaller sample is less accurate on the first eigenvalue on average (convergence)
        double errSmall = 0;
        double errLarge = 0;
        for (int rep = 0; rep < 10; rep++) {
            errSmall += Math.abs(Fpca.fit(sample(100 + rep, 200, sds, v, new double[k])).eigenvalues()[0] - 4);
            errLarge += Math.abs(Fpca.fit(sample(200 + rep, 5000, sds, v, new double[k])).eigenvalues()[0] - 4);
        }
        assertTrue(errLarge < errSmall / 2, "error at n = 5000 " + errLarge + " vs n = 200 " + errSmall);
    }

    @Test
    void reconstructionModesAndComponentFunctions() {
        Random r = new Random(2);
        int k = space.dimension();
        double[][] v = TestData.orthogonal(r, k);
        DensitySet data = sample(9, 500, new double[] {2, 1, 0.5, 0.2, 0.1, 0.05, 0.02, 0.01}, v, new double[k]);
        Fpca f = Fpca.fit(data);
        // all K components reconstruct exactly; m = 0 gives the mean
        DensitySet full = f.reconstruct(data, k);
        for (int i = 0; i < 10; i++) {
            assertTrue(full.get(i).equalsWithin(data.get(i), 1e-10));
            assertTrue(f.reconstruct(data, 0).get(i).equalsWithin(data.mean(), 1e-12));
        }
        // reconstruction error with m components = Σ_{j>m} of squared scores (Pythagoras in B2)
        Scores z = f.scores(data, k);
        DensitySet rec2 = f.reconstruct(data, 2);
        for (int i = 0; i < 10; i++) {
            double tail = 0;
            for (int j = 2; j < k; j++) {
                tail += z.get(i, j) * z.get(i, j);
            }
            assertEquals(tail, rec2.get(i).distanceSq(data.get(i)), 1e-10);
        }
        // mode of variation: mean ⊕ (t √λ) ⊙ ξ is at distance |t| √λ from the mean
        Density mode = f.modeOfVariation(0, 2.0);
        assertEquals(2 * Math.sqrt(f.eigenvalues()[0]), mode.distance(f.mean()), 1e-12);
        // component clr function = Σ v_k e_k(t): compare with the density's own clr
        double[] xs = {0.05, 0.3, 0.77};
        double[] clr = f.componentClr(1, xs);
        for (int q = 0; q < xs.length; q++) {
            assertEquals(f.component(1).clr(xs[q]), clr[q], 1e-10);
        }
        assertEquals(1.0, f.component(0).norm(), 1e-12);
        assertEquals(f.componentsForVariance(0.999), 1 + indexReaching(f.cumulativeVariance(), 0.999));
    }

    private static int indexReaching(double[] c, double t) {
        for (int j = 0; j < c.length; j++) {
            if (c[j] >= t) {
                return j;
            }
        }
        return c.length - 1;
    }

    /** Three strong components and a weak isotropic remainder: CV keeps 3 for a 90 % target. */
    @Test
    void crossValidatedChoiceFindsTheStrongComponents() {
        Random r = new Random(21);
        int k = space.dimension();
        double[][] v = TestData.orthogonal(r, k);
        DensitySet data = sample(22, 2000, new double[] {3, 2, 1.5, 0.2, 0.2, 0.2, 0.2, 0.2}, v, new double[k]);
        Fpca.ComponentChoice c = Fpca.chooseComponents(data, ComponentSelection.withDefaults().withMaxComponents(6).withFraction(0.9).withCrossValidation(5, 42L));
        assertEquals(3, c.components());
        double[] e = c.meanError();
        for (int m = 1; m < e.length; m++) {
            assertTrue(e[m] <= e[m - 1] + 1e-12);
        }
        // same seed, same folds, same curve
        org.junit.jupiter.api.Assertions.assertArrayEquals(e, Fpca.chooseComponents(data, ComponentSelection.withDefaults().withMaxComponents(6).withFraction(0.9).withCrossValidation(5, 42L)).meanError());
    }

    @Test
    void badInput() {
        DensitySet one = DensitySet.of(space, new double[1][space.dimension()]);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> Fpca.fit(one));
        assertTrue(e.getMessage().matches(".*at least 2 densities.*"), e.getMessage());
        DensitySet two = DensitySet.of(space, TestData.gaussian(new Random(1), 10, space.dimension(), 1));
        Fpca f = Fpca.fit(two);
        DensitySet other = DensitySet.of(BayesSpace.splines(0, 2, 4, 5), new double[3][8]);
        e = assertThrows(IllegalArgumentException.class, () -> f.scores(other, 2));
        assertTrue(e.getMessage().matches("data lives in .* but .* is required; use space.project.*"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> f.componentsForVariance(Double.NaN));
        assertThrows(IllegalArgumentException.class, () -> f.scores(two, 9));
    }
}
