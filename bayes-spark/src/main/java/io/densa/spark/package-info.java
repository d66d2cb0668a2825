/**
 * Densa inside Apache Spark jobs (Spark 4.0, Scala 2.13, Java 17; Spark is provided by the cluster):
 * the same operations as the library modules on data that outgrow one machine.
 *
 * <h2>Operations</h2>
 * <ul>
 * <li>{@link io.densa.spark.SparkDensities}: events (unit, value[, weight][, period]) or counts (unit,
 * bin, count) → one row per unit (and period) with its coordinates and the estimation diagnostics;
 * counts are aggregated per (unit, bin) by Spark first, so a skewed unit cannot sink a task;</li>
 * <li>{@link io.densa.spark.SparkFpca}: mean and covariance of a coordinate column by tree
 * aggregation, the FPCA on the driver ({@link io.densa.regression.FpcaMoments}), scores as a
 * column;</li>
 * <li>{@link io.densa.spark.SparkScoring}: residual norms, conformal p-values, Benjamini–Hochberg
 * adjusted p-values over the whole dataset, flags and excursions against a broadcast
 * {@link io.densa.spark.BaselineSpec}; and excess counts per band with intervals and the displaced
 * events' p-value of each unit against its baseline ({@link io.densa.spark.SparkScoring.Excess},
 * each unit on its own seed);</li>
 * <li>{@link io.densa.spark.SparkVariogram}: the trace-variogram by pair blocks on tasks
 * ({@link io.densa.spatial.variogram.VariogramPairBlocks});</li>
 * <li>{@link io.densa.spark.SparkKriging}: grid kriging by tiles on tasks
 * ({@link io.densa.spatial.kriging.GridTiles}), as Parquet-ready cell rows or GeoTIFF tiles written by the
 * tasks, with Monte Carlo intervals of the derived maps when an {@link io.densa.spark.IntervalSpec} is
 * given; the grid never reaches the driver.</li>
 * </ul>
 *
 * <h2>Semantics</h2>
 * No library class is made serialisable. What executors need is broadcast as small serialisable
 * specs of primitive arrays ({@link io.densa.spark.SpaceSpec}, {@link io.densa.spark.EstimatorSpec},
 * {@link io.densa.spark.FpcaSpec}, {@link io.densa.spark.BaselineSpec},
 * {@link io.densa.spark.LocationData}, {@link io.densa.spark.VariogramSpec},
 * {@link io.densa.spark.KrigingSpec}, {@link io.densa.spark.GridSpec}, {@link io.densa.spark.IntervalSpec},
 * {@link io.densa.spark.SparkScoring.Excess}); each rebuilds its Densa
 * objects once per executor JVM (a transient lazy field) through the public factories. The rebuild
 * is deterministic, so executors compute exactly what the driver would: per-unit estimation,
 * scores, scoring, variogram and per-cell kriging results are bit-identical to the single-machine
 * API; the FPCA moments (a distributed sum) agree with it to about 1e-13 relative. A task failing on
 * bad input fails the job with Densa's message ({@link io.densa.spark.SparkErrors}), not with a bare
 * task failure.
 */
package io.densa.spark;
