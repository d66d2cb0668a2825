/**
 * Tables in: count tables ({@link io.densa.io.tables.CountTableReader}, {@link io.densa.io.tables.CountTable}),
 * samples and binned observations ({@link io.densa.io.tables.ObservationReader},
 * {@link io.densa.io.tables.SampleTable}) from CSV or JDBC ({@link io.densa.io.tables.TableSource}), and
 * large CSV or Parquet files binned by an embedded SQL engine ({@link io.densa.io.tables.BulkObservations}),
 * with the policy for values outside the range ({@link io.densa.io.tables.OutsidePolicy}). See the
 * package {@code io.densa.io} for examples and guarantees.
 */
package io.densa.io.tables;
