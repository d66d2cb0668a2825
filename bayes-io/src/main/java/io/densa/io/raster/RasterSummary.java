package io.densa.io.raster;

import java.nio.file.Path;

/**
 * What {@link GeoTiffWriter#finish()} wrote.
 *
 * @param file         the file
 * @param cellsWritten cells given values (the others hold nodata)
 * @param tiles        tiles in the file
 * @param bytes        file size in bytes
 * @param bigTiff      whether the file is BigTIFF
 */
public record RasterSummary(Path file, long cellsWritten, int tiles, long bytes, boolean bigTiff) {
}
