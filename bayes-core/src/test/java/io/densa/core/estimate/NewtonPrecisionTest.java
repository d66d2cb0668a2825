package io.densa.core.estimate;

import static io.densa.core.estimate.EstimationTestSupport.edges;
import static io.densa.core.estimate.EstimationTestSupport.rng;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.EstimationTestSupport.Truth;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegrator;
import org.apache.commons.math3.analysis.integration.gauss.GaussIntegratorFactory;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.random.RandomGenerator;
import org.junit.jupiter.api.Test;

/**
 * The penalised-likelihood estimate is the exact maximiser of its documented objective: the
 * converged coordinates agree within 10⁻⁸ with an independent maximiser written here, for binned
 * counts and raw samples, dense and sparse, at the smoothing parameter the default criterion chose.
 *
 * <p>The objective is re-implemented from its definition in {@link PenalizedLikelihoodEstimator}
 * (Silverman (1982), On the estimation of a probability density function by the maximum penalized
 * likelihood method, Ann. Statist. 10(3); from memory) in the space's orthonormal coordinates c,
 * with clr(x) = Σ c_k e_k(x) (e from {@link BayesSpace#basisAt}, the definition of the
 * coordinates), Lebesgue reference on [0, 1]:
 * <pre>
 *   Φ(c) = ℓ(c) − λ c'Ωc − (w / (2 P(I))) c'c,
 *   counts:  ℓ = Σ_j n_j log(A_j / Σ_i A_i),  A_j = ∫_{bin j} exp(clr) dx,
 *   samples: ℓ = Σ_i clr(x_i) − n log ∫_0^1 exp(clr) dx,
 *   Ω_kl = ∫_0^1 e_k''(x) e_l''(x) dx,
 * </pre>
 * w the reference-prior weight of the estimator. Every integral uses Gauss–Legendre rules from
 * Apache Commons Math ({@link GaussIntegratorFactory}, 12 points on each piece of a bin between
 * knots), not the estimator's quadrature; e'' comes from central differences inside each knot span
 * (exact for the cubic pieces up to rounding), integrated by a 3-point rule (exact for the product of
 * two linear functions). The independent maximiser is Newton's method on Φ with its own gradient and
 * Hessian, Cholesky solves from Commons Math and step halving, started at c = 0 and iterated until the
 * step is below 10⁻¹⁴.
 */
class NewtonPrecisionTest {
    private static final double TOL = 1e-8;
    private static final int KNOTS = 8;

    @Test
    void denseCountsAreTheExactMaximiser() {
        Truth t = EstimationTestSupport.mixture();
        check(t.counts(20_000, 40, rng(101)), null, 40);
    }

    /** The plain penalised likelihood (reference prior removed), dense counts. */
    @Test
    void denseCountsWithoutReferencePriorAreTheExactMaximiser() {
        Truth t = EstimationTestSupport.mixture();
        check(t.counts(20_000, 40, rng(105)), null, 40, 0.0);
    }

    @Test
    void sparseCountsAreTheExactMaximiser() {
        Truth t = EstimationTestSupport.mixture();
        check(t.counts(30, 40, rng(102)), null, 40);
    }

    @Test
    void denseSampleIsTheExactMaximiser() {
        check(null, EstimationTestSupport.normal().sample(5_000, rng(103)), 0);
    }

    @Test
    void sparseSampleIsTheExactMaximiser() {
        check(null, EstimationTestSupport.mixture().sample(30, rng(104)), 0);
    }

    /**
     * Counts with a lower detection limit (values below edge 10 of 40 recorded in bin 10): the
     * estimate is the exact maximiser of the interval-censored likelihood, in which the cell
     * [0, e_11) carries the counts of bins 0–10 (Turnbull (1976), J. R. Stat. Soc. B 38(3)): Φ above
     * on the merged cells, maximised independently.
     */
    @Test
    void censoredCountsAreTheExactMaximiserOfTheCensoredLikelihood() {
        Truth t = EstimationTestSupport.mixture();
        int[] raw = t.counts(20_000, 40, rng(107));
        double[] e = edges(0, 1, 40);
        int[] clipped = raw.clone();
        for (int j = 0; j < 10; j++) {
            clipped[10] += clipped[j];
            clipped[j] = 0;
        }
        BayesSpace space = BayesSpace.splines(0, 1, 4, KNOTS);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space);
        BatchEstimate fit = est.fitAll(e, new int[][] {clipped, raw}, new String[] {"clipped", "plain"},
                new DetectionLimits(new double[] {e[10], Double.NaN}, new double[] {Double.NaN, Double.NaN}));
        assertTrue(fit.diagnostics().get(0).converged(), fit.diagnostics().get(0).toString());
        // the unit without a limit is fitted exactly as without limits
        assertTrue(java.util.Arrays.equals(est.fit(e, raw).density().coordinates(), fit.densities().get(1)
                .coordinates()));
        double[] cells = new double[31];
        int[] merged = new int[30];
        cells[0] = 0;
        for (int j = 11; j <= 40; j++) {
            cells[j - 10] = e[j];
        }
        for (int j = 0; j <= 10; j++) {
            merged[0] += clipped[j];
        }
        System.arraycopy(clipped, 11, merged, 1, 29);
        double lambda = fit.diagnostics().get(0).smoothing();
        double[] exact = new Objective(space, merged, null, cells, lambda, est.referencePriorWeight()).maximise();
        double[] c = fit.densities().get(0).coordinates();
        double maxDiff = 0;
        for (int k = 0; k < c.length; k++) {
            maxDiff = Math.max(maxDiff, Math.abs(c[k] - exact[k]));
        }
        assertTrue(maxDiff <= TOL, "max coordinate difference " + maxDiff);
        // and it is not the fit of the same counts with every bin as recorded (the spike is gone)
        double[] uncensored = est.withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED).fit(e, clipped).density()
                .coordinates();
        double gap = 0;
        for (int k = 0; k < c.length; k++) {
            gap = Math.max(gap, Math.abs(c[k] - uncensored[k]));
        }
        assertTrue(gap > 0.1, "censoring changed the coordinates by only " + gap);
        // the default reads the ten empty bins and the spike as the declared limit does, unasked
        assertTrue(java.util.Arrays.equals(c, est.fit(e, clipped).density().coordinates()),
                "the default reading of the empty end differs from the declared limit");
    }

    /**
     * The default reading of empty ends where the bins do not reach the domain's end (40 bins on
     * [0.1, 1] in a space on [0, 1]): the dense unit's censored cell [0, e_11) reaches the domain's
     * end, beyond the first bin, so it is integrated on cells of its own; the estimate is the exact
     * maximiser of that interval-censored likelihood, maximised independently (as above).
     */
    @Test
    void censoredCellReachesTheDomainBeyondTheBins() {
        Truth t = EstimationTestSupport.mixture();
        double[] e = new double[41];
        for (int j = 0; j <= 40; j++) {
            e[j] = 0.1 + 0.9 * j / 40;
        }
        int[] counts = new int[40];
        org.apache.commons.math3.random.RandomGenerator r = rng(108);
        for (double x : t.sample(20_000, r)) {
            if (x >= 0.1) {
                counts[Math.min(39, (int) Math.floor((Math.max(x, e[10]) - 0.1) / 0.9 * 40))]++;
            }
        }
        BayesSpace space = BayesSpace.splines(0, 1, 4, KNOTS);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space);
        UnitEstimate fit = est.fit(e, counts);
        assertTrue(fit.diagnostics().converged(), fit.diagnostics().toString());
        double[] cells = new double[31];
        int[] merged = new int[30];
        for (int j = 11; j <= 40; j++) {
            cells[j - 10] = e[j];
        }
        for (int j = 0; j <= 10; j++) {
            merged[0] += counts[j];
        }
        System.arraycopy(counts, 11, merged, 1, 29);
        double[] c = fit.density().coordinates();
        // the independent Newton's observed Hessian is indefinite far from the optimum here (a wide
        // cell with many events curves the likelihood up): start it at the estimate, from where it
        // must not move if the estimate is that objective's maximiser
        double[] exact = new Objective(space, merged, null, cells, fit.diagnostics().smoothing(),
                est.referencePriorWeight()).maximise(c);
        double maxDiff = 0;
        for (int k = 0; k < c.length; k++) {
            maxDiff = Math.max(maxDiff, Math.abs(c[k] - exact[k]));
        }
        assertTrue(maxDiff <= TOL, "max coordinate difference " + maxDiff);
    }

    /**
     * The default criterion's reported value is the Laplace approximation of its definition
     * ({@link SmoothingCriterion#MARGINAL_LIKELIHOOD}) evaluated independently at the independent
     * maximiser ĉ: V = −2ℓ(ĉ) + 2λ ĉ'Ωĉ + (w/P(I)) ‖ĉ‖² + log det H − log det(2λΩ + (w/P(I)) I),
     * H = −∇²Φ(ĉ) from this test's own Hessian (observed information plus penalty and prior;
     * Tierney &amp; Kadane (1986), Accurate approximations for posterior moments and marginal
     * densities, JASA 81 — from memory; the observed, not the expected, information), determinants
     * from Commons Math's Cholesky decomposition. Dense and sparse counts, at the λ the criterion
     * chose; within 10⁻⁶ absolute (V ≈ 10² … 10⁵).
     */
    @Test
    void reportedMarginalLikelihoodIsTheLaplaceApproximation() {
        Truth t = EstimationTestSupport.mixture();
        for (int[] counts : new int[][] {t.counts(20_000, 40, rng(108)), t.counts(60, 40, rng(109))}) {
            BayesSpace space = BayesSpace.splines(0, 1, 4, KNOTS);
            PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space);
            EstimationDiagnostics d = est.fit(edges(0, 1, 40), counts).diagnostics();
            assertTrue(d.converged(), d.toString());
            double lambda = d.smoothing();
            Objective phi = new Objective(space, counts, null, edges(0, 1, 40), lambda, est.referencePriorWeight());
            double[] c = phi.maximise();
            int k = c.length;
            double cc = Objective.dot(c, c);
            double pen = Objective.quad(phi.omega, c);
            double loglik = phi.value(c) + lambda * pen + phi.ridge * cc;
            double[] g = new double[k];
            double[][] h = new double[k][k];
            phi.derivatives(c, g, h);
            double[][] prior = new double[k][k];
            for (int i = 0; i < k; i++) {
                for (int j = 0; j < k; j++) {
                    h[i][j] = -h[i][j];
                    prior[i][j] = 2 * lambda * phi.omega[i][j] + (i == j ? 2 * phi.ridge : 0);
                }
            }
            double v = -2 * loglik + 2 * lambda * pen + 2 * phi.ridge * cc
                    + Math.log(new CholeskyDecomposition(new Array2DRowRealMatrix(h), 1e-12, 0).getDeterminant())
                    - Math.log(new CholeskyDecomposition(new Array2DRowRealMatrix(prior), 1e-12, 0).getDeterminant());
            System.out.printf("N=%d: lambda %.4g, criterion %.10f, independent Laplace %.10f%n", sum(counts), lambda,
                    d.criterionValue(), v);
            assertEquals(v, d.criterionValue(), 1e-6, "N = " + sum(counts));
            assertEquals(loglik, d.logLikelihood(), 1e-8 * Math.abs(loglik), "log-likelihood, N = " + sum(counts));
        }
    }

    private static void check(int[] counts, double[] sample, int bins) {
        check(counts, sample, bins, PenalizedLikelihoodEstimator.DEFAULT_PRIOR_WEIGHT);
    }

    private static void check(int[] counts, double[] sample, int bins, double priorWeight) {
        BayesSpace space = BayesSpace.splines(0, 1, 4, KNOTS);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space).withReferencePrior(priorWeight);
        UnitEstimate fit = counts != null ? est.fit(edges(0, 1, bins), counts) : est.fitSample(sample);
        assertTrue(fit.diagnostics().converged(), fit.diagnostics().toString());
        double lambda = fit.diagnostics().smoothing();
        Objective phi = new Objective(space, counts, sample, counts != null ? edges(0, 1, bins) : null, lambda,
                est.referencePriorWeight());
        double[] exact = phi.maximise();
        double[] c = fit.density().coordinates();
        double maxDiff = 0;
        for (int k = 0; k < c.length; k++) {
            maxDiff = Math.max(maxDiff, Math.abs(c[k] - exact[k]));
        }
        System.out.printf("%s: lambda %.4g, max |c_estimator - c_independent| = %.3g, Phi gap %.3g%n",
                counts != null ? "counts N=" + sum(counts) : "sample n=" + sample.length, lambda, maxDiff,
                phi.value(exact) - phi.value(c));
        assertTrue(maxDiff <= TOL, "max coordinate difference " + maxDiff);
        // the penalty matrix built here agrees with the estimator's (a check on the test itself)
        double[][] omega = phi.omega;
        for (int i = 0; i < omega.length; i++) {
            for (int j = 0; j < omega.length; j++) {
                assertEquals(est.penalty().get(i, j), omega[i][j], 1e-8 * (1 + Math.abs(omega[i][j])));
            }
        }
    }

    private static long sum(int[] n) {
        long s = 0;
        for (int v : n) {
            s += v;
        }
        return s;
    }

    /** Φ with its own quadrature, gradient and Hessian. */
    private static final class Objective {
        final int k;
        final double lambda;
        final double ridge; // w / (2 P(I))
        final double[][] omega;
        final int[] counts; // null: sample
        final double[] linear; // sample: Σ_i e(x_i)
        final int n;
        // quadrature: nodes grouped by bin (one group for samples)
        final double[][] nodeBasis; // per node: e(x_q)
        final double[] nodeWeight;
        final int[] binStart;

        Objective(BayesSpace space, int[] counts, double[] sample, double[] binEdges, double lambda,
                double priorWeight) {
            this.k = space.dimension();
            this.lambda = lambda;
            this.ridge = priorWeight / (2 * (space.upper() - space.lower()));
            this.counts = counts;
            double[] knots = new double[KNOTS + 2];
            for (int i = 0; i < knots.length; i++) {
                knots[i] = (double) i / (KNOTS + 1);
            }
            GaussIntegratorFactory factory = new GaussIntegratorFactory();
            // penalty from central second differences inside each knot span
            omega = new double[k][k];
            for (int s = 0; s + 1 < knots.length; s++) {
                GaussIntegrator rule = factory.legendre(3, knots[s], knots[s + 1]);
                for (int q = 0; q < rule.getNumberOfPoints(); q++) {
                    double x = rule.getPoint(q);
                    double h = 0.9 * Math.min(x - knots[s], knots[s + 1] - x);
                    double[] lo = space.basisAt(x - h);
                    double[] mid = space.basisAt(x);
                    double[] hi = space.basisAt(x + h);
                    double[] d2 = new double[k];
                    for (int i = 0; i < k; i++) {
                        d2[i] = (lo[i] - 2 * mid[i] + hi[i]) / (h * h);
                    }
                    for (int i = 0; i < k; i++) {
                        for (int j = 0; j < k; j++) {
                            omega[i][j] += rule.getWeight(q) * d2[i] * d2[j];
                        }
                    }
                }
            }
            // integration nodes: each bin (or the whole domain) cut at the knots, 12 points a piece
            double[] e = counts != null ? binEdges : new double[] {0, 1};
            int groups = e.length - 1;
            java.util.List<double[]> basisList = new java.util.ArrayList<>();
            java.util.List<Double> weights = new java.util.ArrayList<>();
            binStart = new int[groups + 1];
            for (int j = 0; j < groups; j++) {
                binStart[j] = weights.size();
                java.util.List<Double> cuts = new java.util.ArrayList<>();
                cuts.add(e[j]);
                for (double t : knots) {
                    if (t > e[j] && t < e[j + 1]) {
                        cuts.add(t);
                    }
                }
                cuts.add(e[j + 1]);
                for (int p = 0; p + 1 < cuts.size(); p++) {
                    GaussIntegrator rule = factory.legendreHighPrecision(12, cuts.get(p), cuts.get(p + 1));
                    for (int q = 0; q < rule.getNumberOfPoints(); q++) {
                        basisList.add(space.basisAt(rule.getPoint(q)));
                        weights.add(rule.getWeight(q));
                    }
                }
            }
            binStart[groups] = weights.size();
            nodeBasis = basisList.toArray(new double[0][]);
            nodeWeight = new double[weights.size()];
            for (int q = 0; q < nodeWeight.length; q++) {
                nodeWeight[q] = weights.get(q);
            }
            linear = new double[k];
            if (sample != null) {
                n = sample.length;
                for (double x : sample) {
                    double[] b = space.basisAt(x);
                    for (int i = 0; i < k; i++) {
                        linear[i] += b[i];
                    }
                }
            } else {
                n = (int) sum(counts);
            }
        }

        /** Φ(c). */
        double value(double[] c) {
            double[] eta = eta(c);
            double max = Double.NEGATIVE_INFINITY;
            for (double v : eta) {
                max = Math.max(max, v);
            }
            int groups = binStart.length - 1;
            double[] mass = new double[groups];
            double z = 0;
            for (int j = 0; j < groups; j++) {
                for (int q = binStart[j]; q < binStart[j + 1]; q++) {
                    mass[j] += nodeWeight[q] * Math.exp(eta[q] - max);
                }
                z += mass[j];
            }
            double ll = 0;
            if (counts != null) {
                for (int j = 0; j < groups; j++) {
                    if (counts[j] > 0) {
                        ll += counts[j] * (Math.log(mass[j]) - Math.log(z));
                    }
                }
            } else {
                for (int i = 0; i < k; i++) {
                    ll += linear[i] * c[i];
                }
                ll -= n * (max + Math.log(z));
            }
            return ll - lambda * quad(omega, c) - ridge * dot(c, c);
        }

        private double[] eta(double[] c) {
            double[] eta = new double[nodeWeight.length];
            for (int q = 0; q < eta.length; q++) {
                eta[q] = dot(nodeBasis[q], c);
            }
            return eta;
        }

        /** Newton's method from c = 0 with step halving; returns the maximiser. */
        double[] maximise() {
            return maximise(new double[k]);
        }

        /** Damped Newton from the given coordinates (not modified). */
        double[] maximise(double[] start) {
            double[] c = start.clone();
            double f = value(c);
            for (int it = 0; it < 200; it++) {
                double[] g = new double[k];
                double[][] h = new double[k][k];
                derivatives(c, g, h);
                double[][] neg = new double[k][k];
                for (int i = 0; i < k; i++) {
                    for (int j = 0; j < k; j++) {
                        neg[i][j] = -0.5 * (h[i][j] + h[j][i]);
                    }
                }
                double[] step = new CholeskyDecomposition(new Array2DRowRealMatrix(neg), 1e-14, 1e-300).getSolver()
                        .solve(new ArrayRealVector(g)).toArray();
                double size = 0;
                for (double s : step) {
                    size = Math.max(size, Math.abs(s));
                }
                double t = 1;
                double[] trial = new double[k];
                double ft = f;
                for (int ls = 0; ls < 60; ls++) {
                    for (int i = 0; i < k; i++) {
                        trial[i] = c[i] + t * step[i];
                    }
                    ft = value(trial);
                    if (ft >= f || size * t < 1e-12) {
                        break;
                    }
                    t *= 0.5;
                }
                System.arraycopy(trial, 0, c, 0, k);
                f = ft;
                if (size < 1e-14 * (1 + maxAbs(c))) {
                    return c;
                }
            }
            throw new AssertionError("independent Newton did not converge");
        }

        /** Gradient and Hessian of Φ at c. */
        void derivatives(double[] c, double[] grad, double[][] hess) {
            double[] eta = eta(c);
            double max = Double.NEGATIVE_INFINITY;
            for (double v : eta) {
                max = Math.max(max, v);
            }
            int groups = binStart.length - 1;
            double z = 0;
            double[] m = new double[k];
            double[][] s = new double[k][k];
            double[] gl = new double[k];
            double[][] hl = new double[k][k];
            for (int j = 0; j < groups; j++) {
                double a = 0;
                double[] mj = new double[k];
                double[][] sj = new double[k][k];
                for (int q = binStart[j]; q < binStart[j + 1]; q++) {
                    double w = nodeWeight[q] * Math.exp(eta[q] - max);
                    a += w;
                    double[] b = nodeBasis[q];
                    for (int i = 0; i < k; i++) {
                        mj[i] += w * b[i];
                        for (int l = 0; l < k; l++) {
                            sj[i][l] += w * b[i] * b[l];
                        }
                    }
                }
                z += a;
                for (int i = 0; i < k; i++) {
                    m[i] += mj[i];
                    for (int l = 0; l < k; l++) {
                        s[i][l] += sj[i][l];
                    }
                }
                if (counts != null && counts[j] > 0) {
                    double nj = counts[j];
                    for (int i = 0; i < k; i++) {
                        gl[i] += nj * mj[i] / a;
                        for (int l = 0; l < k; l++) {
                            hl[i][l] += nj * (sj[i][l] / a - mj[i] * mj[l] / (a * a));
                        }
                    }
                }
            }
            double total = n;
            for (int i = 0; i < k; i++) {
                grad[i] = gl[i] + linear[i] - total * m[i] / z;
                for (int l = 0; l < k; l++) {
                    hess[i][l] = hl[i][l] - total * (s[i][l] / z - m[i] * m[l] / (z * z));
                }
            }
            for (int i = 0; i < k; i++) {
                double r = 0;
                for (int l = 0; l < k; l++) {
                    r += omega[i][l] * c[l];
                    hess[i][l] -= 2 * lambda * omega[i][l];
                }
                grad[i] -= 2 * lambda * r + 2 * ridge * c[i];
                hess[i][i] -= 2 * ridge;
            }
        }

        private static double quad(double[][] m, double[] c) {
            double s = 0;
            for (int i = 0; i < c.length; i++) {
                for (int j = 0; j < c.length; j++) {
                    s += c[i] * m[i][j] * c[j];
                }
            }
            return s;
        }

        private static double dot(double[] a, double[] b) {
            double s = 0;
            for (int i = 0; i < a.length; i++) {
                s += a[i] * b[i];
            }
            return s;
        }

        private static double maxAbs(double[] c) {
            double m = 0;
            for (double v : c) {
                m = Math.max(m, Math.abs(v));
            }
            return m;
        }
    }
}
