package io.densa.examples;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.Density;
import java.util.ArrayList;
import java.util.List;

/**
 * Age densities from counts by single year of age. Provisional: add-half shares fitted by least
 * squares on the log scale (core only), used until the penalised-likelihood estimator is merged.
 */
final class AgeDensities {
    private AgeDensities() {
    }

    static String varianceSource() {
        return "here the proxy 1/N, N the visits, until the estimator reports variances";
    }

    static String describe() {
        return "least-squares fit of log (count + ½)/(N + 50) (provisional core-only estimator)";
    }

    static Estimates estimate(BayesSpace space, int[][] intCounts, String[] ids) {
        double[][] counts = new double[intCounts.length][];
        double[] proxy = new double[intCounts.length];
        for (int i = 0; i < counts.length; i++) {
            counts[i] = Study1.toDouble(intCounts[i]);
            proxy[i] = 1.0 / java.util.Arrays.stream(intCounts[i]).sum();
        }
        List<Density> out = new ArrayList<>();
        double[] mid = Study1.AGE_MID;
        for (double[] c : counts) {
            double total = 0;
            for (double v : c) {
                total += v;
            }
            double[] pdf = new double[c.length];
            for (int a = 0; a < c.length; a++) {
                pdf[a] = (c[a] + 0.5) / (total + 0.5 * c.length);
            }
            out.add(leastSquaresLog(space, mid, pdf));
        }
        return new Estimates(DensitySet.of(out, ids), proxy, 0, Double.NaN, Double.NaN);
    }

    /**
     * Least-squares coordinates of log values: minimises Σ (log y_i − c0 − Σ c_k e_k(x_i))². Written
     * here because {@code BayesSpace.fromClr} rejects this well-posed design for K = 13 (its
     * rank check uses EJML's quality(), a product of diagonal ratios that shrinks with K).
     */
    static Density leastSquaresLog(BayesSpace space, double[] xs, double[] y) {
        org.ejml.data.DMatrixRMaj e = space.basisMatrix(xs);
        int k = space.dimension();
        org.ejml.data.DMatrixRMaj a = new org.ejml.data.DMatrixRMaj(xs.length, k + 1);
        org.ejml.data.DMatrixRMaj b = new org.ejml.data.DMatrixRMaj(xs.length, 1);
        for (int i = 0; i < xs.length; i++) {
            a.set(i, 0, 1);
            for (int j = 0; j < k; j++) {
                a.set(i, j + 1, e.get(i, j));
            }
            b.set(i, 0, Math.log(y[i]));
        }
        org.ejml.data.DMatrixRMaj sol = new org.ejml.data.DMatrixRMaj(k + 1, 1);
        if (!org.ejml.dense.row.CommonOps_DDRM.solve(a, b, sol)) {
            throw new IllegalStateException("least-squares fit of the age shares failed");
        }
        double[] c = new double[k];
        System.arraycopy(sol.data, 1, c, 0, k);
        return space.density(c);
    }
}
