/**
 * Unit geometries as RFC 7946 GeoJSON: read and joined to a table by id
 * ({@link io.densa.io.geometry.UnitGeometries}, {@link io.densa.io.geometry.GeometryJoin}) and written with
 * per-unit results ({@link io.densa.io.geometry.GeoJsonUnitWriter}, {@link io.densa.io.geometry.UnitValues}).
 * See the package {@code io.densa.io} for examples and guarantees.
 */
package io.densa.io.geometry;
