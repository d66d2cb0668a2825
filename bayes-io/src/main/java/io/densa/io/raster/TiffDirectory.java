package io.densa.io.raster;

import java.io.ByteArrayOutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;

/**
 * The entries of a GeoTIFF image file directory: the TIFF 6.0 baseline and tiling tags, the GeoTIFF
 * 1.1 (OGC 19-008r4) model tags and key directory, and the band descriptions and no-data value as
 * ASCII tags, each encoded little-endian as {@link GeoTiffWriter} writes them. Package-private;
 * stateless.
 */
final class TiffDirectory {
    static final int SHORT = 3;
    static final int LONG = 4;
    static final int ASCII = 2;
    static final int DOUBLE = 12;
    static final int LONG8 = 16;

    private TiffDirectory() {
    }

    /** One directory entry: tag, field type, value count and the encoded values. */
    record Entry(int tag, int type, long count, byte[] data) {
    }

    /**
     * The entries of the one image of a raster, sorted by tag.
     *
     * @param layout         the raster layout (size, cell size, origin, CRS, band names)
     * @param options        the writer options (no-data value)
     * @param bands          number of bands
     * @param bytesPerSample 4 or 8
     * @param tile           tile width and height in cells
     * @param big            BigTIFF (8-byte offsets)
     * @param deflate        whether tiles are deflate-compressed
     * @param offsets        file offset of each tile
     * @param byteCounts     encoded size of each tile
     */
    static List<Entry> entries(RasterLayout layout, GeoTiffOptions options, int bands, int bytesPerSample, int tile,
            boolean big, boolean deflate, long[] offsets, long[] byteCounts) {
        List<Entry> e = new ArrayList<>();
        e.add(longs(256, layout.columns()));
        e.add(longs(257, layout.rows()));
        int[] bits = new int[bands];
        Arrays.fill(bits, bytesPerSample * 8);
        e.add(shorts(258, bits));
        e.add(shorts(259, deflate ? 8 : 1));
        e.add(shorts(262, 1));
        e.add(shorts(277, bands));
        e.add(shorts(284, 1));
        e.add(longs(322, tile));
        e.add(longs(323, tile));
        e.add(big ? long8s(324, offsets) : longArray(324, offsets));
        e.add(big ? long8s(325, byteCounts) : longArray(325, byteCounts));
        if (bands > 1) {
            e.add(shorts(338, new int[bands - 1]));
        }
        int[] fmt = new int[bands];
        Arrays.fill(fmt, 3);
        e.add(shorts(339, fmt));
        e.add(doubles(33550, layout.cellWidth(), layout.cellHeight(), 0));
        e.add(doubles(33922, 0, 0, 0, layout.minX(), layout.maxY(), 0));
        Crs crs = layout.crs();
        List<int[]> keys = new ArrayList<>();
        keys.add(new int[] {1024, 0, 1, crs.isGeographic() ? 2 : 1});
        keys.add(new int[] {1025, 0, 1, 1});
        String ascii = null;
        if (crs.citation() != null) {
            ascii = crs.citation() + "|";
            keys.add(new int[] {1026, 34737, ascii.length(), 0});
        }
        keys.add(new int[] {crs.isGeographic() ? 2048 : 3072, 0, 1, crs.code()});
        if (crs.citation() != null) {
            keys.add(new int[] {3076, 0, 1, crs.linearUnit()});
        }
        int[] dir = new int[4 + 4 * keys.size()];
        dir[0] = 1;
        dir[1] = 1;
        dir[2] = 1;
        dir[3] = keys.size();
        for (int k = 0; k < keys.size(); k++) {
            System.arraycopy(keys.get(k), 0, dir, 4 + 4 * k, 4);
        }
        e.add(shorts(34735, dir));
        if (ascii != null) {
            e.add(ascii(34737, ascii));
        }
        StringBuilder md = new StringBuilder("<GDALMetadata>\n");
        for (int b = 0; b < bands; b++) {
            md.append("  <Item name=\"DESCRIPTION\" sample=\"").append(b).append("\" role=\"description\">")
                    .append(xml(layout.bands().get(b))).append("</Item>\n");
        }
        md.append("</GDALMetadata>");
        e.add(ascii(42112, md.toString()));
        e.add(ascii(42113, nodataText(options.nodata())));
        e.sort(Comparator.comparingInt(Entry::tag));
        return e;
    }

    static String nodataText(double v) {
        if (Double.isNaN(v)) {
            return "nan";
        }
        if (v == Math.rint(v) && Math.abs(v) < 1e15) {
            return Long.toString((long) v);
        }
        return Double.toString(v);
    }

    private static String xml(String s) {
        return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("\"", "&quot;");
    }

    private static Entry shorts(int tag, int... v) {
        ByteBuffer b = ByteBuffer.allocate(2 * v.length).order(ByteOrder.LITTLE_ENDIAN);
        for (int x : v) {
            b.putShort((short) x);
        }
        return new Entry(tag, SHORT, v.length, b.array());
    }

    private static Entry longs(int tag, long... v) {
        return longArray(tag, v);
    }

    private static Entry longArray(int tag, long[] v) {
        ByteBuffer b = ByteBuffer.allocate(4 * v.length).order(ByteOrder.LITTLE_ENDIAN);
        for (long x : v) {
            b.putInt((int) x);
        }
        return new Entry(tag, LONG, v.length, b.array());
    }

    private static Entry long8s(int tag, long[] v) {
        ByteBuffer b = ByteBuffer.allocate(8 * v.length).order(ByteOrder.LITTLE_ENDIAN);
        for (long x : v) {
            b.putLong(x);
        }
        return new Entry(tag, LONG8, v.length, b.array());
    }

    private static Entry doubles(int tag, double... v) {
        ByteBuffer b = ByteBuffer.allocate(8 * v.length).order(ByteOrder.LITTLE_ENDIAN);
        for (double x : v) {
            b.putDouble(x);
        }
        return new Entry(tag, DOUBLE, v.length, b.array());
    }

    private static Entry ascii(int tag, String s) {
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        byte[] t = s.getBytes(StandardCharsets.US_ASCII);
        o.write(t, 0, t.length);
        o.write(0);
        return new Entry(tag, ASCII, t.length + 1, o.toByteArray());
    }
}
