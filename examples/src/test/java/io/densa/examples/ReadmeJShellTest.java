package io.densa.examples;

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

/**
 * Runs the README's JShell session (every {@code ```jshell} block of the section "Using Densa
 * from JShell") after the startup script {@code jshell/densa.jsh}, through the JDK's
 * {@code jdk.jshell} API in this JVM, so that the documented session cannot rot. Each snippet
 * must be valid and throw nothing, and every numeric result must be finite.
 */
class ReadmeJShellTest {
    static final Path ROOT = Path.of("..").toAbsolutePath().normalize();

    static List<String> jshellBlocks(String markdown) {
        List<String> blocks = new ArrayList<>();
        int section = markdown.indexOf("## Using Densa from JShell");
        assertTrue(section >= 0, "README has no section 'Using Densa from JShell'");
        int end = markdown.indexOf("\n## ", section + 5);
        String text = markdown.substring(section, end < 0 ? markdown.length() : end);
        int from = 0;
        while (true) {
            int open = text.indexOf("```jshell\n", from);
            if (open < 0) {
                break;
            }
            int close = text.indexOf("\n```", open + 10);
            blocks.add(text.substring(open + 10, close + 1));
            from = close + 4;
        }
        return blocks;
    }

    /**
     * Splits source into snippets the way interactive JShell reads it: line by line, a snippet
     * ends at the first line where the text so far is complete. Comment-only lines are skipped.
     */
    static List<String> snippets(JShell shell, String source) {
        List<String> out = new ArrayList<>();
        SourceCodeAnalysis analysis = shell.sourceCodeAnalysis();
        StringBuilder buffer = new StringBuilder();
        for (String line : source.split("\n", -1)) {
            if (buffer.length() == 0 && (line.isBlank() || line.strip().startsWith("//"))) {
                continue;
            }
            buffer.append(line).append('\n');
            SourceCodeAnalysis.CompletionInfo info = analysis.analyzeCompletion(buffer.toString());
            if (info.completeness().isComplete() && info.remaining().isBlank()) {
                out.add(info.source());
                buffer.setLength(0);
            }
        }
        if (!buffer.toString().isBlank()) {
            fail("incomplete snippet at the end of the README or startup script: " + buffer);
        }
        return out;
    }

    /**
     * Evaluates the source snippet by snippet ({@link #snippets}) in the shell: none may throw or be
     * rejected, and a numeric value must be finite. Returns the number of snippets.
     */
    static int evalAll(JShell shell, String source) {
        int count = 0;
        for (String snippet : snippets(shell, source)) {
            for (SnippetEvent event : shell.eval(snippet)) {
                String where = "snippet: " + snippet.strip();
                assertNull(event.exception(), () -> where + " threw " + event.exception());
                if (event.snippet() != null && event.causeSnippet() == null) {
                    assertEquals(Snippet.Status.VALID, event.status(), () -> where + " is " + event.status()
                            + ": " + shell.diagnostics(event.snippet()).map(d -> d.getMessage(null)).toList());
                    String value = event.value();
                    if (value != null && value.matches("-?[0-9.]+(E-?[0-9]+)?|NaN|-?Infinity")) {
                        assertTrue(Double.isFinite(Double.parseDouble(value)), where + " gave " + value);
                    }
                }
            }
            count++;
        }
        return count;
    }

    @Test
    void readmeSessionRunsAfterTheStartupScript() throws IOException {
        String readme = Files.readString(ROOT.resolve("README.md"));
        List<String> blocks = jshellBlocks(readme);
        assertFalse(blocks.isEmpty(), "no ```jshell block in the JShell section");
        String startup = Files.readString(ROOT.resolve("jshell/densa.jsh"));
        assertTrue(readme.contains("--startup jshell/densa.jsh"), "README must show the startup script");
        assertTrue(readme.contains("examples/target/densa-all.jar"), "README must show the class path");
        try (JShell shell = JShell.builder().executionEngine("local").build()) {
            for (String entry : System.getProperty("java.class.path").split(File.pathSeparator)) {
                shell.addToClasspath(entry);
            }
            // the README's paths are relative to the repository root; this JVM runs in examples/
            String session = String.join("\n", blocks).replace("Path.of(\"data\"", "Path.of(\""
                    + ROOT.resolve("data").toString().replace("\\", "/") + "\"");
            int count = evalAll(shell, startup + "\n" + session);
            assertTrue(count >= 5 + 3, "expected the imports and at least five session lines, ran " + count);
        }
    }
}
