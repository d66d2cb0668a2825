package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.regression.Fpca;
import io.densa.regression.FunctionOnFunctionFit;
import io.densa.regression.FunctionalRegression;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
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
 * Regression module speed: simplicial FPCA of n densities with K = 32 (one blocked K × K
 * cross-product pass plus a 32 × 32 eigenproblem; target &lt; 1 s at n = 1,000,000, compare with
 * {@link MemoryBandwidthBenchmark}: the pass reads 8·n·K bytes), and a function-on-function fit
 * with n = 100,000, K = 32 for predictor and response, 5-fold CV over 1..20 components (one
 * per-fold moment pass, then small solves; target &lt; 10 s). Quick mode uses small sizes.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 2, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(1)
public class RegressionBenchmark {
    @Param({"1000000"})
    public int fpcaRows;

    @Param({"100000"})
    public int fofRows;

    private DensitySet fpcaData;
    private DensitySet predictor;
    private DensitySet response;
    private FunctionalRegression config;

    private static DensitySet simulate(BayesSpace space, int n, long seed) {
        int k = space.dimension();
        double[] c = new double[n * k];
        SplittableRandom r = new SplittableRandom(seed);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < k; j++) {
                c[i * k + j] = r.nextGaussian() / (1 + j);
            }
        }
        return DensitySet.ofRowMajor(space, c, n, null);
    }

    @Setup
    public void setup() {
        BayesSpace space = BayesSpace.cubicSplines(0, 1, 29); // K = 32
        int k = space.dimension();
        fpcaData = simulate(space, BenchConfig.size(fpcaRows, 2_000), 1);
        int n = BenchConfig.size(fofRows, 2_000);
        predictor = simulate(space, n, 2);
        double[] x = predictor.coordinatesRowMajor();
        double[] y = new double[n * k];
        SplittableRandom r = new SplittableRandom(3);
        for (int i = 0; i < n; i++) {
            for (int m = 0; m < k; m++) {
                double s = 0.1 * r.nextGaussian();
                for (int l = 0; l < 5; l++) {
                    s += x[i * k + l] * Math.cos(l + m) / (1 + l);
                }
                y[i * k + m] = s;
            }
        }
        response = DensitySet.ofRowMajor(space, y, n, null);
        config = FunctionalRegression.truncation().withComponents(1, 20).withFolds(5).withSeed(1);
    }

    /** FPCA: mean, covariance pass, eigenproblem; returns the leading eigenvalue. */
    @Benchmark
    public double fpca() {
        return Fpca.fit(fpcaData).eigenvalues()[0];
    }

    /** Scores of every density on 5 components (one n × K by K × 5 product). */
    @Benchmark
    public double fpcaScores() {
        Fpca f = Fpca.fit(fpcaData);
        return f.scores(fpcaData, 5).get(0, 0);
    }

    /** Function-on-function fit with 5-fold CV over 1..20 components; returns R². */
    @Benchmark
    public double functionOnFunctionCv() {
        FunctionOnFunctionFit fit = config.fit(List.of(predictor), null, response);
        return fit.rSquared();
    }

    /** Baseline: the ⊕-mean alone (one column-sum pass over the FPCA data). */
    @Benchmark
    public double baselineMean() {
        return fpcaData.mean().coordinate(0);
    }
}
