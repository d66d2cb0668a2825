/**
 * Data in and results out: the one module of Densa that reads and writes files and databases
 * (the library modules core, regression and spatial never do). This package holds what every
 * reader shares, the bin layout ({@link io.densa.io.Bins}) and the limits against hostile files
 * ({@link io.densa.io.ReadLimits}); the readers and writers sit in sub-packages by what they handle:
 * {@code io.densa.io.tables} (count tables, samples, observations from CSV, JDBC and bulk files),
 * {@code io.densa.io.geometry} (unit geometries and values as GeoJSON), {@code io.densa.io.raster}
 * (GeoTIFF and kriged grid export) and {@code io.densa.io.model} (saved models).
 *
 * <h2>Data in</h2>
 * <ul>
 * <li><b>Count tables</b> in long format (unit, optional period, bin, count) from CSV (RFC 4180) or
 *     any JDBC source ({@link io.densa.io.tables.TableSource}) into a {@link io.densa.io.tables.CountTable}, the
 *     input of {@link io.densa.core.estimate.PenalizedLikelihoodEstimator#fitAll(double[], double[][], String[])}:
 * <pre>{@code
 * CountTable t = CountTableReader.of("district", "count")
 *         .withBinIndex("age_band", Bins.uniform(0, 90, 18))
 *         .withSpace(space)
 *         .read(TableSource.csv(Path.of("counts.csv")));   // or TableSource.query(connection, sql)
 * BatchEstimate est = t.fit(PenalizedLikelihoodEstimator.withDefaults(space));
 * }</pre></li>
 * <li><b>Raw observations</b> (unit, value, optional weight and period) kept as samples or binned,
 *     with an {@link io.densa.io.tables.OutsidePolicy} for values outside the range
 *     ({@link io.densa.io.tables.ObservationReader}):
 * <pre>{@code
 * SampleTable s = ObservationReader.of("monitor", "value").withWeight("hours")
 *         .samples(TableSource.csv(Path.of("readings.csv")), space, OutsidePolicy.DROP);
 * BatchEstimate est = s.fit(PenalizedLikelihoodEstimator.withDefaults(space));
 * }</pre></li>
 * <li><b>Large files</b> (10⁸ rows, CSV or Parquet) binned by an embedded SQL engine and streamed per
 *     unit without the events entering the heap ({@link io.densa.io.tables.BulkObservations}; needs the
 *     optional dependency {@code org.duckdb:duckdb_jdbc}):
 * <pre>{@code
 * BulkObservations.of(Path.of("events.parquet"), "station", "value")
 *         .fitHistograms(estimator, Bins.uniform(space, 50), OutsidePolicy.DROP,
 *                 (counts, estimate) -> store(estimate));
 * }</pre></li>
 * <li><b>Unit geometries</b> from GeoJSON ({@link io.densa.io.geometry.UnitGeometries}), joined to a table by id
 *     with the unmatched ids of both sides listed ({@link io.densa.io.geometry.GeometryJoin}), and spatial
 *     weights straight from the file:
 * <pre>{@code
 * GeometryJoin j = UnitGeometries.read(Path.of("districts.geojson"), "code").join(t.ids());
 * SpatialWeights w = j.contiguity(SpatialWeights.Contiguity.QUEEN, 0);   // fails listing j.withoutGeometry()
 * }</pre></li>
 * </ul>
 *
 * <h2>Results out</h2>
 * <ul>
 * <li><b>Kriged grids</b> as GeoTIFF (and a CSV cell table) in one streaming pass
 *     ({@link io.densa.io.raster.GridExport}, bands from {@link io.densa.io.raster.GridBand}):
 * <pre>{@code
 * GridExport.of(GridBand.median(), GridBand.exceedance(15), GridBand.krigingSd())
 *         .toGeoTiff(Path.of("map.tif"), Crs.projected(32633), GeoTiffOptions.defaults())
 *         .toCsv(Path.of("cells.csv"))
 *         .withIntervals(UncertaintyOptions.withSeed(7))   // optional: median_lower, median_upper, …
 *         .run(kriging, grid);
 * }</pre>
 *     or any raster cell by cell with {@link io.densa.io.raster.GeoTiffWriter}.</li>
 * <li><b>Units with their results</b> as RFC 7946 GeoJSON ({@link io.densa.io.geometry.GeoJsonUnitWriter},
 *     per-unit values in {@link io.densa.io.geometry.UnitValues}):
 * <pre>{@code
 * GeoJsonUnitWriter.withDefaults().write(Path.of("units.geojson"), geometries,
 *         UnitValues.of(ids).withNumbers("p_above", tail));
 * }</pre></li>
 * </ul>
 *
 * <h2>Models out and in</h2>
 * Fitted models (spaces, density sets, estimator settings, FPCA, regressions, anomaly calibrations,
 * variograms, kriging, spatial weights) are saved and loaded by {@link io.densa.io.model.ModelFile}
 * in Densa's versioned JSON model format; see the package {@code io.densa.io.model}.
 *
 * <h2>Guarantees</h2>
 * <ul>
 * <li>All or nothing: a reader returns a complete result or throws an
 *     {@link java.lang.IllegalArgumentException} naming the file, line or row, column, the bad value
 *     and the accepted form; streaming readers check the whole file before delivering the first batch.
 *     Writers write under a temporary name and move the file into place only when it is complete.</li>
 * <li>Hostile files: no Java object deserialization anywhere; sizes, rows, units, bins, cells,
 *     field and record lengths, JSON depth and number counts are checked against caller-settable
 *     {@link io.densa.io.ReadLimits} before allocation; nothing in a file makes a reader open another
 *     file (the SQL engine runs sandboxed to the one file it was given).</li>
 * <li>No foreign exception type escapes: I/O and engine errors become IllegalArgumentException (bad
 *     input) or IllegalStateException (an output that cannot be written, a writer used out of order).</li>
 * </ul>
 */
package io.densa.io;
