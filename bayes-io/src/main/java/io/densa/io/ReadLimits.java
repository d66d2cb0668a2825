package io.densa.io;

/**
 * Caller-settable limits every reader of this package checks <em>before</em> it allocates: a file
 * or document that declares or holds more than a limit is rejected with an
 * {@link IllegalArgumentException} naming the limit and how to raise it, so a crafted file cannot
 * make a reader exhaust memory or time.
 *
 * <p>Defaults ({@link #defaults()}): files up to 1 GiB, 100,000,000 rows, 10,000,000 units,
 * 100,000 bins, 50,000,000 table cells (units × bins, the size of the count matrix), text fields
 * (ids, labels, periods) up to 1,024 characters, CSV records up to 1 MiB, JSON nesting depth 64,
 * 1,000,000 GeoJSON features and 50,000,000 numbers in a GeoJSON document.
 *
 * @param maxFileBytes    largest file a reader opens, in bytes (checked against the file's real size)
 * @param maxRows         largest number of data rows in a table
 * @param maxUnits        largest number of distinct units (unit–period pairs)
 * @param maxBins         largest number of bins
 * @param maxCells        largest units × bins of a count matrix
 * @param maxFieldChars   longest text field (unit id, bin label, period, property value)
 * @param maxRecordChars  longest CSV record (all fields of one row, quotes and line breaks included)
 * @param maxJsonDepth    deepest nesting of JSON arrays and objects
 * @param maxFeatures     largest number of GeoJSON features
 * @param maxJsonNumbers  largest number of JSON numbers (coordinates) in a GeoJSON document
 */
public record ReadLimits(long maxFileBytes, long maxRows, int maxUnits, int maxBins, long maxCells,
        int maxFieldChars, int maxRecordChars, int maxJsonDepth, int maxFeatures, long maxJsonNumbers) {

    /** Checks that every limit is positive. */
    public ReadLimits {
        positive("maxFileBytes", maxFileBytes);
        positive("maxRows", maxRows);
        positive("maxUnits", maxUnits);
        positive("maxBins", maxBins);
        positive("maxCells", maxCells);
        positive("maxFieldChars", maxFieldChars);
        positive("maxRecordChars", maxRecordChars);
        positive("maxJsonDepth", maxJsonDepth);
        positive("maxFeatures", maxFeatures);
        positive("maxJsonNumbers", maxJsonNumbers);
    }

    private static void positive(String name, long v) {
        if (v < 1) {
            throw new IllegalArgumentException("read limit " + name + " must be at least 1, got " + v);
        }
    }

    /** The defaults listed above. */
    public static ReadLimits defaults() {
        return new ReadLimits(1L << 30, 100_000_000L, 10_000_000, 100_000, 50_000_000L, 1024, 1 << 20, 64,
                1_000_000, 50_000_000L);
    }

    /** With another file-size limit in bytes. */
    public ReadLimits withMaxFileBytes(long v) {
        return new ReadLimits(v, maxRows, maxUnits, maxBins, maxCells, maxFieldChars, maxRecordChars, maxJsonDepth,
                maxFeatures, maxJsonNumbers);
    }

    /** With another row limit. */
    public ReadLimits withMaxRows(long v) {
        return new ReadLimits(maxFileBytes, v, maxUnits, maxBins, maxCells, maxFieldChars, maxRecordChars,
                maxJsonDepth, maxFeatures, maxJsonNumbers);
    }

    /** With another unit limit. */
    public ReadLimits withMaxUnits(int v) {
        return new ReadLimits(maxFileBytes, maxRows, v, maxBins, maxCells, maxFieldChars, maxRecordChars,
                maxJsonDepth, maxFeatures, maxJsonNumbers);
    }

    /** With another bin limit. */
    public ReadLimits withMaxBins(int v) {
        return new ReadLimits(maxFileBytes, maxRows, maxUnits, v, maxCells, maxFieldChars, maxRecordChars,
                maxJsonDepth, maxFeatures, maxJsonNumbers);
    }

    /** With another limit on units × bins. */
    public ReadLimits withMaxCells(long v) {
        return new ReadLimits(maxFileBytes, maxRows, maxUnits, maxBins, v, maxFieldChars, maxRecordChars,
                maxJsonDepth, maxFeatures, maxJsonNumbers);
    }

    /** With another text-field length limit. */
    public ReadLimits withMaxFieldChars(int v) {
        return new ReadLimits(maxFileBytes, maxRows, maxUnits, maxBins, maxCells, v, maxRecordChars, maxJsonDepth,
                maxFeatures, maxJsonNumbers);
    }

    /** With another CSV record length limit. */
    public ReadLimits withMaxRecordChars(int v) {
        return new ReadLimits(maxFileBytes, maxRows, maxUnits, maxBins, maxCells, maxFieldChars, v, maxJsonDepth,
                maxFeatures, maxJsonNumbers);
    }

    /** With another JSON nesting limit. */
    public ReadLimits withMaxJsonDepth(int v) {
        return new ReadLimits(maxFileBytes, maxRows, maxUnits, maxBins, maxCells, maxFieldChars, maxRecordChars, v,
                maxFeatures, maxJsonNumbers);
    }

    /** With another GeoJSON feature limit. */
    public ReadLimits withMaxFeatures(int v) {
        return new ReadLimits(maxFileBytes, maxRows, maxUnits, maxBins, maxCells, maxFieldChars, maxRecordChars,
                maxJsonDepth, v, maxJsonNumbers);
    }

    /** With another limit on the numbers in a GeoJSON document. */
    public ReadLimits withMaxJsonNumbers(long v) {
        return new ReadLimits(maxFileBytes, maxRows, maxUnits, maxBins, maxCells, maxFieldChars, maxRecordChars,
                maxJsonDepth, maxFeatures, v);
    }
}
