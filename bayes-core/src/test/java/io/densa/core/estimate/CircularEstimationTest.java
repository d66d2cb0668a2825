package io.densa.core.estimate;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Density;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Estimation on a circle with bins that wrap around the cut point: recovery of a von Mises
 * sample's mean direction and mean resultant length, equivariance under rotation, and
 * invariance under relabelling the bins from another start.
 */
class CircularEstimationTest {
    private static final double PERIOD = 365;

    /**
     * A von Mises sample on [0, P) by rejection from the uniform: accept θ with probability
     * e^{κ(cos(θ − μ) − 1)} (von Neumann (1951), Various techniques used in connection with random
     * digits, NBS Applied Math. Series 12; the target is Mardia &amp; Jupp (2000), 3.5.4).
     */
    static double[] vonMisesSample(int n, double kappa, double mu, long seed) {
        SplittableRandom rnd = new SplittableRandom(seed);
        double[] out = new double[n];
        int i = 0;
        while (i < n) {
            double x = PERIOD * rnd.nextDouble();
            double th = 2 * Math.PI * (x - mu) / PERIOD;
            if (rnd.nextDouble() < Math.exp(kappa * (Math.cos(th) - 1))) {
                out[i++] = x;
            }
        }
        return out;
    }

    /** Counts of the values (taken modulo P) in the circular bins [e_j, e_{j+1}). */
    static int[] bin(double[] values, double[] edges) {
        int[] c = new int[edges.length - 1];
        for (double v : values) {
            double y = v;
            while (y < edges[0]) {
                y += PERIOD;
            }
            while (y >= edges[edges.length - 1]) {
                y -= PERIOD;
            }
            int j = 0;
            while (!(y < edges[j + 1])) {
                j++;
            }
            c[j]++;
        }
        return c;
    }

    /** Edges every `width` days from `first`, spanning one period (the last bin wraps when first ≠ 0). */
    static double[] edges(double first, double width) {
        int m = (int) Math.round(PERIOD / width);
        double[] e = new double[m + 1];
        for (int i = 0; i <= m; i++) {
            e[i] = first + width * i;
        }
        e[m] = first + PERIOD;
        return e;
    }

    /** Ratio I1(κ)/I0(κ) by the power series (Abramowitz &amp; Stegun (1964), 9.6.10). */
    static double besselRatio(double kappa) {
        double i0 = 0, i1 = 0, t0 = 1, t1 = kappa / 2;
        for (int k = 0; k < 200; k++) {
            i0 += t0;
            i1 += t1;
            double q = kappa * kappa / 4;
            t0 *= q / ((k + 1.0) * (k + 1.0));
            t1 *= q / ((k + 1.0) * (k + 2.0));
        }
        return i1 / i0;
    }

    @Test
    void recoversAVonMisesSampleAcrossTheCutPoint() {
        double kappa = 4, mu = 2; // mean direction at day 2 of 365, next to the cut point 0
        double[] sample = vonMisesSample(4000, kappa, mu, 20261203L);
        double[] e = edges(3, 5); // 3, 8, …, 368: the last bin [363, 368) ≡ [363, 365) ∪ [0, 3) holds the mode
        int[] counts = bin(sample, e);
        for (BayesSpace space : new BayesSpace[] {BayesSpace.periodicSplines(0, PERIOD, 4, 20),
                BayesSpace.fourier(0, PERIOD, 3)}) {
            Density f = PenalizedLikelihoodEstimator.withDefaults(space).fit(e, counts).density();
            // sampling error of the mean direction: about 1/(κ R √n) rad ≈ 0.019 rad ≈ 1.1 days
            // (Mardia & Jupp (2000), 4.8.2, the large-sample variance of the mean direction); 4 days allowed
            double m = f.circularMean();
            double d = Math.min(Math.abs(m - mu), PERIOD - Math.abs(m - mu));
            assertTrue(d < 4, space + ": mean direction " + m + ", expected about " + mu);
            // R = I1(κ)/I0(κ) = 0.8635 for κ = 4 (Mardia & Jupp (2000), 3.5.4); the sample R has a
            // standard error of about √((1 − R²)/(2n)) ≈ 0.006, bins and smoothing add a little
            double r = besselRatio(kappa);
            assertEquals(r, f.meanResultantLength(), 0.03, space.toString());
        }
    }

    @Test
    void rotatingTheDataRotatesTheEstimate() {
        double[] sample = vonMisesSample(1500, 2.5, 40, 99L);
        BayesSpace space = BayesSpace.periodicSplines(0, PERIOD, 4, 20); // half a period = 10 knot spacings
        double[] e = edges(3, 5);
        int[] counts = bin(sample, e);
        double[] rotated = e.clone();
        for (int i = 0; i < rotated.length; i++) {
            rotated[i] += PERIOD / 2;
        }
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space);
        Density f = est.fit(e, counts).density();
        Density g = est.fit(rotated, counts).density(); // the same counts half a period later
        for (int i = 0; i < 365; i++) {
            double x = i + 0.5;
            assertEquals(f.pdf(x), g.pdf(x + PERIOD / 2), 1e-7 * f.pdf(x), "pdf at " + x);
        }
        double shifted = (f.circularMean() + PERIOD / 2) % PERIOD;
        assertEquals(shifted, g.circularMean(), 1e-6);
        assertEquals(f.meanResultantLength(), g.meanResultantLength(), 1e-9);
    }

    @Test
    void binsGivenFromAnotherStartAreARelabelling() {
        double[] sample = vonMisesSample(2000, 3, 360, 5L);
        for (BayesSpace space : new BayesSpace[] {BayesSpace.periodicSplines(0, PERIOD, 4, 16),
                BayesSpace.fourier(0, PERIOD, 2)}) {
            double[] e = edges(3, 5);
            int[] counts = bin(sample, e);
            // the same bins starting at −2 (the wrapping bin first) and at 363 (the wrapping bin first, shifted a period)
            double[] e2 = edges(-2, 5);
            int[] c2 = bin(sample, e2);
            assertEquals(counts[counts.length - 1], c2[0]);
            double[] e3 = edges(363, 5);
            PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space);
            Density f = est.fit(e, counts).density();
            for (Density g : new Density[] {est.fit(e2, c2).density(), est.fit(e3, c2).density()}) {
                assertTrue(f.distance(g) < 1e-7 * (1 + f.norm()), space + ": distance " + f.distance(g));
            }
        }
    }

    @Test
    void edgesMustSpanOnePeriod() {
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(BayesSpace.fourier(0, PERIOD, 2));
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class,
                () -> est.fit(new double[] {0, 100, 200, 300}, new int[] {1, 2, 3}));
        assertTrue(ex.getMessage().contains("one period"), ex.getMessage());
        assertThrows(IllegalArgumentException.class, () -> est.fit(new double[] {0, 100, Double.NaN, 365}, new int[] {1, 2, 3}));
        // a bin layout well inside the period tolerance is accepted
        est.fit(new double[] {10, 100, 200, 375 + 1e-13}, new int[] {4, 5, 6});
    }

    @Test
    void samplesAreTakenModuloThePeriod() {
        double kappa = 3, mu = 362;
        double[] sample = vonMisesSample(1500, kappa, mu, 77L);
        double[] turned = sample.clone();
        SplittableRandom rnd = new SplittableRandom(3);
        for (int i = 0; i < turned.length; i++) {
            turned[i] += PERIOD * (rnd.nextInt(5) - 2); // the same days, some a year or two off
        }
        BayesSpace space = BayesSpace.periodicSplines(0, PERIOD, 4, 20);
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(space)
                .withCriterion(SmoothingCriterion.AIC);
        UnitEstimate f = est.fitSample(sample);
        UnitEstimate g = est.fitSample(turned);
        assertTrue(f.density().distance(g.density()) < 1e-8, "distance " + f.density().distance(g.density()));
        assertEquals(0.0, f.diagnostics().extrapolationShare(), 0.0);
        // mean direction within sampling error (Mardia & Jupp (2000), 4.8.2: about 1.3 days here), R = I1/I0 (3.5.4)
        double m = f.density().circularMean();
        assertTrue(Math.min(Math.abs(m - mu), PERIOD - Math.abs(m - mu)) < 5, "mean direction " + m);
        assertEquals(besselRatio(kappa), f.density().meanResultantLength(), 0.03);
    }

    @Test
    void smoothingSplineEstimatorAcceptsWrappingBins() {
        double kappa = 4, mu = 2;
        double[] sample = vonMisesSample(4000, kappa, mu, 20261204L);
        BayesSpace space = BayesSpace.periodicSplines(0, PERIOD, 4, 12);
        SmoothingSplineEstimator est = SmoothingSplineEstimator.withDefaults(space);
        double[] e = edges(3, 5);
        int[] counts = bin(sample, e);
        Density f = est.fit(e, counts).density();
        double m = f.circularMean();
        assertTrue(Math.min(Math.abs(m - mu), PERIOD - Math.abs(m - mu)) < 4, "mean direction " + m);
        assertEquals(besselRatio(kappa), f.meanResultantLength(), 0.05);
        double[] e2 = edges(-2, 5);
        Density g = est.fit(e2, bin(sample, e2)).density();
        assertTrue(f.distance(g) < 1e-7 * (1 + f.norm()), "relabelled bins: distance " + f.distance(g));
    }

    @Test
    void fourierPenaltyOfAVonMisesDensityIsItsClosedForm() {
        // clr = κ cos(ω(x − μ)), ω = 2π/P: ∫_0^P (clr^{(l)})² dx = κ² ω^{2l} P/2 (direct integration
        // of cos² over a period), with no boundary terms
        BayesSpace space = BayesSpace.fourier(0, PERIOD, 3);
        double kappa = 2.5, mu = 100, w = 2 * Math.PI / PERIOD;
        double t = w * mu;
        double[] c = {kappa * Math.sqrt(PERIOD / 2) * Math.cos(t), kappa * Math.sqrt(PERIOD / 2) * Math.sin(t), 0, 0, 0, 0};
        for (int l = 1; l <= 3; l++) {
            double[] om = PenalizedLikelihoodEstimator.withDefaults(space).withPenaltyOrder(l).penalty().data;
            double q = quadratic(om, c);
            double expected = kappa * kappa * Math.pow(w, 2 * l) * PERIOD / 2;
            assertEquals(expected, q, 1e-10 * expected, "order " + l);
        }
    }

    @Test
    void periodicSplinePenaltyHasNoBoundary() {
        // rotating a density by one knot spacing permutes the periodic B-splines, so a penalty without
        // boundary (the integral over the whole circle) gives the rotated density the same roughness
        BayesSpace space = BayesSpace.periodicSplines(0, 12, 4, 8);
        double h = 1.5;
        double[] om = PenalizedLikelihoodEstimator.withDefaults(space).penalty().data;
        SplittableRandom rnd = new SplittableRandom(21);
        for (int rep = 0; rep < 5; rep++) {
            double[] c = new double[space.dimension()];
            for (int k = 0; k < c.length; k++) {
                c[k] = rnd.nextDouble(-1, 1);
            }
            Density f = space.density(c);
            Density g = space.projectLogPdf(x -> f.logPdf(x - h)).density();
            double qf = quadratic(om, c), qg = quadratic(om, g.coordinates());
            assertEquals(qf, qg, 1e-9 * qf);
            assertTrue(qf > 0);
        }
        // only constants have zero roughness on the circle: the penalty is positive definite on the clr subspace
        org.ejml.data.DMatrixRMaj m = PenalizedLikelihoodEstimator.withDefaults(space).penalty();
        var eig = org.ejml.dense.row.factory.DecompositionFactory_DDRM.eig(m.numRows, false, true);
        assertTrue(eig.decompose(m.copy()));
        double smallest = Double.POSITIVE_INFINITY;
        for (int i = 0; i < m.numRows; i++) {
            smallest = Math.min(smallest, eig.getEigenvalue(i).real);
        }
        assertTrue(smallest > 1e-8, "smallest eigenvalue " + smallest);
    }

    private static double quadratic(double[] m, double[] c) {
        int k = c.length;
        double s = 0;
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                s += c[i] * m[i * k + j] * c[j];
            }
        }
        return s;
    }

    @Test
    void detectionLimitsAreRefusedOnACircle() {
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(BayesSpace.fourier(0, PERIOD, 2));
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, () -> est.fitAll(edges(0, 73),
                new int[][] {{1, 2, 3, 4, 5}}, null, DetectionLimits.lower(100)));
        assertTrue(ex.getMessage().contains("circle"), ex.getMessage());
    }
}
