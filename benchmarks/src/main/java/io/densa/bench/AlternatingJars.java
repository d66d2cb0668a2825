package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.lang.reflect.Method;
import java.net.URL;
import java.net.URLClassLoader;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;

/**
 * Before/after timing of the estimator on a noisy host: two builds of the benchmarks jar are loaded
 * into one JVM, each in its own class loader, and the same workload is run on them in turn (A B, B A,
 * A B …), timed by the thread's CPU time. Both builds see the same machine state within a round, so
 * their per-round ratio holds when the host's speed drifts, which separate JMH runs on a shared
 * machine do not (their error bars there reach ±100 %). JMH remains the record of absolute numbers.
 *
 * <pre>
 * java [--add-modules jdk.incubator.vector] -cp NEW.jar io.densa.bench.AlternatingJars OLD.jar NEW.jar \
 *      UNITS fixed|chosen|fixed:chosen|intervals|intervals-parallel|grid ROUNDS
 * </pre>
 *
 * With {@code fixed:chosen} (the same jar twice) A runs λ fixed and B λ chosen: the cost of the
 * default λ choice relative to a fixed λ, measured the same way.
 *
 * The workload: the side-by-side histograms ({@link SideBySide}, seed 7; 365 daily bins, cubic
 * splines with 21 interior knots), fitted serially by {@link PenalizedLikelihoodEstimator} with
 * every default, at λ = 5·10⁴ ("fixed") or with λ chosen per unit ("chosen"). Prints each build's
 * minimum, first quartile and median CPU seconds, a checksum of the estimates (sum of coordinates,
 * log10 λ and estimation variances: equal checksums mean equal numbers to the digits shown) and the
 * per-round ratios A/B.
 *
 * <p>With {@code intervals} the workload is instead {@link UncertaintyBenchmark#intervals} on a UNITS ×
 * UNITS grid, its tiles computed serially (so that the thread's CPU time is the whole work); with
 * {@code intervals-parallel} in parallel, timed by the wall clock. With {@code grid} it is the
 * side-by-side grid kriging ({@link SideBySide#gridKriging}: 2,000 stations, K = 32, 32 nearest,
 * prediction + variance) on a UNITS × UNITS grid of the unit square, tiles computed serially; the
 * checksum is the sum of the predicted coordinates and variances. (Its workload class is new, so a
 * build older than it runs it from this jar against its own library classes.)
 */
public final class AlternatingJars {
    private AlternatingJars() {
    }

    /** The grid workload (loaded once per class loader; see the class documentation). */
    public static final class GridWorkload {
        private final io.densa.spatial.kriging.Kriging kriging;
        private final int side;

        public GridWorkload(int side) {
            this.side = side;
            this.kriging = SideBySide.gridKriging(SideBySide.gridStations());
        }

        /** {CPU seconds, checksum}. */
        public double[] run() {
            ThreadMXBean mx = ManagementFactory.getThreadMXBean();
            long t0 = mx.getCurrentThreadCpuTime();
            double[] sum = new double[1];
            kriging.predictGrid(io.densa.spatial.kriging.Grid.over(0, 0, 1, 1, side, side),
                    io.densa.spatial.kriging.GridOptions.withDefaults().withParallel(false), t -> {
                        for (int q = 0; q < t.size(); q++) {
                            for (int j = 0; j < t.predictions().dimension(); j++) {
                                sum[0] += t.predictions().coordinate(q, j);
                            }
                            sum[0] += t.variances()[q];
                        }
                    });
            return new double[] {(mx.getCurrentThreadCpuTime() - t0) / 1e9, sum[0]};
        }
    }

    /** One build's workload (loaded once per class loader). */
    public static final class Workload {
        private final int[][] counts;
        private final double[] edges;
        private final String[] ids;
        private final PenalizedLikelihoodEstimator estimator;
        private final UncertaintyBenchmark grid;

        public Workload(int units, String mode) {
            if (mode.startsWith("intervals")) {
                grid = new UncertaintyBenchmark();
                grid.gridSide = units;
                grid.stations = 1000;
                grid.neighbours = 16;
                grid.draws = 200;
                grid.serial = !mode.endsWith("parallel");
                grid.setup();
                counts = null;
                edges = null;
                ids = null;
                estimator = null;
                return;
            }
            grid = null;
            counts = SideBySide.histograms(7, units);
            edges = new double[366];
            for (int j = 0; j <= 365; j++) {
                edges[j] = j;
            }
            ids = new String[units];
            Arrays.setAll(ids, i -> "u" + i);
            PenalizedLikelihoodEstimator e = PenalizedLikelihoodEstimator
                    .withDefaults(BayesSpace.splines(0, 365, 4, 21)).withParallel(false);
            estimator = "fixed".equals(mode) ? e.withSmoothing(5e4) : e;
        }

        /** {CPU seconds, checksum}. */
        public double[] run() {
            ThreadMXBean mx = ManagementFactory.getThreadMXBean();
            long t0 = mx.getCurrentThreadCpuTime();
            if (grid != null) {
                long w0 = System.nanoTime();
                double sum = grid.intervals();
                return new double[] {(grid.serial ? mx.getCurrentThreadCpuTime() - t0 : System.nanoTime() - w0) / 1e9,
                    sum};
            }
            BatchEstimate b = estimator.fitAll(edges, counts, ids);
            long t1 = mx.getCurrentThreadCpuTime();
            double s = 0;
            for (double v : b.densities().coordinatesRowMajor()) {
                s += v;
            }
            for (EstimationDiagnostics d : b.diagnostics()) {
                s += Math.log10(d.smoothing()) + d.estimationVariance();
            }
            return new double[] {(t1 - t0) / 1e9, s};
        }
    }

    public static void main(String[] args) throws Exception {
        String[] modes = args.length == 5 && "fixed:chosen".equals(args[3]) ? new String[] {"fixed", "chosen"}
                : args.length == 5 ? new String[] {args[3], args[3]} : null;
        if (modes == null || !("fixed".equals(modes[0]) || "chosen".equals(modes[0])
                || "intervals".equals(modes[0]) || "intervals-parallel".equals(modes[0]) || "grid".equals(modes[0]))) {
            System.err.println("usage: AlternatingJars OLD.jar NEW.jar UNITS fixed|chosen|fixed:chosen|intervals"
                    + "|intervals-parallel|grid ROUNDS");
            System.exit(2);
        }
        int units = Integer.parseInt(args[2]);
        int rounds = Integer.parseInt(args[4]);
        URL self = AlternatingJars.class.getProtectionDomain().getCodeSource().getLocation();
        Object[] work = new Object[2];
        Method[] run = new Method[2];
        for (int i = 0; i < 2; i++) {
            // the build's own classes first; this class's workload from the running jar when the build lacks it
            URLClassLoader cl = new URLClassLoader(new URL[] {Path.of(args[i]).toUri().toURL(), self},
                    ClassLoader.getPlatformClassLoader());
            if ("grid".equals(modes[i])) {
                Class<?> c = cl.loadClass(GridWorkload.class.getName());
                work[i] = c.getConstructor(int.class).newInstance(units);
                run[i] = c.getMethod("run");
                continue;
            }
            Class<?> c = cl.loadClass(Workload.class.getName());
            work[i] = c.getConstructor(int.class, String.class).newInstance(units, modes[i]);
            run[i] = c.getMethod("run");
        }
        double[][] t = new double[2][rounds];
        double[] check = new double[2];
        for (int r = 0; r < rounds; r++) {
            for (int o = 0; o < 2; o++) {
                int i = r % 2 == 0 ? o : 1 - o;
                double[] x = (double[]) run[i].invoke(work[i]);
                t[i][r] = x[0];
                check[i] = x[1];
            }
        }
        for (int i = 0; i < 2; i++) {
            double[] s = t[i].clone();
            Arrays.sort(s);
            System.out.printf(Locale.ROOT, "%s %s (%s): CPU s min %.3f q1 %.3f median %.3f; checksum %.10f%n",
                    i == 0 ? "A" : "B", args[i], modes[i], s[0], s[rounds / 4], s[rounds / 2], check[i]);
        }
        double[] ratio = new double[rounds];
        for (int r = 0; r < rounds; r++) {
            ratio[r] = t[0][r] / t[1][r];
        }
        Arrays.sort(ratio);
        System.out.printf(Locale.ROOT, "A/B per round: min %.3f median %.3f max %.3f (%d rounds, %d units, %s)%n",
                ratio[0], ratio[rounds / 2], ratio[rounds - 1], rounds, units, args[3]);
    }
}
