package io.densa.io;

import io.densa.core.BayesSpace;
import java.util.Objects;

/**
 * Raw values on a periodic space ({@link BayesSpace#isPeriodic()}): the one place where the readers
 * of bayes-io and the event binning of bayes-spark reduce a value modulo the period before keeping
 * it as a sample or putting it into a bin. On a circle every finite value is a point of the domain,
 * so the readers' outside-range policy never applies there; only NaN and ±∞ are refused (the readers
 * name the row and column first).
 *
 * <p>The reduction is the same arithmetic as the space's own evaluation, so a sample wrapped here
 * and a sample the estimator wraps itself give the same estimate.
 */
public final class CircularValues {
    private CircularValues() {
    }

    /**
     * x reduced modulo P = upper − lower into [lower, upper): lower + ((x − lower) mod P); x itself
     * when it already lies there.
     *
     * @throws IllegalArgumentException if x is NaN or infinite, or lower &lt; upper are not finite
     */
    public static double wrap(double x, double lower, double upper) {
        if (!(Double.isFinite(lower) && Double.isFinite(upper) && lower < upper)) {
            throw new IllegalArgumentException("a circle needs finite lower < upper, got [" + lower + ", " + upper
                    + ")");
        }
        if (!Double.isFinite(x)) {
            throw new IllegalArgumentException("value " + x + " cannot be placed on the circle [" + lower + ", "
                    + upper + "); finite values are accepted (taken modulo the period " + (upper - lower) + ")");
        }
        if (x >= lower && x < upper) {
            return x;
        }
        double p = upper - lower;
        double y = lower + ((x - lower) - p * Math.floor((x - lower) / p));
        return y >= upper || y < lower ? lower : y;
    }

    /**
     * x on the circle of a periodic space, in [space.lower(), space.upper()).
     *
     * @throws IllegalStateException    if the space is not periodic
     * @throws IllegalArgumentException if x is NaN or infinite
     */
    public static double wrap(double x, BayesSpace space) {
        Objects.requireNonNull(space, "space");
        space.period(); // throws IllegalStateException on a bounded space, saying so
        return wrap(x, space.lower(), space.upper());
    }

    /**
     * The bin of x on a circle of period P whose bins span one period from e_0
     * ({@link Bins#checkAgainst(BayesSpace)}): x reduced into [e_0, e_0 + P), then
     * {@link Bins#indexOf}. A value in the sliver between e_D and e_0 + P (when e_D falls short of
     * e_0 + P by rounding) goes to the last bin. Always in [0, D).
     *
     * @throws IllegalArgumentException if x is NaN or infinite, or the period is not finite and &gt; 0
     */
    public static int binOf(Bins bins, double x, double period) {
        Objects.requireNonNull(bins, "bins");
        if (!(period > 0 && Double.isFinite(period))) {
            throw new IllegalArgumentException("period must be finite and > 0, got " + period);
        }
        double y = wrap(x, bins.lower(), bins.lower() + period);
        int j = bins.indexOf(y);
        return j >= bins.count() ? bins.count() - 1 : j;
    }
}
