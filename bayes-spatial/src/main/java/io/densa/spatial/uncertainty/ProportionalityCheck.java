package io.densa.spatial.uncertainty;

import io.densa.core.TestResult;
import io.densa.spatial.kriging.FieldSimulator;
import io.densa.spatial.kriging.Kriging;
import io.densa.core.internal.RecordArrays;
import io.densa.spatial.variogram.VariogramOptions;
import io.densa.spatial.Locations;
import io.densa.spatial.variogram.EmpiricalVariogram;
import java.util.Objects;

/**
 * A check of the proportional covariance model of {@link PredictiveDistribution} on the data.
 *
 * <p>Under the model every linear combination vᵀX of the coordinates has variogram
 * vᵀΣv · g(h), proportional to the trace-variogram tr Σ · g(h): the ratio of the two does not
 * depend on the lag. With R the drift residuals, v_j the unit eigenvectors of RᵀR (the principal
 * directions, shares λ_j of the trace) and γ̂_j, γ̂ the empirical variograms of the scores Rv_j and
 * of R in the same bins b (pair counts N_b), the check computes the normalised ratios
 * ρ_jb = γ̂_j(b) / (λ_j γ̂(b)) and the statistic
 * <pre>  T = Σ_j Σ_b N_b (ln ρ_jb − l̄_j)² / Σ_b N_b,   l̄_j = Σ_b N_b ln ρ_jb / Σ_b N_b,</pre>
 * the pair-weighted spread of the log ratios across lags (0 when every direction's variogram has
 * the trace-variogram's shape). Its null distribution comes from B Gaussian fields simulated
 * under the model at the data locations (the kriging's covariance and error variances, the
 * estimated shape), each put through the same residuals, principal directions and variograms;
 * the Monte Carlo p-value is (1 + #{T* ≥ T}) / (1 + B) (a Monte Carlo test in the sense of
 * Besag &amp; Diggle (1977), Simple Monte Carlo tests for spatial pattern, Appl. Statist. 26(3) —
 * from memory). Decision rule: the model is rejected at level α when p ≤ α. Bins in which the
 * trace-variogram is zero are left out; a zero direction variogram counts as ratio 10⁻¹².
 *
 * <p>Immutable record: arrays are copied on construction and by the accessors; equality is by
 * content.
 *
 * @param shares              λ_j, the checked directions' shares of the trace (decreasing)
 * @param lags                mean lag of each bin
 * @param ratios              ρ_jb per direction and bin (near 1 when proportional; NaN for a bin
 *                            whose trace-variogram is 0, which the statistic leaves out)
 * @param directionStatistics T_j, each direction's term of T
 * @param statistic           T
 * @param pValue              the Monte Carlo p-value
 * @param replicates          B
 */
public record ProportionalityCheck(double[] shares, double[] lags, double[][] ratios, double[] directionStatistics,
        double statistic, double pValue, int replicates) implements TestResult {

    /** Copies the array components. */
    public ProportionalityCheck {
        shares = RecordArrays.copy(shares);
        lags = RecordArrays.copy(lags);
        ratios = RecordArrays.copy(ratios);
        directionStatistics = RecordArrays.copy(directionStatistics);
    }

    /** A copy of the {@code shares} component. */
    @Override
    public double[] shares() {
        return RecordArrays.copy(shares);
    }

    /** A copy of the {@code lags} component. */
    @Override
    public double[] lags() {
        return RecordArrays.copy(lags);
    }

    /** A copy of the {@code ratios} component. */
    @Override
    public double[][] ratios() {
        return RecordArrays.copy(ratios);
    }

    /** A copy of the {@code directionStatistics} component. */
    @Override
    public double[] directionStatistics() {
        return RecordArrays.copy(directionStatistics);
    }

    /** Whether the proportional covariance model is rejected at level alpha (p ≤ alpha). */
    public boolean rejects(double alpha) {
        return significantAt(alpha);
    }

    /** "Monte Carlo (B simulated fields), upper tail". */
    @Override
    public String method() {
        return "Monte Carlo (" + replicates + " simulated fields), upper tail";
    }

    /** Equality by content of every component. */
    @Override
    public boolean equals(Object o) {
        return RecordArrays.equal(this, o);
    }

    /** Hash of the content of every component. */
    @Override
    public int hashCode() {
        return RecordArrays.hash(this);
    }

    /** The components, arrays printed by content. */
    @Override
    public String toString() {
        return RecordArrays.describe(this);
    }

    static ProportionalityCheck run(PredictiveDistribution pd, VariogramOptions options, int directions,
            int replicates, long seed) {
        Objects.requireNonNull(options, "options");
        if (options.directions() != null) {
            throw new IllegalArgumentException("the proportionality check compares omnidirectional variograms; give"
                    + " variogram options without direction sectors");
        }
        if (directions < 1 || directions > pd.rank()) {
            throw new IllegalArgumentException("directions must be in [1, " + pd.rank() + "] (the shape's rank), got "
                    + directions);
        }
        PredictiveDistribution.checkReplicates(replicates);
        Kriging kr = pd.kriging();
        FieldSimulator sim = FieldSimulator.of(kr);
        Stat observed = statistic(kr.locations(), sim.dataResiduals(), kr.dimension(), options, directions);
        double p = PredictiveDistribution.monteCarloPValue(sim, pd.factorInternal(), pd.rank(), replicates, seed,
                options.parallel(), e -> statistic(kr.locations(), e, kr.dimension(), options, directions).total,
                observed.total);
        return new ProportionalityCheck(observed.shares, observed.lags, observed.ratios, observed.terms,
                observed.total, p, replicates);
    }

    private record Stat(double[] shares, double[] lags, double[][] ratios, double[] terms, double total) {
    }

    private static Stat statistic(Locations loc, double[] res, int k, VariogramOptions options, int directions) {
        int n = loc.size();
        double[] s = SymmetricEigen.shape(res, n, k);
        if (s == null) {
            throw new IllegalArgumentException("the coordinates' drift residuals are all zero: nothing to check");
        }
        SymmetricEigen eig = SymmetricEigen.of(s, k);
        EmpiricalVariogram trace = EmpiricalVariogram.of(loc, res, k, options);
        double[] gt = trace.semivariances();
        long[] counts = trace.counts();
        int nb = gt.length;
        double[][] ratios = new double[directions][nb];
        double[] terms = new double[directions];
        double[] shares = new double[directions];
        double[] scores = new double[n];
        for (int j = 0; j < directions; j++) {
            shares[j] = eig.values()[j];
            for (int i = 0; i < n; i++) {
                double v = 0;
                for (int c = 0; c < k; c++) {
                    v += res[i * k + c] * eig.vectors()[c * k + j];
                }
                scores[i] = v;
            }
            EmpiricalVariogram ev = EmpiricalVariogram.of(loc, scores, 1, options);
            double[] gj = ev.semivariances();
            if (gj.length != nb) {
                throw new IllegalStateException("direction and trace variograms have different bins (" + gj.length
                        + " and " + nb + ")");
            }
            double sw = 0, sl = 0;
            double[] lr = new double[nb];
            for (int b = 0; b < nb; b++) {
                if (!(gt[b] > 0)) {
                    ratios[j][b] = Double.NaN;
                    continue;
                }
                double rho = Math.max(1e-12, gj[b] / (shares[j] * gt[b]));
                ratios[j][b] = rho;
                lr[b] = Math.log(rho);
                sw += counts[b];
                sl += counts[b] * lr[b];
            }
            double mean = sw > 0 ? sl / sw : 0;
            double t = 0;
            for (int b = 0; b < nb; b++) {
                if (gt[b] > 0) {
                    double d = lr[b] - mean;
                    t += counts[b] * d * d;
                }
            }
            terms[j] = sw > 0 ? t / sw : 0;
        }
        double total = 0;
        for (double t : terms) {
            total += t;
        }
        return new Stat(shares, trace.meanLags(), ratios, terms, total);
    }
}
