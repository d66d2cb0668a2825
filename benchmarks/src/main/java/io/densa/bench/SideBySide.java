package io.densa.bench;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.core.estimate.BatchEstimate;
import io.densa.core.estimate.EstimationDiagnostics;
import io.densa.core.estimate.PenalizedLikelihoodEstimator;
import io.densa.regression.Fpca;
import io.densa.regression.Scores;
import io.densa.spatial.Locations;
import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.EmpiricalVariogram;
import io.densa.spatial.variogram.VariogramModel;
import io.densa.spatial.variogram.VariogramOptions;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/**
 * Side-by-side runner: Densa's public API against the vectorised numpy/scipy peer on identical
 * synthetic data, in one invocation, with checksums compared and time ratios printed.
 *
 * <pre>
 * mvn -q -DskipTests package -pl benchmarks -am
 * java -Xmx6g -cp benchmarks/target/benchmarks.jar io.densa.bench.SideBySide \
 *      [grid=1000] [vario=20000] [fpca=1000000] [est=100000] [--peer DIR] [--python EXE] [--rounds 2] [--no-peer]
 *      [--no-warm-up]
 * </pre>
 *
 * Workloads and sizes follow the peer's README (its folder is given with {@code --peer}, default
 * {@code $DENSA_PEER} or {@code ../shared/peer}): {@code grid=SIDE} kriges SIDE² cell centres from
 * 2,000 stations (32 nearest, exponential semivariogram with nugget 0.1, partial sill 1,
 * practical range 0.3; prediction and variance); {@code vario=N} is the trace-variogram of all
 * pairs of N sites in 30 bins on [0, 0.5); {@code fpca=N} the FPCA of N × 32 coordinates (fit
 * alone, and fit with every score); {@code est=UNITS} the estimation of UNITS × 365 daily
 * histograms with 24 cubic-spline coordinates at λ = 5·10⁴ fixed, sandwich covariance included.
 * The data are regenerated here from the peer's recipe (SplitMix64 uniforms, only + − × ÷, floor
 * and sin), so both sides see the same numbers; the CHECK lines must agree (sums over 10⁶ values
 * to about 12 digits, since summation order differs; sin may differ by one ulp).
 *
 * <p>The peer's Python is {@code --python EXE}, else {@code /usr/bin/python3} when it has numpy and
 * scipy, else the first {@code python3} on the PATH when that has them.
 *
 * <p>When the peer's Python and numpy are present the runner alternates peer, Densa, peer, Densa
 * ({@code --rounds} times each) and prints, per workload, the best time of each side and the ratio
 * peer / Densa; otherwise it runs Densa alone and says so. Before the timed rounds every workload
 * runs once at a small size (compiled code in the first round); {@code --no-warm-up} skips that, for
 * a process that runs one workload only, as a service does (its first round includes compilation).
 * JMH in this module stays the record of Densa's own numbers; this runner is for the ratio
 * measured in one run on one machine.
 */
public final class SideBySide {
    private static final int STATIONS = 2000;
    private static final int K = 32;

    private SideBySide() {
    }

    /** One timed run of one side: seconds and named checksums. */
    record Run(double seconds, Map<String, Double> checks) {
    }

    public static void main(String[] args) throws Exception {
        Map<String, Integer> work = new LinkedHashMap<>();
        String peerDir = System.getenv().getOrDefault("DENSA_PEER", "../shared/peer");
        String python = null;
        int rounds = 2;
        boolean usePeer = true;
        boolean warm = true;
        for (int i = 0; i < args.length; i++) {
            String a = args[i];
            if (a.equals("--peer")) {
                peerDir = args[++i];
            } else if (a.equals("--python")) {
                python = args[++i];
            } else if (a.equals("--rounds")) {
                rounds = Integer.parseInt(args[++i]);
            } else if (a.equals("--no-peer")) {
                usePeer = false;
            } else if (a.equals("--no-warm-up")) {
                warm = false;
            } else if (a.contains("=")) {
                String[] kv = a.split("=", 2);
                if (!List.of("grid", "vario", "fpca", "est").contains(kv[0])) {
                    throw new IllegalArgumentException("unknown workload " + kv[0] + "; use grid, vario, fpca or est");
                }
                work.put(kv[0], (int) Double.parseDouble(kv[1]));
            } else {
                throw new IllegalArgumentException("unknown argument " + a + " (see the class documentation)");
            }
        }
        if (work.isEmpty()) {
            work.put("grid", 1000);
            work.put("vario", 20000);
            work.put("fpca", 1_000_000);
            work.put("est", 100_000);
        }
        Path peer = Path.of(peerDir);
        if (python == null) {
            // the system interpreter, else the first python3 on the PATH, whichever has numpy and scipy
            python = numpyPresent("/usr/bin/python3") || !numpyPresent("python3") ? "/usr/bin/python3" : "python3";
        }
        if (usePeer && !(Files.isRegularFile(peer.resolve("peer_run.py")) && numpyPresent(python))) {
            System.out.println("INFO peer not run: " + peer.resolve("peer_run.py") + " or numpy for " + python
                    + " is missing (install python3-numpy python3-scipy); Densa alone");
            usePeer = false;
        }
        System.out.println("INFO machine: " + machineLine() + "; java " + System.getProperty("java.version")
                + "; heap " + Runtime.getRuntime().maxMemory() / (1 << 20) + " MiB; kernels "
                + io.densa.core.internal.KernelPath.active().describe());
        if (warm) {
            warmUp();
        }
        for (Map.Entry<String, Integer> w : work.entrySet()) {
            String name = w.getKey();
            int size = w.getValue();
            List<Double> peerTimes = new ArrayList<>();
            List<Double> densaTimes = new ArrayList<>();
            Map<String, Double> peerChecks = Map.of();
            Map<String, Double> densaChecks = Map.of();
            Map<String, List<Double>> extra = new LinkedHashMap<>();
            for (int r = 0; r < rounds; r++) {
                if (usePeer) {
                    PeerRun p = runPeer(python, peer, name, size);
                    peerTimes.add(p.seconds().get(name));
                    p.seconds().forEach((k, v) -> {
                        if (!k.equals(name)) {
                            extra.computeIfAbsent("peer " + k, x -> new ArrayList<>()).add(v);
                        }
                    });
                    peerChecks = p.checks();
                }
                Map<String, Run> d = runDensa(name, size);
                densaTimes.add(d.get(name).seconds());
                d.forEach((k, v) -> {
                    if (!k.equals(name)) {
                        extra.computeIfAbsent("densa " + k, x -> new ArrayList<>()).add(v.seconds());
                    }
                });
                densaChecks = d.get(name).checks();
                System.out.printf(Locale.ROOT, "RESULT impl=densa workload=%s size=%d time_s=%.4f%n", name, size,
                        d.get(name).seconds());
            }
            System.out.println("CHECK densa " + name + " " + format(densaChecks));
            double densaBest = densaTimes.stream().mapToDouble(Double::doubleValue).min().orElse(Double.NaN);
            if (usePeer) {
                System.out.println("CHECK peer  " + name + " " + format(peerChecks));
                System.out.println("AGREE " + name + " " + agreement(peerChecks, densaChecks));
                double peerBest = peerTimes.stream().mapToDouble(Double::doubleValue).min().orElse(Double.NaN);
                System.out.printf(Locale.ROOT, "RATIO %s size=%d peer %.3f s, densa %.3f s, peer/densa %.2f%n", name,
                        size, peerBest, densaBest, peerBest / densaBest);
                if (extra.containsKey("peer fpca_eig") && extra.containsKey("densa fpca_fit")) {
                    double pe = extra.get("peer fpca_eig").stream().mapToDouble(Double::doubleValue).min().orElse(0);
                    double de = extra.get("densa fpca_fit").stream().mapToDouble(Double::doubleValue).min().orElse(0);
                    System.out.printf(Locale.ROOT, "RATIO fpca_fit size=%d peer %.3f s, densa %.3f s, peer/densa %.2f%n",
                            size, pe, de, pe / de);
                }
            } else {
                System.out.printf(Locale.ROOT, "BEST %s size=%d densa %.3f s%n", name, size, densaBest);
                extra.forEach((k, v) -> {
                    if (k.startsWith("densa ")) {
                        System.out.printf(Locale.ROOT, "BEST %s size=%d densa %.3f s%n", k.substring(6), size,
                                v.stream().mapToDouble(Double::doubleValue).min().orElse(Double.NaN));
                    }
                });
            }
        }
    }

    // ------------------------------------------------------------------ data (the peer's recipe)

    /** n SplitMix64 uniforms u_1..u_n of the seed (Steele, Lea & Flood 2014, Fast splittable PRNGs). */
    static double[] uniforms(long seed, int n) {
        double[] u = new double[n];
        for (int i = 0; i < n; i++) {
            long z = seed + (i + 1L) * 0x9E3779B97F4A7C15L;
            z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
            z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
            z ^= z >>> 31;
            u[i] = (z >>> 11) * 0x1.0p-53;
        }
        return u;
    }

    /** Sites (row-major n × 2) and coordinates (row-major n × k) of the peer's synthetic field. */
    static double[][] synth(long seed, int n, int k) {
        double[] s = uniforms(seed, 2 * n);
        double[] v = uniforms(seed + 1, n * k);
        double[] c = new double[n * k];
        for (int i = 0; i < n; i++) {
            double x = s[2 * i];
            double y = s[2 * i + 1];
            for (int j = 0; j < k; j++) {
                c[i * k + j] = Math.sin(2 * Math.PI * (x * (1 + j % 4) + y * (1 + j / 8))) / Math.sqrt(j + 1)
                        + 0.3 * (2 * v[i * k + j] - 1);
            }
        }
        return new double[][] {s, c};
    }

    /** The peer's daily histograms (est_peer.py's docstring): units × 365 counts. */
    static int[][] histograms(long seed, int n) {
        int bins = 365;
        double[] p = uniforms(seed, 5 * n);
        double[] v = uniforms(seed + 1, n * bins);
        int[][] counts = new int[n][bins];
        double[] w = new double[bins];
        for (int i = 0; i < n; i++) {
            double alpha = 2 * p[5 * i];
            double phi = 365 * p[5 * i + 1];
            double beta = p[5 * i + 2];
            double psi = 365 * p[5 * i + 3];
            double p4 = p[5 * i + 4];
            double events = 20 + Math.floor(1980 * (p4 * p4 * p4));
            double total = 0;
            for (int j = 0; j < bins; j++) {
                double x = j + 0.5;
                double d1 = Math.abs(x - phi);
                d1 = Math.min(d1, 365 - d1);
                double d2 = Math.abs(x - psi);
                d2 = Math.min(d2, 365 - d2);
                double t1 = d1 / 40;
                double t2 = d2 / 12;
                w[j] = 0.2 + alpha / (1 + t1 * t1) + beta / (1 + t2 * t2);
                total += w[j];
            }
            int sum = 0;
            for (int j = 0; j < bins; j++) {
                counts[i][j] = (int) Math.floor(events * w[j] / total + v[i * bins + j]);
                sum += counts[i][j];
            }
            if (sum == 0) {
                counts[i][(int) Math.floor(365 * v[i * bins])] = 1;
            }
        }
        return counts;
    }

    // ------------------------------------------------------------------ Densa's side

    /** Runs one workload through the public API; the entry named after the workload is the main time. */
    static Map<String, Run> runDensa(String name, int size) {
        switch (name) {
            case "grid":
                return Map.of(name, grid(size));
            case "vario":
                return Map.of(name, best(2, () -> vario(size)));
            case "fpca":
                return fpca(size);
            default:
                return Map.of(name, est(size));
        }
    }

    static Run best(int reps, java.util.function.Supplier<Run> f) {
        Run b = null;
        for (int r = 0; r < reps; r++) {
            Run x = f.get();
            if (b == null || x.seconds() < b.seconds()) {
                b = x;
            }
        }
        return b;
    }

    static DensitySet asDensities(BayesSpace space, double[] c, int n) {
        return DensitySet.ofRowMajor(space, c, n, null);
    }

    /** The grid workload's stations: locations and coordinates from the peer's recipe (seed 1). */
    static double[][] gridStations() {
        return synth(1, STATIONS, K);
    }

    /** The grid workload's kriging (ordinary, exponential + nugget, 32 nearest) of {@link #gridStations}. */
    static Kriging gridKriging(double[][] sc) {
        double[] x = new double[STATIONS];
        double[] y = new double[STATIONS];
        for (int i = 0; i < STATIONS; i++) {
            x[i] = sc[0][2 * i];
            y[i] = sc[0][2 * i + 1];
        }
        BayesSpace space = BayesSpace.splines(0, 1, 4, K - 3);
        return Kriging.ordinary(Locations.planar(x, y), asDensities(space, sc[1], STATIONS),
                VariogramModel.exponential(1, 0.3).withNugget(0.1),
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(32)));
    }

    static Run grid(int side) {
        double[][] sc = gridStations();
        long t0 = System.nanoTime();
        Kriging kr = gridKriging(sc);
        double[] sums = new double[2];
        double[] corners = new double[4];
        kr.predictGrid(Grid.over(0, 0, 1, 1, side, side), GridOptions.withDefaults(), t -> {
            double sp = 0;
            double sv = 0;
            for (int q = 0; q < t.size(); q++) {
                for (int j = 0; j < K; j++) {
                    sp += t.predictions().coordinate(q, j);
                }
                sv += t.variances()[q];
                if (t.columns()[q] == 0 && t.rows()[q] == 0) {
                    corners[0] = t.predictions().coordinate(q, 0);
                    corners[2] = t.variances()[q];
                }
                if (t.columns()[q] == side - 1 && t.rows()[q] == side - 1) {
                    corners[1] = t.predictions().coordinate(q, K - 1);
                    corners[3] = t.variances()[q];
                }
            }
            synchronized (sums) {
                sums[0] += sp;
                sums[1] += sv;
            }
        });
        double s = (System.nanoTime() - t0) * 1e-9;
        Map<String, Double> c = new LinkedHashMap<>();
        c.put("sum_pred", sums[0]);
        c.put("sum_var", sums[1]);
        c.put("pred00", corners[0]);
        c.put("pred_last_last", corners[1]);
        c.put("var0", corners[2]);
        c.put("var_last", corners[3]);
        return new Run(s, c);
    }

    static Run vario(int n) {
        double[][] sc = synth(3, n, K);
        double[] x = new double[n];
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = sc[0][2 * i];
            y[i] = sc[0][2 * i + 1];
        }
        Locations loc = Locations.planar(x, y);
        long t0 = System.nanoTime();
        // equal-width bins (the variogram's direct bin index; explicit edges take a binary search per pair)
        EmpiricalVariogram ev = EmpiricalVariogram.of(loc, sc[1], K,
                VariogramOptions.withDefaults().withBinWidth(0.5 / 30).withMaxLag(0.5).withMinimumPairs(1));
        double s = (System.nanoTime() - t0) * 1e-9;
        long[] cnt = ev.counts();
        double[] g = ev.semivariances();
        Map<String, Double> c = new LinkedHashMap<>();
        c.put("sum_N", (double) Arrays.stream(cnt).sum());
        c.put("sum_gamma", Arrays.stream(g).sum());
        c.put("gamma0", g[0]);
        c.put("gamma_last", g[g.length - 1]);
        c.put("N0", (double) cnt[0]);
        c.put("N_last", (double) cnt[cnt.length - 1]);
        return new Run(s, c);
    }

    static Map<String, Run> fpca(int n) {
        double[] c = synth(5, n, K)[1];
        BayesSpace space = BayesSpace.splines(0, 1, 4, K - 3);
        // a fresh set per timed run: a set caches its column means and largest |coordinate|, which
        // the peer's np.cov recomputes every time
        Run fitOnly = best(3, () -> {
            DensitySet d = asDensities(space, c, n);
            long t0 = System.nanoTime();
            Fpca f = Fpca.fit(d);
            return new Run((System.nanoTime() - t0) * 1e-9, Map.of("ev0", f.eigenvalues()[0]));
        });
        Run withScores = best(3, () -> {
            DensitySet d = asDensities(space, c, n);
            long t0 = System.nanoTime();
            Fpca f = Fpca.fit(d);
            Scores z = f.scores(d, K);
            double s = (System.nanoTime() - t0) * 1e-9;
            double[] ev = f.eigenvalues();
            Map<String, Double> m = new LinkedHashMap<>();
            m.put("sum_ev", Arrays.stream(ev).sum());
            m.put("ev0", ev[0]);
            m.put("ev1", ev[1]);
            m.put("ev2", ev[2]);
            m.put("|score00|+|score_last|", Math.abs(z.get(0, 0)) + Math.abs(z.get(n - 1, K - 1)));
            return new Run(s, m);
        });
        Map<String, Run> out = new LinkedHashMap<>();
        out.put("fpca", withScores);
        out.put("fpca_fit", fitOnly);
        return out;
    }

    static Run est(int units) {
        int[][] counts = histograms(7, units);
        double[] edges = new double[366];
        for (int j = 0; j <= 365; j++) {
            edges[j] = j;
        }
        String[] ids = new String[units];
        Arrays.setAll(ids, i -> "u" + i);
        PenalizedLikelihoodEstimator e = PenalizedLikelihoodEstimator.withDefaults(BayesSpace.splines(0, 365, 4, 21))
                .withSmoothing(5e4).withReferencePrior(0).withTolerance(1e-12)
                .withEmptyEnds(PenalizedLikelihoodEstimator.EmptyEnds.COUNTED); // the peer's model: every bin as recorded
        long t0 = System.nanoTime();
        BatchEstimate b = e.fitAll(edges, counts, ids);
        double s = (System.nanoTime() - t0) * 1e-9;
        double sumCoord = 0;
        double loglik = 0;
        double edf = 0;
        double estvar = 0;
        long events = 0;
        int notConverged = 0;
        double[] coords = b.densities().coordinatesRowMajor();
        for (double v : coords) {
            sumCoord += v;
        }
        for (int i = 0; i < units; i++) {
            EstimationDiagnostics dg = b.diagnostics().get(i);
            loglik += dg.logLikelihood();
            edf += dg.effectiveDegreesOfFreedom();
            estvar += dg.estimationVariance();
            notConverged += dg.converged() ? 0 : 1;
            for (int v : counts[i]) {
                events += v;
            }
        }
        int k = b.densities().dimension();
        Map<String, Double> m = new LinkedHashMap<>();
        m.put("events", (double) events);
        m.put("sum_coord", sumCoord);
        m.put("c0_0", coords[0]);
        m.put("c0_last", coords[k - 1]);
        m.put("not_converged", (double) notConverged);
        m.put("sum_loglik", loglik);
        m.put("sum_edf", edf);
        m.put("sum_estvar", estvar);
        return new Run(s, m);
    }

    /** Small runs of every workload so that the timed runs are compiled code. */
    static void warmUp() {
        grid(60);
        vario(800);
        fpca(5000);
        est(5000); // enough calls for the lanes code (eight units per call) to be compiled
    }

    // ------------------------------------------------------------------ the peer's side

    record PeerRun(Map<String, Double> seconds, Map<String, Double> checks) {
    }

    static boolean numpyPresent(String python) {
        try {
            Process p = new ProcessBuilder(python, "-c", "import numpy, scipy").redirectErrorStream(true).start();
            p.getInputStream().readAllBytes();
            return p.waitFor() == 0;
        } catch (IOException e) {
            return false;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return false;
        }
    }

    static PeerRun runPeer(String python, Path peer, String name, int size) throws IOException, InterruptedException {
        Process p = new ProcessBuilder(python, "-B", peer.resolve("peer_run.py").toString(), name, Integer.toString(size))
                .redirectErrorStream(true).start();
        Map<String, Double> secs = new LinkedHashMap<>();
        Map<String, Double> checks = new LinkedHashMap<>();
        try (BufferedReader r = new BufferedReader(new InputStreamReader(p.getInputStream(), StandardCharsets.UTF_8))) {
            String line;
            while ((line = r.readLine()) != null) {
                if (line.startsWith("RESULT ")) {
                    System.out.println(line);
                    Map<String, String> kv = pairs(line);
                    secs.put(kv.get("workload"), Double.parseDouble(kv.get("time_s")));
                } else if (line.startsWith("CHECK ")) {
                    pairs(line).forEach((k, v) -> {
                        try {
                            checks.put(k, Double.parseDouble(v));
                        } catch (NumberFormatException e) {
                            // a non-numeric field (none today) is not compared
                        }
                    });
                } else if (line.startsWith("Traceback") || line.contains("Error")) {
                    System.out.println("PEER " + line);
                }
            }
        }
        int rc = p.waitFor();
        if (rc != 0 || !secs.containsKey(name)) {
            throw new IllegalStateException("the peer exited with " + rc + " without a RESULT line for " + name);
        }
        return new PeerRun(secs, checks);
    }

    static Map<String, String> pairs(String line) {
        Map<String, String> m = new LinkedHashMap<>();
        for (String tok : line.split("\\s+")) {
            int e = tok.indexOf('=');
            if (e > 0) {
                m.put(tok.substring(0, e), tok.substring(e + 1));
            }
        }
        return m;
    }

    /** Per shared checksum: the number of agreeing significant digits, −log10 of the relative difference. */
    static String agreement(Map<String, Double> peer, Map<String, Double> densa) {
        StringBuilder sb = new StringBuilder();
        double worst = Double.POSITIVE_INFINITY;
        for (Map.Entry<String, Double> e : densa.entrySet()) {
            Double pv = peer.get(e.getKey());
            if (pv == null) {
                continue;
            }
            double rel = Math.abs(pv - e.getValue()) / Math.max(Math.abs(pv), Double.MIN_NORMAL);
            double digits = rel == 0 ? 16 : Math.min(16, -Math.log10(rel));
            worst = Math.min(worst, digits);
            sb.append(String.format(Locale.ROOT, "%s:%.1f ", e.getKey(), digits));
        }
        return sb.append(String.format(Locale.ROOT, "(fewest digits %.1f)", worst)).toString();
    }

    static String format(Map<String, Double> m) {
        StringBuilder sb = new StringBuilder();
        m.forEach((k, v) -> sb.append(k).append('=').append(String.format(Locale.ROOT, "%.12e", v)).append(' '));
        return sb.toString().trim();
    }

    static String machineLine() {
        try {
            for (String l : Files.readAllLines(Path.of("/proc/cpuinfo"))) {
                if (l.startsWith("model name")) {
                    return l.substring(l.indexOf(':') + 1).trim() + ", " + Runtime.getRuntime().availableProcessors()
                            + " cores";
                }
            }
        } catch (IOException | RuntimeException e) {
            // not Linux: fall through
        }
        return System.getProperty("os.arch") + ", " + Runtime.getRuntime().availableProcessors() + " cores";
    }
}
