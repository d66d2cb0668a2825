package io.densa.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.DensitySet;
import io.densa.regression.surveillance.AnomalyScoring;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The backend path across two JVMs: the baseline is fitted and saved here, a second {@code java}
 * process loads it and scores the new season from the CSV count table and from the raw events
 * binned by the embedded SQL engine; both score files must equal, character for character (every
 * number written with its IEEE 754 bits), the scores of the fitted (never saved) models in this JVM.
 */
class BackendExampleTest {
    @TempDir
    Path dir;

    @Test
    void scoresInAFreshProcessEqualTheInProcessScoresBitForBit() throws Exception {
        BackendExample.Baseline b = BackendExample.fit(11, 60);
        BackendExample.save(b, dir);
        double[][] counts = new double[b.ids().length][];
        for (int i = 0; i < counts.length; i++) {
            counts[i] = new double[b.newCounts()[i].length];
            for (int a = 0; a < counts[i].length; a++) {
                counts[i][a] = b.newCounts()[i][a];
            }
        }
        AnomalyScoring.Report inProcess = BackendExample.score(b.models(), b.ids(), counts);
        String expected = BackendExample.describe(inProcess);
        assertEquals(b.ids().length, inProcess.units().size());
        assertTrue(inProcess.flaggedCount() > 0, "the scenario's shifted districts should give flags:\n" + expected);

        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        Process p = new ProcessBuilder(java, "-Djava.io.tmpdir=" + System.getProperty("java.io.tmpdir"), "-cp",
                System.getProperty("java.class.path"), BackendExample.class.getName(), "score", dir.toString())
                .redirectErrorStream(true).start();
        boolean done = p.waitFor(5, TimeUnit.MINUTES);
        String output = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        if (!done) {
            p.destroyForcibly();
        }
        assertTrue(done, "the scoring process did not finish: " + output);
        assertEquals(0, p.exitValue(), output);
        assertTrue(output.contains("through the SQL engine"), output);
        assertEquals(expected, Files.readString(dir.resolve("scores-csv.csv")));
        assertEquals(expected, Files.readString(dir.resolve("scores-sql.csv")));

        // the previous season's densities came back with their ids
        DensitySet previous = b.models().get("previous", DensitySet.class);
        assertEquals(List.of(b.ids()), previous.ids());
        assertTrue(b.models().entries().keySet().containsAll(List.of("estimator", "fit", "calibration")));
    }
}
