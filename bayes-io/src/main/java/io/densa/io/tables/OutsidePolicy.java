package io.densa.io.tables;

/**
 * What a reader does with an observation whose value lies outside the accepted range: the
 * domain [a, b] of the space for samples, the range [e_0, e_D] of the bins for histograms. A
 * missing or non-numeric value is always an error, whatever the policy. The count of values the
 * policy touched is reported in an {@link OutsideReport}.
 *
 * <p>On a periodic space the policy never applies: every finite value is a point of the circle and is
 * reduced modulo the period ({@link io.densa.io.CircularValues}) when the reader is given the space.
 */
public enum OutsidePolicy {
    /** Fail with an IllegalArgumentException naming the source, row, unit and value (the default). */
    REJECT,
    /** Leave the observation out, and count it. */
    DROP,
    /**
     * Move the value to the nearest end of the range (into the first or the last bin), and count it.
     * Only sensible when the range was chosen to cover nearly all of the data.
     */
    CLAMP
}
