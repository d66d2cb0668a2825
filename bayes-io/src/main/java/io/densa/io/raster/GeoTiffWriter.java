package io.densa.io.raster;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.zip.Deflater;

/**
 * Streams a multi-band raster into a tiled GeoTIFF: cells arrive in any order within a window of tile
 * rows, complete rows of tiles go to disk as soon as the caller declares them finished, and at most
 * {@link GeoTiffOptions#maxOpenTileRows()} rows of tiles are held in memory, so a 10⁸-cell grid
 * never sits in memory. Written by hand after TIFF 6.0 (Adobe 1992, Sections 2, 8, 15 and 19),
 * BigTIFF (64-bit offsets) and OGC GeoTIFF 1.1 (OGC 19-008r4).
 *
 * <h2>File</h2>
 * Little-endian ("II") classic TIFF, or BigTIFF (magic 43) when {@link GeoTiffOptions.BigTiff}
 * asks for it or the file could pass 4 GiB; one image file directory, written after the tiles;
 * square tiles (TileWidth = TileLength, a multiple of 16) holding all bands pixel-interleaved
 * (PlanarConfiguration 1, SamplesPerPixel = bands, ExtraSamples = 0 "unspecified" for bands after
 * the first, PhotometricInterpretation 1); IEEE float samples of 32 or 64 bits (SampleFormat 3);
 * no compression or Deflate (Compression 8). Tiles that received no cell share one nodata tile.
 *
 * <h2>Georeferencing</h2>
 * ModelPixelScaleTag (33550) = (cell width, cell height, 0) and ModelTiepointTag (33922) tying raster
 * point (0, 0) — the north-west corner of the first cell under RasterPixelIsArea — to (minX, maxY);
 * GeoKeyDirectoryTag (34735, version 1.1.1) with GTModelTypeGeoKey (1 projected, 2 geographic),
 * GTRasterTypeGeoKey = 1 (RasterPixelIsArea) and ProjectedCSTypeGeoKey or GeographicTypeGeoKey = the
 * EPSG code (a local CRS: 32767 with GTCitationGeoKey in GeoAsciiParamsTag and ProjLinearUnitsGeoKey).
 *
 * <h2>Nodata and band names</h2>
 * Cells never written hold the nodata value ({@link GeoTiffOptions#nodata()}, default −9999), which is
 * recorded as text in the GDAL_NODATA tag (42113; "nan" for NaN) as GIS software expects; a written
 * value must be finite, must fit the sample type and must differ from the nodata value. Band names go
 * to the GDAL_METADATA tag (42112) as band descriptions.
 *
 * <h2>Use</h2>
 * Rows are numbered as in {@link io.densa.spatial.kriging.Grid}: row 0 is the southernmost. After
 * {@link #finishRowsBelow}(j) (or {@link #finishRowsAbove}) no cell of those rows may be written; the
 * tiles they complete are written at once. {@link #finish()} writes the rest and the directory and
 * moves the file into place; {@link #close()} without {@code finish()} deletes the partial file, so
 * a failed export leaves nothing that looks complete:
 * <pre>{@code
 * try (GeoTiffWriter w = GeoTiffWriter.create(path, layout, GeoTiffOptions.defaults())) {
 *     for (int j = 0; j < layout.rows(); j++) {
 *         w.writeCells(n, columns, rowsOfJ, values);   // values[band][cell]
 *         w.finishRowsBelow(j + 1);
 *     }
 *     w.finish();
 * }
 * }</pre>
 * Not thread-safe: one thread writes.
 */
public final class GeoTiffWriter implements AutoCloseable {
    private static final long CLASSIC_LIMIT = 0xFFFF_FFFFL;

    private final Path target;
    private final Path part;
    private final FileChannel channel;
    private final RasterLayout layout;
    private final GeoTiffOptions options;
    private final int tile;
    private final int bands;
    private final int bytesPerSample;
    private final int tilesAcross;
    private final int tilesDown;
    private final boolean big;
    private final long[] offsets;
    private final long[] byteCounts;
    private final boolean[] flushed;
    private final Map<Integer, double[]> open = new HashMap<>();
    private final ByteBuffer raw;
    private final Deflater deflater;
    private byte[] packed = new byte[0];
    private int belowFrontier;
    private int aboveFrontier;
    private long end;
    private long cells;
    private int lastRow = -1;
    private double[] lastBuffer;
    private boolean finished;
    private boolean closed;

    private GeoTiffWriter(Path target, Path part, FileChannel channel, RasterLayout layout, GeoTiffOptions options,
            boolean big) {
        this.target = target;
        this.part = part;
        this.channel = channel;
        this.layout = layout;
        this.options = options;
        this.tile = options.tileSize();
        this.bands = layout.bands().size();
        this.bytesPerSample = options.sampleType() == GeoTiffOptions.SampleType.FLOAT32 ? 4 : 8;
        this.tilesAcross = (layout.columns() + tile - 1) / tile;
        this.tilesDown = (layout.rows() + tile - 1) / tile;
        this.big = big;
        int tiles = tilesAcross * tilesDown;
        this.offsets = new long[tiles];
        this.byteCounts = new long[tiles];
        this.flushed = new boolean[tilesDown];
        this.raw = ByteBuffer.allocate(tile * tile * bands * bytesPerSample).order(ByteOrder.LITTLE_ENDIAN);
        this.deflater = options.compression() == GeoTiffOptions.Compression.DEFLATE ? new Deflater(6) : null;
        this.aboveFrontier = layout.rows();
        this.end = big ? 16 : 8;
    }

    /**
     * Opens a writer: the file is written as {@code file + ".part"} and moved to {@code file} by
     * {@link #finish()}.
     *
     * @throws IllegalArgumentException if the nodata value does not fit the sample type, the raster
     *                                  is too large for the options (tile count, or 4 GiB with
     *                                  BigTIFF NEVER), or the file cannot be created
     */
    public static GeoTiffWriter create(Path file, RasterLayout layout, GeoTiffOptions options) {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(layout, "layout");
        Objects.requireNonNull(options, "options");
        double nd = options.nodata();
        if (options.sampleType() == GeoTiffOptions.SampleType.FLOAT32 && !Double.isNaN(nd) && (double) (float) nd != nd) {
            throw new IllegalArgumentException("nodata " + nd + " is not exactly representable as a 32-bit float;"
                    + " choose another (e.g. -9999) or FLOAT64 samples");
        }
        int t = options.tileSize();
        long tiles = (long) ((layout.columns() + t - 1) / t) * ((layout.rows() + t - 1) / t);
        if (tiles > Integer.MAX_VALUE / 2) {
            throw new IllegalArgumentException("the raster has " + tiles + " tiles of " + t + " x " + t
                    + "; use larger tiles");
        }
        int bps = options.sampleType() == GeoTiffOptions.SampleType.FLOAT32 ? 4 : 8;
        long tileBytes = (long) t * t * layout.bands().size() * bps;
        long estimate = tiles * (tileBytes + tileBytes / 100 + 64) + tiles * 16 + (1 << 20);
        boolean big = options.bigTiff() == GeoTiffOptions.BigTiff.ALWAYS
                || (options.bigTiff() == GeoTiffOptions.BigTiff.AUTO && estimate > CLASSIC_LIMIT);
        if (!big && estimate > CLASSIC_LIMIT) {
            throw new IllegalArgumentException("the raster may need up to " + estimate + " bytes, more than a"
                    + " classic TIFF holds (4 GiB); allow BigTIFF");
        }
        if (tileBytes > Integer.MAX_VALUE / 2) {
            throw new IllegalArgumentException("a tile of " + t + " x " + t + " cells and " + layout.bands().size()
                    + " bands is too large; use smaller tiles");
        }
        Path abs = file.toAbsolutePath();
        Path part = abs.resolveSibling(abs.getFileName() + ".part");
        FileChannel ch;
        try {
            ch = FileChannel.open(part, StandardOpenOption.CREATE, StandardOpenOption.TRUNCATE_EXISTING,
                    StandardOpenOption.READ, StandardOpenOption.WRITE);
        } catch (IOException e) {
            throw new IllegalArgumentException("cannot create " + part + ": " + e.getMessage(), e);
        }
        return new GeoTiffWriter(abs, part, ch, layout, options, big);
    }

    /** The layout being written. */
    public RasterLayout layout() {
        return layout;
    }

    /**
     * Writes cell values.
     *
     * @param count   cells to take from the arrays
     * @param columns column of each cell, 0 ≤ c &lt; columns (not modified)
     * @param rows    row of each cell in grid numbering (0 = south), 0 ≤ j &lt; rows (not modified)
     * @param values  values[band][cell], one array per band (not modified)
     * @throws IllegalArgumentException for a cell outside the raster or a value that is not finite,
     *                                  does not fit the sample type or equals the nodata value
     *                                  (naming cell and band)
     * @throws IllegalStateException    for a cell of rows already finished, more open tile rows than
     *                                  allowed, or a writer already finished or closed
     */
    public void writeCells(int count, int[] columns, int[] rows, double[][] values) {
        checkOpen();
        Objects.requireNonNull(columns, "columns");
        Objects.requireNonNull(rows, "rows");
        Objects.requireNonNull(values, "values");
        if (values.length != bands) {
            throw new IllegalArgumentException(values.length + " value arrays for " + bands + " bands");
        }
        if (count < 0 || columns.length < count || rows.length < count) {
            throw new IllegalArgumentException("count " + count + " exceeds the cell arrays");
        }
        for (double[] v : values) {
            if (v == null || v.length < count) {
                throw new IllegalArgumentException("a band has fewer than " + count + " values");
            }
        }
        int nRows = layout.rows(), nCols = layout.columns();
        double nd = options.nodata();
        boolean f32 = bytesPerSample == 4;
        for (int i = 0; i < count; i++) {
            int c = columns[i], j = rows[i];
            if (c < 0 || c >= nCols || j < 0 || j >= nRows) {
                throw new IllegalArgumentException("cell (column " + c + ", row " + j + ") lies outside the raster of "
                        + nCols + " x " + nRows + " cells");
            }
            int r = nRows - 1 - j;
            int tr = r / tile;
            double[] buf = tr == lastRow ? lastBuffer : buffer(tr, c, j);
            int base = (((c / tile) * tile + (r - tr * tile)) * tile + (c % tile)) * bands;
            for (int b = 0; b < bands; b++) {
                double v = values[b][i];
                if (!Double.isFinite(v) || v == nd || (f32 && Math.abs(v) > Float.MAX_VALUE)) {
                    throw new IllegalArgumentException("cell (column " + c + ", row " + j + "), band '"
                            + layout.bands().get(b) + "': value " + v + (v == nd ? " equals the nodata value;"
                            + " choose another nodata value" : " is not finite" + (f32 ? " in 32-bit float"
                            + " (FLOAT64 holds more)" : "")));
                }
                buf[base + b] = v;
            }
        }
        cells += count;
    }

    private double[] buffer(int tr, int c, int j) {
        if (flushed[tr] || complete(tr)) {
            throw new IllegalStateException("cell (column " + c + ", row " + j + ") arrives after its rows were"
                    + " finished (finishRowsBelow " + belowFrontier + ", finishRowsAbove " + (aboveFrontier - 1) + ")");
        }
        double[] buf = open.get(tr);
        if (buf == null) {
            if (open.size() >= options.maxOpenTileRows()) {
                throw new IllegalStateException("writing row " + j + " would hold " + (open.size() + 1)
                        + " rows of tiles in memory, more than " + options.maxOpenTileRows()
                        + "; finish rows as they complete (finishRowsBelow / finishRowsAbove)"
                        + " or allow more (GeoTiffOptions.withMaxOpenTileRows)");
            }
            buf = new double[tilesAcross * tile * tile * bands];
            Arrays.fill(buf, options.nodata());
            open.put(tr, buf);
        }
        lastRow = tr;
        lastBuffer = buf;
        return buf;
    }

    /** Grid rows of tile row tr: [bottom, top]. */
    private boolean complete(int tr) {
        int top = layout.rows() - 1 - tr * tile;
        int bottom = Math.max(0, layout.rows() - (tr + 1) * tile);
        return top < belowFrontier || bottom >= aboveFrontier;
    }

    /**
     * Declares every row below {@code row} (grid rows 0 .. row − 1) complete, and writes the rows of
     * tiles this completes.
     */
    public void finishRowsBelow(int row) {
        checkOpen();
        belowFrontier = Math.max(belowFrontier, Math.min(row, layout.rows()));
        flushComplete();
    }

    /** Declares every row above {@code row} (grid rows row + 1 .. rows − 1) complete. */
    public void finishRowsAbove(int row) {
        checkOpen();
        aboveFrontier = Math.min(aboveFrontier, Math.max(row + 1, 0));
        flushComplete();
    }

    private void flushComplete() {
        List<Integer> done = new ArrayList<>();
        for (int tr : open.keySet()) {
            if (complete(tr)) {
                done.add(tr);
            }
        }
        done.sort(Comparator.naturalOrder());
        for (int tr : done) {
            flushRow(tr, open.remove(tr));
        }
    }

    private void flushRow(int tr, double[] buf) {
        if (tr == lastRow) {
            lastRow = -1;
            lastBuffer = null;
        }
        int per = tile * tile * bands;
        for (int tx = 0; tx < tilesAcross; tx++) {
            int k = tr * tilesAcross + tx;
            long[] w = writeTile(buf, tx * per, per);
            offsets[k] = w[0];
            byteCounts[k] = w[1];
        }
        flushed[tr] = true;
    }

    /** Encodes and appends one tile; returns {offset, byte count}. */
    private long[] writeTile(double[] src, int from, int n) {
        raw.clear();
        if (bytesPerSample == 4) {
            for (int i = 0; i < n; i++) {
                raw.putFloat((float) src[from + i]);
            }
        } else {
            for (int i = 0; i < n; i++) {
                raw.putDouble(src[from + i]);
            }
        }
        raw.flip();
        ByteBuffer out = raw;
        if (deflater != null) {
            deflater.reset();
            deflater.setInput(raw.array(), 0, raw.limit());
            deflater.finish();
            int len = 0;
            if (packed.length < raw.limit() + 1024) {
                packed = new byte[raw.limit() + raw.limit() / 100 + 1024];
            }
            while (!deflater.finished()) {
                if (len == packed.length) {
                    packed = Arrays.copyOf(packed, packed.length * 2);
                }
                len += deflater.deflate(packed, len, packed.length - len);
            }
            out = ByteBuffer.wrap(packed, 0, len);
        }
        long at = end;
        int len = out.remaining();
        write(out, at);
        end = at + len + (len & 1);
        if (!big && end > CLASSIC_LIMIT) {
            throw new IllegalStateException("the classic TIFF passed 4 GiB; write with BigTIFF");
        }
        return new long[] {at, len};
    }

    private void write(ByteBuffer b, long at) {
        try {
            long p = at;
            while (b.hasRemaining()) {
                p += channel.write(b, p);
            }
        } catch (IOException e) {
            throw new IllegalStateException("cannot write " + part + ": " + e.getMessage(), e);
        }
    }

    /**
     * Writes the remaining tiles (cells never written hold nodata) and the directory, and moves the
     * file into place.
     *
     * @return what was written
     * @throws IllegalStateException if the writer was already finished or closed, or on an I/O error
     */
    public RasterSummary finish() {
        checkOpen();
        List<Integer> rest = new ArrayList<>(open.keySet());
        rest.sort(Comparator.naturalOrder());
        for (int tr : rest) {
            flushRow(tr, open.remove(tr));
        }
        long[] shared = null;
        for (int k = 0; k < offsets.length; k++) {
            if (byteCounts[k] == 0) {
                if (shared == null) {
                    double[] empty = new double[tile * tile * bands];
                    Arrays.fill(empty, options.nodata());
                    shared = writeTile(empty, 0, empty.length);
                }
                offsets[k] = shared[0];
                byteCounts[k] = shared[1];
            }
        }
        long ifd = writeDirectory();
        ByteBuffer head = ByteBuffer.allocate(big ? 16 : 8).order(ByteOrder.LITTLE_ENDIAN);
        head.put((byte) 'I').put((byte) 'I');
        if (big) {
            head.putShort((short) 43).putShort((short) 8).putShort((short) 0).putLong(ifd);
        } else {
            head.putShort((short) 42).putInt((int) ifd);
        }
        head.flip();
        write(head, 0);
        long size;
        try {
            channel.force(false);
            size = channel.size();
            channel.close();
            try {
                Files.move(part, target, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(part, target, StandardCopyOption.REPLACE_EXISTING);
            }
        } catch (IOException e) {
            closed = true;
            deleteQuietly();
            throw new IllegalStateException("cannot complete " + target + ": " + e.getMessage(), e);
        }
        finished = true;
        closed = true;
        if (deflater != null) {
            deflater.end();
        }
        return new RasterSummary(target, cells, offsets.length, size, big);
    }

    /** Deletes the partial file unless {@link #finish()} completed it. Idempotent. */
    @Override
    public void close() {
        if (closed) {
            return;
        }
        closed = true;
        open.clear();
        try {
            channel.close();
        } catch (IOException ignored) {
            // the partial file is deleted next
        }
        if (deflater != null) {
            deflater.end();
        }
        deleteQuietly();
    }

    private void deleteQuietly() {
        try {
            Files.deleteIfExists(part);
        } catch (IOException ignored) {
            // nothing more can be done; the ".part" name marks it incomplete
        }
    }

    private void checkOpen() {
        if (closed) {
            throw new IllegalStateException("the GeoTIFF writer for " + target + " is already "
                    + (finished ? "finished" : "closed"));
        }
    }

    // ------------------------------------------------------------------ directory

    private long writeDirectory() {
        List<TiffDirectory.Entry> e = TiffDirectory.entries(layout, options, bands, bytesPerSample, tile, big,
                deflater != null, offsets, byteCounts);
        int inline = big ? 8 : 4;
        long[] valueAt = new long[e.size()];
        for (int i = 0; i < e.size(); i++) {
            byte[] d = e.get(i).data();
            if (d.length > inline) {
                valueAt[i] = end;
                write(ByteBuffer.wrap(d), end);
                end += d.length + (d.length & 1);
            }
        }
        long ifd = end;
        int entrySize = big ? 20 : 12;
        ByteBuffer b = ByteBuffer.allocate((big ? 8 : 2) + e.size() * entrySize + (big ? 8 : 4))
                .order(ByteOrder.LITTLE_ENDIAN);
        if (big) {
            b.putLong(e.size());
        } else {
            b.putShort((short) e.size());
        }
        for (int i = 0; i < e.size(); i++) {
            TiffDirectory.Entry x = e.get(i);
            b.putShort((short) x.tag()).putShort((short) x.type());
            if (big) {
                b.putLong(x.count());
            } else {
                b.putInt((int) x.count());
            }
            if (x.data().length > inline) {
                if (big) {
                    b.putLong(valueAt[i]);
                } else {
                    b.putInt((int) valueAt[i]);
                }
            } else {
                byte[] v = Arrays.copyOf(x.data(), inline);
                b.put(v);
            }
        }
        if (big) {
            b.putLong(0);
        } else {
            b.putInt(0);
        }
        b.flip();
        int len = b.remaining();
        write(b, ifd);
        end = ifd + len;
        if (!big && end > CLASSIC_LIMIT) {
            throw new IllegalStateException("the classic TIFF passed 4 GiB; write with BigTIFF");
        }
        return ifd;
    }

}
