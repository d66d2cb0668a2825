package io.densa.io.raster;

import java.nio.file.Path;

/**
 * What {@link GridExport#run} wrote.
 *
 * @param cells   cells predicted and written (inside the mask)
 * @param tiles   prediction tiles delivered
 * @param geoTiff the GeoTIFF written, or null
 * @param csv     the cell table written, or null
 */
public record GridExportSummary(long cells, int tiles, RasterSummary geoTiff, Path csv) {
}
