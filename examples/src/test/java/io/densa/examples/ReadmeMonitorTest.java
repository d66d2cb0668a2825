package io.densa.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.regression.surveillance.Period;
import java.io.File;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import jdk.jshell.JShell;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Runs the README's monitor example (the {@code ```java} block of "Saving and loading models" that
 * builds a {@code RollingBaseline}) through the JDK's {@code jdk.jshell} API, on invented weekly age
 * counts from {@link #pastWeeks()} and {@link #thisWeek()}, with the file redirected to a temporary
 * folder; checks what it leaves behind, so that the documented example cannot rot.
 */
public class ReadmeMonitorTest {
    static final Path ROOT = Path.of("..").toAbsolutePath().normalize();
    static final String FILE = "Path.of(\"monitor.densa.json\")";
    static final BayesSpace AGES = BayesSpace.splines(0, 90, 4, 6);

    /** Invented weekly counts in 18 five-year age bins for 30 units, estimated with every default. */
    static List<Period> weeks(int count) {
        SplittableRandom rng = new SplittableRandom(29);
        double[] edges = new double[19];
        for (int j = 0; j <= 18; j++) {
            edges[j] = 5 * j;
        }
        String[] ids = new String[30];
        double[] centre = new double[30];
        for (int i = 0; i < 30; i++) {
            ids[i] = "D" + i;
            centre[i] = 30 + 20 * rng.nextDouble();
        }
        PenalizedLikelihoodEstimator est = PenalizedLikelihoodEstimator.withDefaults(AGES)
                .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED);
        List<Period> out = new ArrayList<>();
        for (int t = 0; t < count; t++) {
            int[][] counts = new int[30][18];
            long[][] longCounts = new long[30][18];
            for (int i = 0; i < 30; i++) {
                for (int e = 0; e < 150 + 10 * i; e++) {
                    double age = Math.min(89.9, Math.max(0, centre[i] + 18 * rng.nextGaussian()));
                    counts[i][(int) (age / 5)]++;
                    longCounts[i][(int) (age / 5)]++;
                }
            }
            BatchEstimate b = est.fitAll(edges, counts, ids);
            out.add(new Period(t, b.densities(), null, b.estimationVariances(), longCounts, edges));
        }
        return out;
    }

    private static List<Period> eleven;

    /** The eleven invented weeks, estimated once per class loader. */
    private static synchronized List<Period> eleven() {
        if (eleven == null) {
            eleven = weeks(11);
        }
        return eleven;
    }

    /** The weeks before the scored one. */
    public static List<Period> pastWeeks() {
        return eleven().subList(0, 10);
    }

    /** The week to score. */
    public static Period thisWeek() {
        return eleven().get(10);
    }

    static String monitorBlock(String markdown) {
        int section = markdown.indexOf("## Saving and loading models");
        assertTrue(section >= 0, "README has no section 'Saving and loading models'");
        int at = markdown.indexOf("RollingBaseline.withDefaults()", section);
        int open = markdown.lastIndexOf("```java\n", at);
        int close = markdown.indexOf("\n```", at);
        assertTrue(open > section && close > at, "no java block with the monitor in the section");
        return markdown.substring(open + 8, close + 1);
    }

    @Test
    void readmeMonitorExampleSavesScoresAndUpdates(@TempDir Path dir) throws Exception {
        String code = monitorBlock(Files.readString(ROOT.resolve("README.md")));
        assertTrue(code.contains(FILE), "the README example should use " + FILE);
        Path file = dir.resolve("monitor.densa.json");
        code = code.replace(FILE, "Path.of(\"" + file.toString().replace("\\", "\\\\") + "\")");
        String setup = "import io.densa.io.model.*;\nimport io.densa.regression.surveillance.*;\n"
                + "import java.nio.file.Path;\nimport java.util.List;\n"
                + "List<Period> pastWeeks = io.densa.examples.ReadmeMonitorTest.pastWeeks();\n"
                + "Period thisWeek = io.densa.examples.ReadmeMonitorTest.thisWeek();\n";
        try (JShell shell = JShell.builder().executionEngine("local").build()) {
            for (String entry : System.getProperty("java.class.path").split(File.pathSeparator)) {
                shell.addToClasspath(entry);
            }
            int count = ReadmeJShellTest.evalAll(shell, setup + code);
            assertTrue(count >= 11, "expected the setup and the example's statements, ran " + count);
            assertEquals("4", shell.eval("first.bands().size()").get(0).value());
            assertEquals("true", shell.eval("first.displaced().lower() <= first.displaced().value()"
                    + " && first.displaced().value() <= first.displaced().upper()").get(0).value());
            assertEquals("10", shell.eval("ModelFile.load(" + "Path.of(\"" + file.toString().replace("\\", "\\\\")
                    + "\"), BaselineMonitor.class).lastPeriod()").get(0).value());
        }
    }
}
