package io.densa.examples;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

/** CSV output (RFC 4180 quoting, comma separator, dot decimals) and number formatting. */
final class Tables {
    private Tables() {
    }

    static void writeCsv(Path file, String[] header, List<Object[]> rows) {
        try (Writer w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            writeRow(w, header);
            for (Object[] row : rows) {
                if (row.length != header.length) {
                    throw new IllegalArgumentException("CSV row has " + row.length + " cells, header has "
                            + header.length + " (" + file.getFileName() + ")");
                }
                writeRow(w, row);
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private static void writeRow(Writer w, Object[] cells) throws IOException {
        for (int i = 0; i < cells.length; i++) {
            if (i > 0) {
                w.write(',');
            }
            w.write(quote(cell(cells[i])));
        }
        w.write("\r\n");
    }

    static String cell(Object o) {
        if (o == null) {
            return "";
        }
        if (o instanceof Double d) {
            return Double.isNaN(d) ? "" : fmt(d, 6);
        }
        return o.toString();
    }

    private static String quote(String s) {
        if (s.contains(",") || s.contains("\"") || s.contains("\n") || s.contains("\r")) {
            return '"' + s.replace("\"", "\"\"") + '"';
        }
        return s;
    }

    /** Fixed-point formatting with {@code digits} decimals, locale-independent. */
    static String fmt(double v, int digits) {
        if (Double.isNaN(v)) {
            return "n/a";
        }
        return String.format(Locale.ROOT, "%." + digits + "f", v);
    }
}
