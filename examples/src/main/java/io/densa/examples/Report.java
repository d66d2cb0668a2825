package io.densa.examples;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Base64;
import java.util.List;

/**
 * A report assembled from blocks (headings, paragraphs, bullet lists, tables, figures) and
 * written twice: as {@code summary.md} (figures linked as files beside it) and as a
 * self-contained {@code summary.html} (figures inlined as base64 PNG data).
 *
 * <p>Inline markup accepted in text: {@code `code`} and {@code **bold**}.
 */
final class Report {
    /** The caution every report carries. */
    static final String CAUTION = "The flags, scores, clusters and exceedance probabilities in this report are "
            + "statistical signals for trained analysts. They are not diagnoses and exceedance maps are not "
            + "regulatory assessments; decisions follow local public-health and environmental authorities, "
            + "applicable codes and licensed practice. All data here are invented by a seeded generator.";

    private sealed interface Block permits Heading, Para, Bullets, Table, Figure {
    }

    private record Heading(int level, String text) implements Block {
    }

    private record Para(String text) implements Block {
    }

    private record Bullets(List<String> items) implements Block {
    }

    private record Table(String[] header, List<String[]> rows) implements Block {
    }

    private record Figure(String file, String caption) implements Block {
    }

    private final Path dir;
    private final String title;
    private final List<Block> blocks = new ArrayList<>();
    private final List<String> keyNumbers = new ArrayList<>();

    Report(Path dir, String title) {
        this.dir = dir;
        this.title = title;
    }

    Path dir() {
        return dir;
    }

    Report heading(String text) {
        blocks.add(new Heading(2, text));
        return this;
    }

    Report subheading(String text) {
        blocks.add(new Heading(3, text));
        return this;
    }

    Report paragraph(String text) {
        blocks.add(new Para(text));
        return this;
    }

    Report bullets(List<String> items) {
        blocks.add(new Bullets(List.copyOf(items)));
        return this;
    }

    Report table(String[] header, List<String[]> rows) {
        blocks.add(new Table(header.clone(), List.copyOf(rows)));
        return this;
    }

    /** A figure already written as {@code file} inside the report folder. */
    Report figure(String file, String caption) {
        blocks.add(new Figure(file, caption));
        return this;
    }

    /** A line of the "Key numbers" list shown first, whenever it is added. */
    Report keyNumber(String text) {
        keyNumbers.add(text);
        return this;
    }

    private List<Block> allBlocks() {
        List<Block> all = new ArrayList<>();
        all.add(new Para("*Invented data throughout. The results are statistical signals for trained analysts, not "
                + "diagnoses or regulatory assessments; see the caution at the end.*"));
        if (!keyNumbers.isEmpty()) {
            all.add(new Heading(2, "Key numbers"));
            all.add(new Bullets(List.copyOf(keyNumbers)));
        }
        all.addAll(blocks);
        return all;
    }

    Report caution() {
        heading("Caution");
        return paragraph(CAUTION);
    }

    /** Writes summary.md and summary.html into the folder. */
    void write() {
        try {
            Files.writeString(dir.resolve("summary.md"), markdown(), StandardCharsets.UTF_8);
            Files.writeString(dir.resolve("summary.html"), html(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    String markdown() {
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
            } else if (b instanceof Table t) {
                sb.append('|');
                for (String h : t.header()) {
                    sb.append(' ').append(cellMd(h)).append(" |");
                }
                sb.append("\n|");
                for (int i = 0; i < t.header().length; i++) {
                    sb.append("---|");
                }
                sb.append('\n');
                for (String[] row : t.rows()) {
                    sb.append('|');
                    for (String c : row) {
                        sb.append(' ').append(cellMd(c)).append(" |");
                    }
                    sb.append('\n');
                }
                sb.append('\n');
            } else if (b instanceof Figure f) {
                sb.append("![").append(f.caption()).append("](").append(f.file()).append(")\n\n*")
                        .append(f.caption()).append("*\n\n");
            }
        }
        return sb.toString();
    }

    String html() {
        StringBuilder sb = new StringBuilder();
        sb.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>")
                .append(escape(title)).append("</title>\n<style>\n")
                .append("body{font-family:sans-serif;max-width:1000px;margin:2em auto;padding:0 1em;line-height:1.45;"
                        + "color:#222}\n")
                .append("table{border-collapse:collapse;margin:1em 0;font-size:0.9em}"
                        + "td,th{border:1px solid #bbb;padding:3px 8px;text-align:left}th{background:#eee}\n")
                .append("img{max-width:100%;border:1px solid #ddd}figure{margin:1.5em 0}"
                        + "figcaption{font-style:italic;color:#444}\n")
                .append("code{background:#f3f3f3;padding:0 3px}\n</style>\n</head>\n<body>\n<h1>")
                .append(escape(title)).append("</h1>\n");
        for (Block b : allBlocks()) {
            if (b instanceof Heading h) {
                sb.append("<h").append(h.level()).append('>').append(inline(h.text())).append("</h")
                        .append(h.level()).append(">\n");
            } else if (b instanceof Para p) {
                sb.append("<p>").append(inline(p.text())).append("</p>\n");
            } else if (b instanceof Bullets l) {
                sb.append("<ul>\n");
                for (String item : l.items()) {
                    sb.append("<li>").append(inline(item)).append("</li>\n");
                }
                sb.append("</ul>\n");
            } else if (b instanceof Table t) {
                sb.append("<table>\n<tr>");
                for (String h : t.header()) {
                    sb.append("<th>").append(inline(h)).append("</th>");
                }
                sb.append("</tr>\n");
                for (String[] row : t.rows()) {
                    sb.append("<tr>");
                    for (String c : row) {
                        sb.append("<td>").append(inline(c)).append("</td>");
                    }
                    sb.append("</tr>\n");
                }
                sb.append("</table>\n");
            } else if (b instanceof Figure f) {
                sb.append("<figure><img alt=\"").append(escape(f.caption())).append("\" src=\"data:image/png;base64,")
                        .append(base64(f.file())).append("\"><figcaption>").append(inline(f.caption()))
                        .append("</figcaption></figure>\n");
            }
        }
        sb.append("</body>\n</html>\n");
        return sb.toString();
    }

    private String base64(String file) {
        try {
            return Base64.getEncoder().encodeToString(Files.readAllBytes(dir.resolve(file)));
        } catch (IOException e) {
            throw new UncheckedIOException("figure " + file + " is missing from " + dir, e);
        }
    }

    private static String cellMd(String s) {
        return s.replace("|", "\\|").replace("\n", " ");
    }

    static String escape(String s) {
        return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("\"", "&quot;");
    }

    /** Escapes HTML and turns `code` and **bold** into tags. */
    static String inline(String s) {
        String e = escape(s);
        e = e.replaceAll("`([^`]+)`", "<code>$1</code>");
        e = e.replaceAll("\\*\\*([^*]+)\\*\\*", "<strong>$1</strong>");
        e = e.replaceAll("(?<![*\\w])\\*([^*]+)\\*(?![*\\w])", "<em>$1</em>");
        return e;
    }
}
