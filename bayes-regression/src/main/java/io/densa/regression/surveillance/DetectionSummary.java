package io.densa.regression.surveillance;

import java.util.Arrays;
import java.util.List;
import java.util.Objects;

/**
 * How a monitor did on data whose truth is known: for each unit with an onset (the first period
 * of a genuine change), the detection delay in periods from the onset to the first flag at or
 * after it; and the false alerts, flags of units before their onset or without one, per
 * unit-year of periods at risk.
 *
 * @param delays               delay per unit with an onset that was detected (periods), in unit order
 * @param detected             units with an onset that were flagged at or after it
 * @param missed               units with an onset that were never flagged at or after it
 * @param falseAlerts          flags before the onset or of units without one
 * @param unitYearsAtRisk      unit-periods before the onset (or all periods without one) / periods per year
 * @param falseAlertsPerUnitYear falseAlerts / unitYearsAtRisk (NaN with nothing at risk)
 * @param medianDelay          median of the delays, NaN when none was detected
 */
public record DetectionSummary(int[] delays, int detected, int missed, int falseAlerts, double unitYearsAtRisk,
        double falseAlertsPerUnitYear, double medianDelay) {
    /** Copies the delays. */
    public DetectionSummary {
        delays = delays.clone();
    }

    @Override
    public int[] delays() {
        return delays.clone();
    }

    /**
     * Evaluates flags against known onsets.
     *
     * @param reports        the monitor's reports, one per scored period, in order
     * @param onsets         per unit, the index of the period in which its change begins, or −1
     * @param periodsPerYear periods in a year (52 for weeks), &gt; 0
     * @throws IllegalArgumentException when a report has another number of units than onsets
     */
    public static DetectionSummary evaluate(List<PeriodReport> reports, int[] onsets, double periodsPerYear) {
        Objects.requireNonNull(reports, "reports");
        Objects.requireNonNull(onsets, "onsets");
        if (!(periodsPerYear > 0) || Double.isInfinite(periodsPerYear)) {
            throw new IllegalArgumentException("periods per year must be finite and > 0, got " + periodsPerYear);
        }
        int n = onsets.length;
        int[] firstAfter = new int[n];
        Arrays.fill(firstAfter, -1);
        int falseAlerts = 0;
        long atRisk = 0;
        for (PeriodReport r : reports) {
            if (r.scores().units().size() != n) {
                throw new IllegalArgumentException("report of period " + r.period() + " has "
                        + r.scores().units().size() + " units, onsets " + n);
            }
            for (int i = 0; i < n; i++) {
                boolean before = onsets[i] < 0 || r.period() < onsets[i];
                if (before) {
                    atRisk++;
                    if (r.flagged(i)) {
                        falseAlerts++;
                    }
                } else if (r.flagged(i) && firstAfter[i] < 0) {
                    firstAfter[i] = r.period();
                }
            }
        }
        int detected = 0;
        int missed = 0;
        int[] delays = new int[n];
        for (int i = 0; i < n; i++) {
            if (onsets[i] < 0) {
                continue;
            }
            if (firstAfter[i] >= 0) {
                delays[detected++] = firstAfter[i] - onsets[i];
            } else {
                missed++;
            }
        }
        int[] dl = Arrays.copyOf(delays, detected);
        int[] sorted = dl.clone();
        Arrays.sort(sorted);
        double median = detected == 0 ? Double.NaN
                : detected % 2 == 1 ? sorted[detected / 2] : 0.5 * (sorted[detected / 2 - 1] + sorted[detected / 2]);
        double years = atRisk / periodsPerYear;
        return new DetectionSummary(dl, detected, missed, falseAlerts, years,
                years > 0 ? falseAlerts / years : Double.NaN, median);
    }

    @Override
    public String toString() {
        return String.format(java.util.Locale.ROOT, "DetectionSummary[detected %d, missed %d, median delay %s periods, "
                + "%d false alerts in %.1f unit-years (%.3f per unit-year)]", detected, missed,
                Double.isNaN(medianDelay) ? "-" : String.valueOf(medianDelay), falseAlerts, unitYearsAtRisk,
                falseAlertsPerUnitYear);
    }
}
