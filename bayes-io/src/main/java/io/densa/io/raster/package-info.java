/**
 * Rasters out: GeoTIFF written cell by cell in one streaming pass
 * ({@link io.densa.io.raster.GeoTiffWriter}, {@link io.densa.io.raster.GeoTiffOptions},
 * {@link io.densa.io.raster.RasterLayout}, {@link io.densa.io.raster.Crs}) and kriged grids exported as
 * GeoTIFF bands and a CSV cell table ({@link io.densa.io.raster.GridExport}, {@link io.densa.io.raster.GridBand}).
 * See the package {@code io.densa.io} for examples and guarantees.
 */
package io.densa.io.raster;
