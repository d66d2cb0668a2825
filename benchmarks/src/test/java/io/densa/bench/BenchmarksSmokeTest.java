package io.densa.bench;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Collection;
import org.junit.jupiter.api.Test;
import org.openjdk.jmh.results.RunResult;
import org.openjdk.jmh.runner.Runner;
import org.openjdk.jmh.runner.options.Options;
import org.openjdk.jmh.runner.options.OptionsBuilder;
import org.openjdk.jmh.runner.options.TimeValue;

/**
 * Quick mode: runs every JMH benchmark of this module once, in-process, at its small size, so
 * that benchmarks compile, run and return finite scores in every CI run. Not a measurement.
 */
class BenchmarksSmokeTest {
    @Test
    void everyBenchmarkRunsInQuickMode() throws Exception {
        System.setProperty("densa.bench.quick", "true");
        Options opt = new OptionsBuilder()
                .include("io\\.densa\\.bench\\..*")
                .forks(0)
                .warmupIterations(0)
                .measurementIterations(1)
                .measurementTime(TimeValue.milliseconds(50))
                .shouldFailOnError(true)
                .build();
        Collection<RunResult> results = new Runner(opt).run();
        assertFalse(results.isEmpty(), "no benchmark ran");
        for (RunResult r : results) {
            double score = r.getPrimaryResult().getScore();
            assertTrue(Double.isFinite(score) && score >= 0,
                    r.getParams().getBenchmark() + " gave score " + score);
        }
    }
}
