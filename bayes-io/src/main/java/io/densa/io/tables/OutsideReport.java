package io.densa.io.tables;

/**
 * Account of the values that fell outside the accepted range while reading observations.
 *
 * @param policy       the policy that was applied
 * @param lower        lower end of the accepted range
 * @param upper        upper end of the accepted range
 * @param observations observations read (rows with a value), before the policy
 * @param dropped      observations left out under {@link OutsidePolicy#DROP}
 * @param clampedBelow values below the range moved to its lower end under {@link OutsidePolicy#CLAMP}
 * @param clampedAbove values above the range moved to its upper end under {@link OutsidePolicy#CLAMP}
 */
public record OutsideReport(OutsidePolicy policy, double lower, double upper, long observations, long dropped,
        long clampedBelow, long clampedAbove) {

    /** The report of a table that holds counts, not observations: nothing was outside. */
    static OutsideReport none(double lower, double upper) {
        return new OutsideReport(OutsidePolicy.REJECT, lower, upper, 0, 0, 0, 0);
    }

    /** Observations the policy touched (dropped or clamped). */
    public long outside() {
        return dropped + clampedBelow + clampedAbove;
    }

    /** Observations kept (clamped ones included). */
    public long kept() {
        return observations - dropped;
    }
}
