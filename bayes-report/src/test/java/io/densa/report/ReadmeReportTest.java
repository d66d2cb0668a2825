package io.densa.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.File;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import jdk.jshell.JShell;
import jdk.jshell.Snippet;
import jdk.jshell.SnippetEvent;
import jdk.jshell.SourceCodeAnalysis;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Runs the README's section "Writing a report" (its {@code ```java} blocks) through the JDK's
 * {@code jdk.jshell} API in this JVM, with the report folder redirected to a temporary one, and
 * checks the files the snippet writes, so that the documented example cannot rot.
 */
class ReadmeReportTest {
    static final Path ROOT = Path.of("..").toAbsolutePath().normalize();
    static final String FOLDER = "Path.of(\"twelve-profiles\")";

    static String javaBlocks(String markdown) {
        int section = markdown.indexOf("## Writing a report");
        assertTrue(section >= 0, "README has no section 'Writing a report'");
        int end = markdown.indexOf("\n## ", section + 5);
        String text = markdown.substring(section, end < 0 ? markdown.length() : end);
        StringBuilder out = new StringBuilder();
        int from = 0;
        while (true) {
            int open = text.indexOf("```java\n", from);
            if (open < 0) {
                break;
            }
            int close = text.indexOf("\n```", open + 8);
            out.append(text, open + 8, close + 1);
            from = close + 4;
        }
        return out.toString();
    }

    /**
     * Splits Java source into JShell snippets statement by statement (the blocks are ordinary Java
     * with semicolons, so a statement may continue on the next line).
     */
    static List<String> snippets(JShell shell, String source) {
        List<String> out = new ArrayList<>();
        SourceCodeAnalysis analysis = shell.sourceCodeAnalysis();
        String remaining = source;
        while (!remaining.isBlank()) {
            SourceCodeAnalysis.CompletionInfo info = analysis.analyzeCompletion(remaining);
            if (!info.completeness().isComplete()) {
                fail("incomplete snippet in the README section: " + remaining);
            }
            out.add(info.source());
            remaining = info.remaining();
        }
        return out;
    }

    @Test
    void readmeReportExampleWritesItsReport(@TempDir Path dir) throws IOException {
        String code = javaBlocks(Files.readString(ROOT.resolve("README.md")));
        assertTrue(code.contains(FOLDER), "the README example should write to " + FOLDER);
        Path out = dir.resolve("twelve-profiles");
        code = code.replace(FOLDER, "Path.of(\"" + out.toString().replace("\\", "\\\\") + "\")");
        try (JShell shell = JShell.builder().executionEngine("local").build()) {
            for (String entry : System.getProperty("java.class.path").split(File.pathSeparator)) {
                shell.addToClasspath(entry);
            }
            int count = 0;
            for (String snippet : snippets(shell, code)) {
                for (SnippetEvent event : shell.eval(snippet)) {
                    String where = "snippet: " + snippet.strip();
                    assertNull(event.exception(), () -> where + " threw " + event.exception());
                    if (event.snippet() != null && event.causeSnippet() == null) {
                        assertEquals(Snippet.Status.VALID, event.status(), () -> where + " is " + event.status()
                                + ": " + shell.diagnostics(event.snippet()).map(d -> d.getMessage(null)).toList());
                    }
                }
                count++;
            }
            assertTrue(count >= 8, "expected the imports and the example's statements, ran " + count);
        }
        for (String f : List.of("summary.md", "summary.html", "units.csv", "fig_modes.png")) {
            assertTrue(Files.size(out.resolve(f)) > 0, f + " missing");
        }
        assertEquals(13, Files.readAllLines(out.resolve("units.csv")).size(), "header and twelve units");
        assertFalse(Files.readString(out.resolve("summary.html")).contains("src=\"fig_"), "figures embedded");
    }
}
