package io.densa.regression.surveillance;

/**
 * A unit's alerts so far, over the periods a monitor has absorbed.
 *
 * @param id               the unit's id
 * @param firstFlagged     index of the first period in which it was flagged, or −1
 * @param lastFlagged      index of the latest period in which it was flagged, or −1
 * @param consecutive      number of consecutive flagged periods ending at the latest absorbed period
 *                         (0 when the latest period was not flagged)
 * @param flaggedPeriods   number of flagged periods in all
 * @param cumulativeDisplaced displaced events ({@link PeriodReport#displacedEvents}) summed over the
 *                         flagged periods that carried counts; 0 without counts (periods that
 *                         overlap, such as trailing windows, count their shared events again)
 */
public record AlertHistory(String id, int firstFlagged, int lastFlagged, int consecutive, int flaggedPeriods,
        double cumulativeDisplaced) {
    /** A unit never flagged. */
    static AlertHistory quiet(String id) {
        return new AlertHistory(id, -1, -1, 0, 0, 0);
    }

    /** This history after one more period. */
    AlertHistory next(int period, boolean flagged, double displaced) {
        if (!flagged) {
            return new AlertHistory(id, firstFlagged, lastFlagged, 0, flaggedPeriods, cumulativeDisplaced);
        }
        return new AlertHistory(id, firstFlagged < 0 ? period : firstFlagged, period, consecutive + 1,
                flaggedPeriods + 1, cumulativeDisplaced + (Double.isFinite(displaced) ? displaced : 0));
    }
}
