/**
 * Surveillance period by period: a baseline of the units' densities that is kept and updated
 * ({@link io.densa.regression.surveillance.RollingBaseline},
 * {@link io.densa.regression.surveillance.BaselineMonitor}), each new period scored as it arrives
 * and then absorbed, with an alert history per unit, and the evaluation of a monitor on data with
 * known onsets ({@link io.densa.regression.surveillance.DetectionSummary}).
 *
 * <p>These are statistical signals for trained analysts, not diagnoses; decisions rest with the
 * responsible public-health authorities.
 */
package io.densa.regression.surveillance;
