package io.densa.io.raster;

import java.util.Objects;

/**
 * Immutable options of {@link GeoTiffWriter}. Defaults ({@link #defaults()}): 32-bit float samples,
 * tiles of 64 × 64 cells, no compression, nodata −9999, BigTIFF only when a classic TIFF would pass
 * 4 GiB, at most 4 rows of tiles buffered.
 */
public final class GeoTiffOptions {
    /** Sample type of every band. */
    public enum SampleType {
        /** IEEE 754 binary32 (TIFF SampleFormat 3, 32 bits). */
        FLOAT32,
        /** IEEE 754 binary64 (TIFF SampleFormat 3, 64 bits). */
        FLOAT64
    }

    /** Tile compression. */
    public enum Compression {
        /** None (TIFF Compression 1). */
        NONE,
        /** zlib/Deflate (TIFF Compression 8, "Adobe Deflate"), level 6. */
        DEFLATE
    }

    /** When to write BigTIFF (64-bit offsets, magic 43) instead of classic TIFF. */
    public enum BigTiff {
        /** BigTIFF only when the classic format's 4 GiB limit could be passed. */
        AUTO,
        /** Always BigTIFF. */
        ALWAYS,
        /** Never; a raster that could pass 4 GiB is refused. */
        NEVER
    }

    private final SampleType sampleType;
    private final int tileSize;
    private final Compression compression;
    private final double nodata;
    private final BigTiff bigTiff;
    private final int maxOpenTileRows;

    private GeoTiffOptions(SampleType sampleType, int tileSize, Compression compression, double nodata,
            BigTiff bigTiff, int maxOpenTileRows) {
        this.sampleType = sampleType;
        this.tileSize = tileSize;
        this.compression = compression;
        this.nodata = nodata;
        this.bigTiff = bigTiff;
        this.maxOpenTileRows = maxOpenTileRows;
    }

    /** The defaults above. */
    public static GeoTiffOptions defaults() {
        return new GeoTiffOptions(SampleType.FLOAT32, 64, Compression.NONE, -9999, BigTiff.AUTO, 4);
    }

    /** With another sample type. */
    public GeoTiffOptions withSampleType(SampleType t) {
        return new GeoTiffOptions(Objects.requireNonNull(t, "sampleType"), tileSize, compression, nodata, bigTiff,
                maxOpenTileRows);
    }

    /** Tile edge in cells: a multiple of 16 (TIFF 6.0, Section 15) in [16, 1024]. */
    public GeoTiffOptions withTileSize(int cells) {
        if (cells < 16 || cells > 1024 || cells % 16 != 0) {
            throw new IllegalArgumentException("tile size must be a multiple of 16 in [16, 1024], got " + cells);
        }
        return new GeoTiffOptions(sampleType, cells, compression, nodata, bigTiff, maxOpenTileRows);
    }

    /** With another compression. */
    public GeoTiffOptions withCompression(Compression c) {
        return new GeoTiffOptions(sampleType, tileSize, Objects.requireNonNull(c, "compression"), nodata, bigTiff,
                maxOpenTileRows);
    }

    /**
     * The value written for cells without data (masked or never written), recorded in the
     * GDAL_NODATA tag (42113) as text: finite or NaN, and exactly representable in the sample type.
     */
    public GeoTiffOptions withNodata(double value) {
        if (Double.isInfinite(value)) {
            throw new IllegalArgumentException("nodata must be finite or NaN, got " + value);
        }
        return new GeoTiffOptions(sampleType, tileSize, compression, value, bigTiff, maxOpenTileRows);
    }

    /** When to write BigTIFF. */
    public GeoTiffOptions withBigTiff(BigTiff b) {
        return new GeoTiffOptions(sampleType, tileSize, compression, nodata, Objects.requireNonNull(b, "bigTiff"),
                maxOpenTileRows);
    }

    /**
     * Most rows of tiles held in memory at once (≥ 2); writing a cell that would open one more is an
     * IllegalStateException. Grid prediction needs 2 when the row count is not a multiple of the tile
     * size (its tiles are counted from the south, the file's from the north), else 1.
     */
    public GeoTiffOptions withMaxOpenTileRows(int n) {
        if (n < 2 || n > 1 << 16) {
            throw new IllegalArgumentException("max open tile rows must be in [2, 65536], got " + n);
        }
        return new GeoTiffOptions(sampleType, tileSize, compression, nodata, bigTiff, n);
    }

    /** Sample type. */
    public SampleType sampleType() {
        return sampleType;
    }

    /** Tile edge in cells. */
    public int tileSize() {
        return tileSize;
    }

    /** Compression. */
    public Compression compression() {
        return compression;
    }

    /** Nodata value. */
    public double nodata() {
        return nodata;
    }

    /** BigTIFF mode. */
    public BigTiff bigTiff() {
        return bigTiff;
    }

    /** Most rows of tiles in memory. */
    public int maxOpenTileRows() {
        return maxOpenTileRows;
    }
}
