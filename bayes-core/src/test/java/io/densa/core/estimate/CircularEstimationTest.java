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
}
