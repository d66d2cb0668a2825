/**
 * Surveillance against a fitted baseline: which units depart from it, and by how many events.
 *
 * <ul>
 * <li>{@link io.densa.regression.surveillance.AnomalyScoring}: split-conformal anomaly scores of
 * residual densities, FDR flags with {@link io.densa.core.BenjaminiHochberg}, and the parts of the
 * domain where a flagged unit departs (smoothed p-values on request).</li>
 * <li>{@link io.densa.regression.surveillance.ExcessCounts}: events in excess of a baseline per
 * band, overall and displaced, with seeded parametric bootstrap intervals.</li>
 * <li>{@link io.densa.regression.surveillance.RollingBaseline} and
 * {@link io.densa.regression.surveillance.BaselineMonitor}: a baseline kept and updated period by
 * period, each new period scored as it arrives and then absorbed, with an alert history per unit;
 * {@link io.densa.regression.surveillance.DetectionSummary} evaluates a monitor on data with known
 * onsets.</li>
 * </ul>
 *
 * <p>The baselines come from the models of {@link io.densa.regression}. Random procedures take a
 * seed and draw from one stream per unit, so results do not depend on the number of threads.
 * Nothing here prints or keeps global state. These are statistical signals for trained analysts,
 * not diagnoses; decisions rest with the responsible public-health authorities.
 */
package io.densa.regression.surveillance;
