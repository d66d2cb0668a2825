package io.densa.bench;

import java.util.Random;
import java.util.concurrent.TimeUnit;
import java.util.stream.IntStream;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Baseline: the machine's memory bandwidth measured the way our batch kernels read memory — a
 * plain parallel sum over a double[] of the same size as a 1,000,000 × 32 coordinate matrix
 * (256 MB). Effective GB/s = 8·length / time.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class MemoryBandwidthBenchmark {
    @Param({"32000000"})
    public int length;

    private double[] data;

    @Setup
    public void setup() {
        int len = BenchConfig.size(length, 32_000);
        data = new double[len];
        Random r = new Random(1);
        for (int i = 0; i < len; i++) {
            data[i] = r.nextDouble();
        }
    }

    /** Parallel sum in two halves (2 cores), each a simple unit-stride loop. */
    @Benchmark
    public double arraySum() {
        int chunks = 64;
        int len = data.length;
        double[] partial = new double[chunks];
        IntStream.range(0, chunks).parallel().forEach(c -> {
            int lo = (int) ((long) len * c / chunks), hi = (int) ((long) len * (c + 1) / chunks);
            double s0 = 0, s1 = 0, s2 = 0, s3 = 0;
            int i = lo;
            for (; i + 3 < hi; i += 4) {
                s0 += data[i];
                s1 += data[i + 1];
                s2 += data[i + 2];
                s3 += data[i + 3];
            }
            for (; i < hi; i++) {
                s0 += data[i];
            }
            partial[c] = s0 + s1 + s2 + s3;
        });
        double s = 0;
        for (double p : partial) {
            s += p;
        }
        return s;
    }
}
