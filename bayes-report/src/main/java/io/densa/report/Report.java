package io.densa.report;

import io.densa.io.geometry.GeoJsonUnitWriter;
import io.densa.io.geometry.UnitValues;
import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Base64;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Set;
import javax.imageio.ImageIO;
import org.locationtech.jts.geom.Geometry;

/**
 * A report assembled from sections — headings, paragraphs, bullet lists, tables, figures and
 * maps — and written into one folder as {@code summary.md} (figures linked beside it), a
 * self-contained {@code summary.html} (figures embedded as base64 PNG, no other file needed), CSV
 * tables, GeoJSON units (through bayes-io's {@link GeoJsonUnitWriter}) and PNG figures.
 *
 * <pre>{@code
 * Report.titled("Age profiles by district")
 *       .paragraph("Densities estimated from counts by single year of age.")
 *       .figure("fig_density.png", Figures.density("District A", density, observed, ages), "District A.")
 *       .table(table, "districts.csv")
 *       .writeTo(Path.of("report"));
 * }</pre>
 *
 * <p>Every report opens with a line and closes with a section saying that its outputs are
 * statistical signals for trained analysts, not diagnoses or regulatory assessments
 * ({@link #CAUTION}; {@link #caution(String)} adapts the wording, it cannot remove it). The folder
 * holds only the files of the last report written to it: the files of the previous report (listed
 * in a manifest) are deleted first, and a folder with other content is refused, so no file a
 * report did not write is ever deleted.
 *
 * <p>Inline markup accepted in text: {@code `code`}, {@code **bold**} and {@code *italic*}.
 *
 * <p>A report is a mutable builder: not thread-safe; figures are rendered when written.
 */
public final class Report {
    /** The caution every report carries unless adapted. */
    public static final String CAUTION = "The flags, scores, clusters, surfaces and probabilities in this report are "
            + "statistical signals for trained analysts. They are not diagnoses, and maps of exceedance are not "
            + "regulatory assessments. Decisions follow the local public-health and environmental authorities, the "
            + "applicable codes and licensed practice.";
    private static final String OPENING = "*Statistical signals for trained analysts, not diagnoses or regulatory "
            + "assessments; see the caution at the end.*";

    private sealed interface Block permits Heading, Para, Bullets, TableBlock, FigureBlock {
    }

    private record Heading(int level, String text) implements Block {
    }

    private record Para(String text) implements Block {
    }

    private record Bullets(List<String> items) implements Block {
    }

    private record TableBlock(Table table, String file) implements Block {
    }

    private record FigureBlock(String file, String caption) implements Block {
    }

    private record GeoJsonFile(List<Geometry> geometries, UnitValues values) {
    }

    private final String title;
    private final List<String> notes = new ArrayList<>();
    private final List<String> keyNumbers = new ArrayList<>();
    private final List<Block> blocks = new ArrayList<>();
    private final Map<String, Object> files = new LinkedHashMap<>();
    private String caution = CAUTION;

    private Report(String title) {
        this.title = title;
    }

    /** A new report with this title. */
    public static Report titled(String title) {
        Objects.requireNonNull(title, "title");
        if (title.isBlank()) {
            throw new IllegalArgumentException("a report needs a title");
        }
        return new Report(title);
    }

    /**
     * Checks, before a long computation, that a report can be written to {@code dir}: creates the
     * folder if missing, and fails if it is a file, cannot be written, or holds files not written
     * by a Densa report.
     *
     * @throws IllegalArgumentException with a message saying what is wrong and what would be accepted
     */
    public static void checkFolder(Path dir) {
        ReportFolder.prepare(Objects.requireNonNull(dir, "dir"));
    }

    /** A line in italics under the title (e.g. "Invented data throughout."). */
    public Report note(String text) {
        notes.add(Objects.requireNonNull(text, "text"));
        return this;
    }

    /** A line of the "Key numbers" list shown first, whenever it is added. */
    public Report keyNumber(String text) {
        keyNumbers.add(Objects.requireNonNull(text, "text"));
        return this;
    }

    /** A section heading. */
    public Report heading(String text) {
        blocks.add(new Heading(2, Objects.requireNonNull(text, "text")));
        return this;
    }

    /** A sub-section heading. */
    public Report subheading(String text) {
        blocks.add(new Heading(3, Objects.requireNonNull(text, "text")));
        return this;
    }

    /** A paragraph. */
    public Report paragraph(String text) {
        blocks.add(new Para(Objects.requireNonNull(text, "text")));
        return this;
    }

    /** A bullet list (nothing is added for an empty list). */
    public Report bullets(List<String> items) {
        if (!items.isEmpty()) {
            blocks.add(new Bullets(List.copyOf(items)));
        }
        return this;
    }

    /** A table shown in the report. */
    public Report table(Table table) {
        blocks.add(new TableBlock(Objects.requireNonNull(table, "table"), null));
        return this;
    }

    /** A table shown in the report and written as CSV to {@code file}, linked under it. */
    public Report table(Table table, String file) {
        claim(file, ".csv", table);
        blocks.add(new TableBlock(table, file));
        return this;
    }

    /** A table written as CSV only (e.g. the input data), not shown. */
    public Report csv(String file, Table table) {
        claim(file, ".csv", Objects.requireNonNull(table, "table"));
        return this;
    }

    /** A figure written as PNG to {@code file} and shown with its caption. */
    public Report figure(String file, Figure figure, String caption) {
        claim(file, ".png", Objects.requireNonNull(figure, "figure"));
        blocks.add(new FigureBlock(file, Objects.requireNonNull(caption, "caption")));
        return this;
    }

    /**
     * Units with their values written as RFC 7946 GeoJSON through bayes-io's
     * {@link GeoJsonUnitWriter}.
     *
     * @param geometries one per unit, in WGS 84 longitude/latitude, in the order of the values
     * @param values     the per-unit values (e.g. {@link Table#unitValues(String)})
     */
    public Report geoJson(String file, List<? extends Geometry> geometries, UnitValues values) {
        Objects.requireNonNull(geometries, "geometries");
        Objects.requireNonNull(values, "values");
        if (geometries.size() != values.size()) {
            throw new IllegalArgumentException("GeoJSON " + file + ": " + geometries.size() + " geometries for "
                    + values.size() + " units");
        }
        claim(file, ".geojson", new GeoJsonFile(List.copyOf(geometries), values));
        return this;
    }

    /** Replaces the wording of the closing caution (it must still be said). */
    public Report caution(String text) {
        Objects.requireNonNull(text, "text");
        if (text.isBlank()) {
            throw new IllegalArgumentException("the caution cannot be empty");
        }
        caution = text;
        return this;
    }

    private void claim(String file, String extension, Object content) {
        Objects.requireNonNull(file, "file");
        if (!ReportFolder.FILE_NAME.matcher(file).matches() || !file.endsWith(extension)) {
            throw new IllegalArgumentException("file name '" + file + "' must be a plain name (letters, digits, '.', "
                    + "'_', '-') ending in " + extension);
        }
        if (file.equals("summary.md") || file.equals("summary.html") || files.containsKey(file)) {
            throw new IllegalArgumentException("file name '" + file + "' is already used in this report");
        }
        files.put(file, content);
    }

    /** The files the report will write, in order (summary.md and summary.html last). */
    public List<String> fileNames() {
        List<String> out = new ArrayList<>(files.keySet());
        out.add("summary.md");
        out.add("summary.html");
        return out;
    }

    /**
     * Writes every file of the report into {@code dir} (created if missing), after deleting the
     * files of the report previously written there.
     *
     * @return the folder and the files written
     * @throws IllegalArgumentException if the folder cannot be used (see {@link #checkFolder})
     * @throws UncheckedIOException     if a file cannot be written
     */
    public ReportFiles writeTo(Path dir) {
        Objects.requireNonNull(dir, "dir");
        List<String> previous = ReportFolder.prepare(dir);
        List<String> names = fileNames();
        ReportFolder.replace(dir, previous, names);
        Map<String, byte[]> pngs = new LinkedHashMap<>();
        for (Map.Entry<String, Object> e : files.entrySet()) {
            Path target = dir.resolve(e.getKey());
            Object content = e.getValue();
            if (content instanceof Figure f) {
                byte[] png = png(f, e.getKey());
                pngs.put(e.getKey(), png);
                write(target, png);
            } else if (content instanceof Table t) {
                t.writeCsv(target);
            } else if (content instanceof GeoJsonFile g) {
                GeoJsonUnitWriter.withDefaults().write(target, g.geometries(), g.values());
            }
        }
        write(dir.resolve("summary.md"), markdown().getBytes(StandardCharsets.UTF_8));
        write(dir.resolve("summary.html"), html(pngs).getBytes(StandardCharsets.UTF_8));
        return new ReportFiles(dir, names);
    }

    private static byte[] png(Figure f, String name) {
        BufferedImage img = f.render();
        if (img == null) {
            throw new IllegalStateException("figure " + name + " rendered no image");
        }
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        try {
            ImageIO.write(img, "png", out);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot encode figure " + name + " as PNG", e);
        }
        return out.toByteArray();
    }

    private static void write(Path file, byte[] bytes) {
        try {
            Files.write(file, bytes);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file + ": " + e.getMessage(), e);
        }
    }

    private List<Block> allBlocks() {
        List<Block> all = new ArrayList<>();
        all.add(new Para(OPENING));
        for (String n : notes) {
            all.add(new Para("*" + n + "*"));
        }
        if (!keyNumbers.isEmpty()) {
            all.add(new Heading(2, "Key numbers"));
            all.add(new Bullets(List.copyOf(keyNumbers)));
        }
        all.addAll(blocks);
        all.add(new Heading(2, "Caution"));
        all.add(new Para(caution));
        return all;
    }

    /** The report as Markdown (figures linked by file name). */
    public String markdown() {
        StringBuilder sb = new StringBuilder("# ").append(title).append("\n\n");
        for (Block b : allBlocks()) {
            if (b instanceof Heading h) {
                sb.append("#".repeat(h.level())).append(' ').append(h.text()).append("\n\n");
            } else if (b instanceof Para p) {
                sb.append(p.text()).append("\n\n");
            } else if (b instanceof Bullets l) {
                for (String item : l.items()) {
                    sb.append("- ").append(item).append('\n');
                }
                sb.append('\n');
            } else if (b instanceof TableBlock t) {
                markdownTable(sb, t.table());
                if (t.file() != null) {
                    sb.append("Table as CSV: `").append(t.file()).append("`.\n\n");
                }
            } else if (b instanceof FigureBlock f) {
                sb.append("![").append(cellMd(f.caption())).append("](").append(f.file()).append(")\n\n*")
                        .append(f.caption()).append("*\n\n");
            }
        }
        return sb.toString();
    }

    private static void markdownTable(StringBuilder sb, Table t) {
        List<String> labels = t.labels();
        sb.append('|');
        for (String h : labels) {
            sb.append(' ').append(cellMd(h)).append(" |");
        }
        sb.append("\n|");
        for (int j = 0; j < labels.size(); j++) {
            sb.append(t.numeric(j) ? "---:|" : "---|");
        }
        sb.append('\n');
        for (String[] row : t.displayRows()) {
            sb.append('|');
            for (String c : row) {
                sb.append(' ').append(cellMd(c)).append(" |");
            }
            sb.append('\n');
        }
        sb.append('\n');
    }

    /** The report as self-contained HTML, figures rendered and embedded. */
    public String html() {
        Map<String, byte[]> pngs = new LinkedHashMap<>();
        for (Map.Entry<String, Object> e : files.entrySet()) {
            if (e.getValue() instanceof Figure f) {
                pngs.put(e.getKey(), png(f, e.getKey()));
            }
        }
        return html(pngs);
    }

    private String html(Map<String, byte[]> pngs) {
        StringBuilder sb = new StringBuilder();
        sb.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
                .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>")
                .append(escape(title)).append("</title>\n<style>\n").append(Style.CSS).append("</style>\n</head>\n")
                .append("<body>\n<main>\n<h1>").append(escape(title)).append("</h1>\n");
        Set<Block> cautionBlocks = new HashSet<>();
        List<Block> all = allBlocks();
        cautionBlocks.add(all.get(all.size() - 1));
        for (Block b : all) {
            if (b instanceof Heading h) {
                sb.append("<h").append(h.level()).append('>').append(inline(h.text())).append("</h").append(h.level())
                        .append(">\n");
            } else if (b instanceof Para p) {
                sb.append(cautionBlocks.contains(b) ? "<p class=\"caution\">" : "<p>").append(inline(p.text()))
                        .append("</p>\n");
            } else if (b instanceof Bullets l) {
                sb.append("<ul>\n");
                for (String item : l.items()) {
                    sb.append("<li>").append(inline(item)).append("</li>\n");
                }
                sb.append("</ul>\n");
            } else if (b instanceof TableBlock t) {
                htmlTable(sb, t.table());
                if (t.file() != null) {
                    sb.append("<p class=\"file\">Table as CSV: <code>").append(escape(t.file()))
                            .append("</code></p>\n");
                }
            } else if (b instanceof FigureBlock f) {
                byte[] png = pngs.get(f.file());
                sb.append("<figure><img alt=\"").append(escape(f.caption())).append("\" src=\"data:image/png;base64,")
                        .append(Base64.getEncoder().encodeToString(png)).append("\"><figcaption>")
                        .append(inline(f.caption())).append("</figcaption></figure>\n");
            }
        }
        sb.append("</main>\n</body>\n</html>\n");
        return sb.toString();
    }

    private static void htmlTable(StringBuilder sb, Table t) {
        List<String> labels = t.labels();
        sb.append("<div class=\"table\"><table>\n<thead><tr>");
        for (int j = 0; j < labels.size(); j++) {
            sb.append(t.numeric(j) ? "<th class=\"num\">" : "<th>").append(inline(labels.get(j))).append("</th>");
        }
        sb.append("</tr></thead>\n<tbody>\n");
        for (String[] row : t.displayRows()) {
            sb.append("<tr>");
            for (int j = 0; j < row.length; j++) {
                sb.append(t.numeric(j) ? "<td class=\"num\">" : "<td>").append(inline(row[j])).append("</td>");
            }
            sb.append("</tr>\n");
        }
        sb.append("</tbody></table></div>\n");
    }

    private static String cellMd(String s) {
        return s.replace("|", "\\|").replace("\n", " ").replace("[", "\\[").replace("]", "\\]");
    }

    static String escape(String s) {
        return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("\"", "&quot;");
    }

    /** Escapes HTML and turns `code`, **bold** and *italic* into tags. */
    static String inline(String s) {
        String e = escape(s);
        e = e.replaceAll("`([^`]+)`", "<code>$1</code>");
        e = e.replaceAll("\\*\\*([^*]+)\\*\\*", "<strong>$1</strong>");
        e = e.replaceAll("(?<![*\\w])\\*([^*]+)\\*(?![*\\w])", "<em>$1</em>");
        return e;
    }

    /** The look of the HTML page. */
    private static final class Style {
        static final String CSS = """
                :root{--ink:#2759a2;--text:#23262b;--muted:#5b6068;--rule:#e3e1dc;--paper:#fdfcf9;--ochre:#eea743}
                body{margin:0;background:var(--paper);color:var(--text);font:16px/1.55 system-ui,-apple-system,\
                "Segoe UI","DejaVu Sans",sans-serif}
                main{max-width:1060px;margin:0 auto;padding:2.2em 1.4em 4em}
                h1{font-size:1.75em;line-height:1.25;margin:0 0 .6em;padding-bottom:.35em;border-bottom:3px solid var(--ink)}
                h2{font-size:1.3em;margin:2.2em 0 .6em;color:var(--ink)}
                h3{font-size:1.08em;margin:1.6em 0 .5em}
                p,li{max-width:52em}
                em{color:var(--muted)}
                code{font:.9em "DejaVu Sans Mono",monospace;background:#f0eee8;padding:0 .25em;border-radius:3px}
                .table{overflow-x:auto;margin:1em 0}
                table{border-collapse:collapse;font-size:.9em;font-variant-numeric:tabular-nums}
                th{text-align:left;border-bottom:2px solid var(--text);padding:4px 12px;vertical-align:bottom}
                td{border-bottom:1px solid var(--rule);padding:3px 12px}
                th.num,td.num{text-align:right}
                tbody tr:hover{background:#f3f1ea}
                .file{font-size:.88em;color:var(--muted);margin-top:-.4em}
                figure{margin:1.8em 0}
                figure img{max-width:100%;height:auto;border:1px solid var(--rule);background:#fff}
                figcaption{font-size:.92em;color:var(--muted);margin-top:.4em;max-width:52em}
                .caution{border-left:4px solid var(--ochre);background:#fbf4e6;padding:.7em 1em}
                """;
    }
}
