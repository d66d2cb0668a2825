package io.densa.spatial.uncertainty;

import io.densa.core.BayesSpace;
import io.densa.core.DensaException;
import io.densa.core.Density;
import io.densa.core.DensitySet;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.UnitEstimate;
import io.densa.core.internal.Kernels;
import java.util.List;
import java.util.Objects;

/**
 * Intervals for the quantities an analyst reads off estimated densities — a quantile such as the
 * median, the probability above a threshold, the mean — in the data's units, from each unit's
 * estimate and the coordinate covariance its estimator reports.
 *
 * <p>Unit i's draws are ĉ_i + F_i z, z standard normal from stream i of the options' seed, with
 * ĉ_i the estimated coordinates and F_i F_iᵀ = Σ̂_i the reported covariance
 * ({@link EstimationDiagnostics#covariance()}: the sandwich covariance of the penalised fit, with λ
 * chosen per unit including the first-order effect of λ's uncertainty), F_i from its
 * eigen-decomposition (eigenvalues holding together at most 10⁻⁶ of the trace left out). Each draw
 * is turned into the requested quantities by the same engine as {@link PredictiveDistribution}
 * (quantiles, thresholds, mean, level, number of draws, data units and evaluation from
 * {@link UncertaintyOptions}); the summary's estimate is the quantity at ĉ_i itself, and the
 * interval is the central interval of the draws (a parametric bootstrap from the estimator's
 * Gaussian approximation, Efron &amp; Tibshirani (1993), An Introduction to the Bootstrap, ch. 6;
 * from memory). Results do not depend on threads.
 *
 * <p>The law is the estimator's first-order one: it carries the counting noise, and with λ chosen
 * per unit the choice of λ, but not the smoothing bias. Measured on 200 replicates of 400 events
 * from a normal law on [0, 100] (50 bins, cubic splines, every estimator default, 400 draws):
 * nominal 90 % intervals covered the true median in 86.0 % and the true P(X &gt; 60) in 90.5 % of
 * the replicates; the draws' SD of the median was 0.95 of its SD over the replicates and within
 * 3 % of the delta method's (EstimateUncertaintyTest). With a few tens of events the Gaussian law
 * is itself rough: read such intervals as indicative. The estimators take the observations of a
 * unit as independent: serially correlated observations (consecutive days of one monitor) make
 * the intervals too narrow.
 */
public final class EstimateUncertainty {
    private EstimateUncertainty() {
    }

    /**
     * Summaries for every unit of an estimate, unit i with stream i of the seed; units are processed
     * in parallel (results identical to the serial run) when the options allow.
     *
     * @throws IllegalArgumentException with no quantity in the options, or naming a unit whose reported
     *                                  covariance is not finite
     * @throws DensaException           naming the unit when a draw cannot be evaluated
     */
    public static List<UnitUncertainty> summarise(BatchEstimate estimates, UncertaintyOptions options) {
        Objects.requireNonNull(estimates, "estimates");
        Objects.requireNonNull(options, "options");
        DensitySet d = estimates.densities();
        int k = d.space().dimension();
        List<EstimationDiagnostics> diagnostics = estimates.diagnostics();
        double[][] factors = new double[d.size()][];
        String[] ids = new String[d.size()];
        for (int i = 0; i < factors.length; i++) {
            ids[i] = diagnostics.get(i).id();
            factors[i] = factor(diagnostics.get(i).covariance(), "unit " + ids[i], "the reported covariance", k,
                    false);
        }
        return summarise(d, factors, ids, options);
    }

    /**
     * Summaries for densities whose coordinates have the given Gaussian laws N(c_i, Σ_i), c_i the
     * coordinates of row i of {@code centres} — for example an observed density with the covariance
     * of its residual against a baseline's prediction — drawn and summarised as
     * {@link #summarise(BatchEstimate, UncertaintyOptions)} does (row i with stream i of the seed; the
     * same results as an estimate with those densities and covariances).
     *
     * @param covariances one K × K symmetric positive semi-definite matrix per row (not modified)
     * @throws IllegalArgumentException with no quantity in the options, on a count or shape mismatch, or
     *                                  naming a row whose covariance is not finite
     * @throws DensaException           naming the row when a draw cannot be evaluated
     */
    public static List<UnitUncertainty> summarise(DensitySet centres, List<double[][]> covariances,
            UncertaintyOptions options) {
        Objects.requireNonNull(centres, "centres");
        Objects.requireNonNull(covariances, "covariances");
        Objects.requireNonNull(options, "options");
        int n = centres.size();
        int k = centres.space().dimension();
        if (covariances.size() != n) {
            throw new IllegalArgumentException(n + " densities but " + covariances.size() + " covariances");
        }
        double[][] factors = new double[n][];
        String[] ids = new String[n];
        for (int i = 0; i < n; i++) {
            ids[i] = centres.id(i);
            double[][] c = Objects.requireNonNull(covariances.get(i), "covariance " + i);
            double[] flat = new double[k * k];
            if (c.length != k) {
                throw new IllegalArgumentException("row " + ids[i] + ": covariance has " + c.length
                        + " rows, the space's dimension is " + k);
            }
            for (int a = 0; a < k; a++) {
                if (c[a] == null || c[a].length != k) {
                    throw new IllegalArgumentException("row " + ids[i] + ": covariance row " + a + " must have " + k
                            + " entries");
                }
                System.arraycopy(c[a], 0, flat, a * k, k);
            }
            factors[i] = factor(flat, "row " + ids[i], "the covariance", k, true);
        }
        return summarise(centres, factors, ids, options);
    }

    private static List<UnitUncertainty> summarise(DensitySet d, double[][] factors, String[] ids,
            UncertaintyOptions options) {
        BayesSpace space = d.space();
        int n = d.size();
        int k = space.dimension();
        DrawEngine.quantities(options); // a quantity is requested: checked before any work
        UnitUncertainty[] out = new UnitUncertainty[n];
        int block = 8;
        int blocks = (n + block - 1) / block;
        Kernels.forEachBlock(blocks, options.parallel() && n > 1, b -> {
            for (int i = b * block; i < Math.min(n, b * block + block); i++) {
                DrawEngine engine = new DrawEngine(space, factors[i], factors[i].length / k, options);
                DrawEngine.Scratch s = engine.scratch();
                try {
                    engine.evaluate(d.get(i).coordinates(), 0, 1.0, i, s);
                } catch (DensaException e) {
                    throw new DensaException("unit " + ids[i] + ": " + e.getMessage(), e.diagnostics());
                }
                int p = engine.probs.length, t = engine.thresholds.length;
                out[i] = new UnitUncertainty(ids[i], engine.intervals(s, 0, p), engine.intervals(s, p, t),
                        engine.mean ? engine.intervals(s, p + t, 1).get(0) : null, s.exact);
            }
        });
        return List.of(out);
    }

    /**
     * Summaries for one estimate (stream 0 of the seed: the same as the first unit of a batch).
     *
     * @throws IllegalArgumentException as {@link #summarise(BatchEstimate, UncertaintyOptions)}
     * @throws DensaException           when a draw cannot be evaluated
     */
    public static UnitUncertainty summarise(UnitEstimate estimate, UncertaintyOptions options) {
        Objects.requireNonNull(estimate, "estimate");
        Density d = estimate.density();
        return summarise(new BatchEstimate(DensitySet.of(d.space(), new double[][] {d.coordinates()},
                new String[] {estimate.diagnostics().id()}), List.of(estimate.diagnostics())), options).get(0);
    }

    /**
     * F with F Fᵀ = Σ (K × r row-major; one zero column for a zero covariance) from Σ row-major;
     * {@code who} and {@code what} name the unit and the matrix in messages. A caller's covariance
     * ({@code strict}) must also be symmetric to 10⁻¹⁰ of its largest entry and positive
     * semi-definite to 10⁻¹⁰ of its largest eigenvalue (as {@link PredictiveDistribution#of(
     * io.densa.spatial.kriging.Kriging, double[][])} requires); an estimator's is so by construction.
     */
    static double[] factor(double[] cov, String who, String what, int k, boolean strict) {
        if (cov.length != k * k) {
            throw new IllegalArgumentException(who + ": covariance has " + cov.length
                    + " entries, the space's dimension is " + k);
        }
        double big = 0;
        for (double v : cov) {
            if (!Double.isFinite(v)) {
                throw new IllegalArgumentException(who + ": " + what + " is not finite (" + v + ")");
            }
            big = Math.max(big, Math.abs(v));
        }
        for (int a = 0; strict && a < k; a++) {
            for (int b = 0; b < a; b++) {
                if (Math.abs(cov[a * k + b] - cov[b * k + a]) > 1e-10 * big) {
                    throw new IllegalArgumentException(who + ": " + what + " is not symmetric: entries (" + a + ", "
                            + b + ") and (" + b + ", " + a + ") are " + cov[a * k + b] + " and " + cov[b * k + a]);
                }
            }
        }
        SymmetricEigen eig = SymmetricEigen.of(cov, k);
        double[] values = eig.values();
        if (strict && values[k - 1] < -1e-10 * Math.max(values[0], 0)) {
            throw new IllegalArgumentException(who + ": " + what + " is not positive semi-definite (eigenvalues "
                    + values[0] + " to " + values[k - 1] + ")");
        }
        double[] f = eig.factor();
        return f.length == 0 ? new double[k] : f;
    }
}
