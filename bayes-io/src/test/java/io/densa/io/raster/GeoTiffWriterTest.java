package io.densa.io.raster;


import static io.densa.io.IoTestSupport.rejects;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.Raster;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Iterator;
import java.util.List;
import javax.imageio.ImageIO;
import javax.imageio.ImageReader;
import javax.imageio.plugins.tiff.TIFFDirectory;
import javax.imageio.plugins.tiff.TIFFField;
import javax.imageio.plugins.tiff.TIFFImageReadParam;
import javax.imageio.stream.ImageInputStream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * GeoTIFF files read back by an independent reader: the JDK's ImageIO TIFF plugin
 * ({@code javax.imageio}, TIFF 6.0) for pixels and tags. Expected tag values follow TIFF 6.0 (Adobe
 * 1992; tags 256–339) and OGC GeoTIFF 1.1 (OGC 19-008r4: ModelPixelScaleTag 33550, ModelTiepointTag
 * 33922, GeoKeyDirectoryTag 34735 with GTModelTypeGeoKey 1024, GTRasterTypeGeoKey 1025,
 * GeographicTypeGeoKey 2048, ProjectedCSTypeGeoKey 3072), GDAL's nodata tag 42113. Cell values are
 * closed forms of (band, column, row).
 */
class GeoTiffWriterTest {
    @TempDir
    Path dir;

    private static final int COLS = 37;
    private static final int ROWS = 23;

    private static double value(int b, int c, int j) {
        return b * 1000 + c + j / 64.0;
    }

    private static boolean masked(int c, int j) {
        return (c + 2 * j) % 7 == 0;
    }

    /** Writes the raster in south-to-north strips of 16 rows, as grid prediction delivers it. */
    private static RasterSummary writeRaster(Path f, RasterLayout layout, GeoTiffOptions opt) {
        int bands = layout.bands().size();
        try (GeoTiffWriter w = GeoTiffWriter.create(f, layout, opt)) {
            for (int j0 = 0; j0 < ROWS; j0 += 16) {
                int[] cs = new int[COLS * 16];
                int[] js = new int[COLS * 16];
                double[][] v = new double[bands][COLS * 16];
                int n = 0;
                for (int c = COLS - 1; c >= 0; c--) { // any order within the strip
                    for (int j = j0; j < Math.min(ROWS, j0 + 16); j++) {
                        if (!masked(c, j)) {
                            cs[n] = c;
                            js[n] = j;
                            for (int b = 0; b < bands; b++) {
                                v[b][n] = value(b, c, j);
                            }
                            n++;
                        }
                    }
                }
                w.writeCells(n, cs, js, v);
                w.finishRowsBelow(j0 + 16);
            }
            return w.finish();
        }
    }

    private static RasterLayout layout(Crs crs, String... bands) {
        return new RasterLayout(COLS, ROWS, 500_000, 4_200_000, 25, 50, crs, List.of(bands));
    }

    /** The JDK's TIFF reader, set to keep tags outside its tag sets (GDAL's 42112 and 42113). */
    private static ImageReader reader(Path f) throws IOException {
        Iterator<ImageReader> it = ImageIO.getImageReadersByFormatName("tiff");
        assertTrue(it.hasNext(), "the JDK has a TIFF reader");
        ImageReader r = it.next();
        ImageInputStream in = ImageIO.createImageInputStream(f.toFile());
        r.setInput(in);
        TIFFImageReadParam p = new TIFFImageReadParam();
        p.setReadUnknownTags(true);
        pixels = r.read(0, p).getRaster();
        return r;
    }

    private static Raster pixels;

    private static void checkPixels(Raster px, int bands, double nodata, boolean f32) {
        assertEquals(COLS, px.getWidth());
        assertEquals(ROWS, px.getHeight());
        assertEquals(bands, px.getNumBands());
        for (int y = 0; y < ROWS; y++) {
            int j = ROWS - 1 - y; // file row 0 is the north edge
            for (int c = 0; c < COLS; c++) {
                for (int b = 0; b < bands; b++) {
                    double want = masked(c, j) ? nodata : f32 ? (float) value(b, c, j) : value(b, c, j);
                    assertEquals(want, px.getSampleDouble(c, y, b), 0.0, "band " + b + " cell " + c + "," + j);
                }
            }
        }
    }

    @Test
    void projectedFloat32TilesPixelsAndGeoTagsReadBackByImageIo() throws Exception {
        Path f = dir.resolve("p.tif");
        RasterSummary s = writeRaster(f, layout(Crs.projected(32633), "median", "q90", "p_exceed"),
                GeoTiffOptions.defaults().withTileSize(16));
        assertFalse(s.bigTiff());
        assertEquals(3 * 2, s.tiles());
        assertEquals(Files.size(f), s.bytes());
        assertFalse(Files.exists(dir.resolve("p.tif.part")));
        ImageReader r = reader(f);
        checkPixels(pixels, 3, -9999, true);
        TIFFDirectory d = TIFFDirectory.createFromMetadata(r.getImageMetadata(0));
        assertEquals(COLS, d.getTIFFField(256).getAsInt(0));
        assertEquals(ROWS, d.getTIFFField(257).getAsInt(0));
        assertArrayEquals(new int[] {32, 32, 32}, d.getTIFFField(258).getAsInts());
        assertEquals(1, d.getTIFFField(259).getAsInt(0));
        assertEquals(16, d.getTIFFField(322).getAsInt(0));
        assertEquals(16, d.getTIFFField(323).getAsInt(0));
        assertArrayEquals(new int[] {3, 3, 3}, d.getTIFFField(339).getAsInts());
        assertArrayEquals(new double[] {25, 50, 0}, d.getTIFFField(33550).getAsDoubles());
        assertArrayEquals(new double[] {0, 0, 0, 500_000, 4_200_000, 0}, d.getTIFFField(33922).getAsDoubles());
        assertArrayEquals(new int[] {1, 1, 1, 3, 1024, 0, 1, 1, 1025, 0, 1, 1, 3072, 0, 1, 32633},
                d.getTIFFField(34735).getAsInts());
        assertEquals("-9999", ascii(d.getTIFFField(42113)));
        String md = ascii(d.getTIFFField(42112));
        assertTrue(md.contains("sample=\"1\" role=\"description\">q90</Item>"), md);
    }

    private static String ascii(TIFFField f) {
        assertTrue(f != null, "tag present");
        return f.getAsString(0);
    }

    @Test
    void geographicFloat64DeflateWithNanNodata() throws Exception {
        Path f = dir.resolve("g.tif");
        RasterLayout lay = new RasterLayout(COLS, ROWS, 9.5, 51.25, 0.01, 0.02, Crs.geographic(4326), List.of("a", "b"));
        writeRaster(f, lay, GeoTiffOptions.defaults().withTileSize(32).withSampleType(GeoTiffOptions.SampleType.FLOAT64)
                .withCompression(GeoTiffOptions.Compression.DEFLATE).withNodata(Double.NaN));
        ImageReader r = reader(f);
        checkPixels(pixels, 2, Double.NaN, false);
        TIFFDirectory d = TIFFDirectory.createFromMetadata(r.getImageMetadata(0));
        assertEquals(8, d.getTIFFField(259).getAsInt(0));
        assertArrayEquals(new int[] {64, 64}, d.getTIFFField(258).getAsInts());
        assertArrayEquals(new int[] {1, 1, 1, 3, 1024, 0, 1, 2, 1025, 0, 1, 1, 2048, 0, 1, 4326},
                d.getTIFFField(34735).getAsInts());
        assertEquals("nan", ascii(d.getTIFFField(42113)));
        assertArrayEquals(new double[] {0, 0, 0, 9.5, 51.25, 0}, d.getTIFFField(33922).getAsDoubles());
    }

    @Test
    void localCrsCarriesCitationAndLinearUnit() throws Exception {
        Path f = dir.resolve("l.tif");
        writeRaster(f, layout(Crs.local("invented city grid, km", 9036), "v"), GeoTiffOptions.defaults());
        ImageReader r = reader(f);
        TIFFDirectory d = TIFFDirectory.createFromMetadata(r.getImageMetadata(0));
        assertArrayEquals(new int[] {1, 1, 1, 5, 1024, 0, 1, 1, 1025, 0, 1, 1, 1026, 34737, 23, 0, 3072, 0, 1, 32767,
            3076, 0, 1, 9036}, d.getTIFFField(34735).getAsInts());
        assertEquals("invented city grid, km|", ascii(d.getTIFFField(34737)));
        checkPixels(pixels, 1, -9999, true);
    }

    @Test
    void bigTiffHoldsTheSameTilesAsTheClassicFile() throws Exception {
        Path classic = dir.resolve("c.tif");
        Path big = dir.resolve("b.tif");
        RasterLayout lay = layout(Crs.projected(3035), "x", "y");
        writeRaster(classic, lay, GeoTiffOptions.defaults().withTileSize(16));
        RasterSummary s = writeRaster(big, lay, GeoTiffOptions.defaults().withTileSize(16)
                .withBigTiff(GeoTiffOptions.BigTiff.ALWAYS));
        assertTrue(s.bigTiff());
        // The JDK reader does not read BigTIFF; a minimal reader of the BigTIFF layout (header: "II", 43,
        // offset size 8, 0, first IFD offset as 8 bytes; entries of 20 bytes) checks the structure, and the
        // tile bytes are compared with those of the classic file, whose pixels ImageIO reads.
        ByteBuffer b = ByteBuffer.wrap(Files.readAllBytes(big)).order(ByteOrder.LITTLE_ENDIAN);
        assertEquals('I', b.get(0));
        assertEquals(43, b.getShort(2));
        assertEquals(8, b.getShort(4));
        long ifd = b.getLong(8);
        long n = b.getLong((int) ifd);
        long[] offs = null;
        long[] counts = null;
        for (int i = 0; i < n; i++) {
            int at = (int) ifd + 8 + 20 * i;
            int tag = b.getShort(at) & 0xFFFF;
            int type = b.getShort(at + 2);
            long count = b.getLong(at + 4);
            if (tag == 324 || tag == 325) {
                assertEquals(16, type, "LONG8");
                long[] v = new long[(int) count];
                long p = count == 1 ? at + 12 : b.getLong(at + 12);
                for (int k = 0; k < count; k++) {
                    v[k] = b.getLong((int) p + 8 * k);
                }
                if (tag == 324) {
                    offs = v;
                } else {
                    counts = v;
                }
            }
        }
        ImageReader r = reader(classic);
        TIFFDirectory d = TIFFDirectory.createFromMetadata(r.getImageMetadata(0));
        long[] co = d.getTIFFField(324).getAsLongs();
        long[] cc = d.getTIFFField(325).getAsLongs();
        byte[] cb = Files.readAllBytes(classic);
        assertEquals(co.length, offs.length);
        for (int k = 0; k < co.length; k++) {
            assertEquals(cc[k], counts[k]);
            byte[] x = new byte[(int) cc[k]];
            byte[] y = new byte[(int) counts[k]];
            System.arraycopy(cb, (int) co[k], x, 0, x.length);
            b.get((int) offs[k], y);
            assertArrayEquals(x, y, "tile " + k);
        }
    }

    @Test
    void northToSouthRowsWithFinishRowsAboveKeepOneRowOfTilesOpen() throws Exception {
        Path f = dir.resolve("n.tif");
        RasterLayout lay = layout(Crs.projected(32633), "v");
        try (GeoTiffWriter w = GeoTiffWriter.create(f, lay, GeoTiffOptions.defaults().withTileSize(16)
                .withMaxOpenTileRows(2))) {
            for (int j = ROWS - 1; j >= 0; j--) {
                int[] cs = new int[COLS];
                int[] js = new int[COLS];
                double[][] v = new double[1][COLS];
                int n = 0;
                for (int c = 0; c < COLS; c++) {
                    if (!masked(c, j)) {
                        cs[n] = c;
                        js[n] = j;
                        v[0][n++] = value(0, c, j);
                    }
                }
                w.writeCells(n, cs, js, v);
                w.finishRowsAbove(j - 1);
            }
            w.finish();
        }
        reader(f);
        checkPixels(pixels, 1, -9999, true);
    }

    @Test
    void misuseIsRefusedAndAnUnfinishedFileIsRemoved() {
        RasterLayout lay = layout(Crs.projected(32633), "v");
        Path f = dir.resolve("m.tif");
        try (GeoTiffWriter w = GeoTiffWriter.create(f, lay, GeoTiffOptions.defaults().withTileSize(16))) {
            w.writeCells(1, new int[] {0}, new int[] {0}, new double[][] {{1}});
            w.finishRowsBelow(10);
            IllegalStateException late = assertThrows(IllegalStateException.class,
                    () -> w.writeCells(1, new int[] {0}, new int[] {3}, new double[][] {{1}}));
            assertTrue(late.getMessage().contains("arrives after its rows were finished"), late.getMessage());
            rejects(() -> w.writeCells(1, new int[] {0}, new int[] {20}, new double[][] {{Double.NaN}}),
                    "cell (column 0, row 20), band 'v': value NaN is not finite");
            rejects(() -> w.writeCells(1, new int[] {0}, new int[] {20}, new double[][] {{-9999}}),
                    "equals the nodata value");
            rejects(() -> w.writeCells(1, new int[] {0}, new int[] {20}, new double[][] {{1e300}}),
                    "FLOAT64 holds more");
            rejects(() -> w.writeCells(1, new int[] {37}, new int[] {20}, new double[][] {{1}}),
                    "lies outside the raster of 37 x 23 cells");
            assertTrue(Files.exists(dir.resolve("m.tif.part")));
        }
        assertFalse(Files.exists(dir.resolve("m.tif.part")));
        assertFalse(Files.exists(f));
        RasterLayout tall = new RasterLayout(4, 100, 0, 0, 1, 1, Crs.projected(32633), List.of("v"));
        try (GeoTiffWriter w = GeoTiffWriter.create(f, tall, GeoTiffOptions.defaults().withTileSize(16)
                .withMaxOpenTileRows(2))) {
            w.writeCells(2, new int[] {0, 0}, new int[] {0, 99}, new double[][] {{1, 2}});
            IllegalStateException many = assertThrows(IllegalStateException.class,
                    () -> w.writeCells(1, new int[] {0}, new int[] {50}, new double[][] {{1}}));
            assertTrue(many.getMessage().contains("more than 2"), many.getMessage());
        }
        rejects(() -> GeoTiffWriter.create(f, lay, GeoTiffOptions.defaults().withNodata(0.1)),
                "not exactly representable as a 32-bit float");
        rejects(() -> GeoTiffWriter.create(f, new RasterLayout(200_000, 200_000, 0, 0, 1, 1, Crs.projected(32633),
                List.of("a", "b", "c", "d")), GeoTiffOptions.defaults().withBigTiff(GeoTiffOptions.BigTiff.NEVER)),
                "more than a classic TIFF holds");
    }
}
