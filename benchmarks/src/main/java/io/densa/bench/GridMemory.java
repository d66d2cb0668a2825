package io.densa.bench;

import io.densa.spatial.kriging.Grid;
import io.densa.spatial.kriging.GridOptions;
import io.densa.spatial.kriging.Kriging;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.util.Locale;

/**
 * The memory check of issue 14: grid kriging of side × side cells (default 1000) from the side-by-side
 * runner's 2,000 stations (K = 32, 32 nearest) with the variance and three derived maps per cell (the
 * mean of the predicted density, its median and P(X &gt; 0.5)), kept in four arrays of side² values;
 * prints the wall time and the peak heap use (sum of the heap pools' peaks). Run it in a heap of the
 * size to check:
 *
 * <pre>
 * java -Xmx1g -cp benchmarks/target/benchmarks.jar io.densa.bench.GridMemory [side]
 * </pre>
 */
public final class GridMemory {
    private GridMemory() {
    }

    public static void main(String[] args) {
        int side = args.length > 0 ? Integer.parseInt(args[0]) : 1000;
        Kriging kr = SideBySide.gridKriging(SideBySide.gridStations());
        int cells = side * side;
        double[] variance = new double[cells];
        double[] mean = new double[cells];
        double[] median = new double[cells];
        double[] tail = new double[cells];
        long t0 = System.nanoTime();
        kr.predictGrid(Grid.over(0, 0, 1, 1, side, side), GridOptions.withDefaults().withVariance(true)
                .withMeans(true).withQuantiles(0.5).withTailProbabilities(0.5), t -> {
                    for (int q = 0; q < t.size(); q++) {
                        int cell = t.rows()[q] * side + t.columns()[q];
                        variance[cell] = t.variances()[q];
                        mean[cell] = t.means()[q];
                        median[cell] = t.quantiles()[0][q];
                        tail[cell] = t.tailProbabilities()[0][q];
                    }
                });
        double seconds = (System.nanoTime() - t0) * 1e-9;
        long peak = 0;
        for (MemoryPoolMXBean p : ManagementFactory.getMemoryPoolMXBeans()) {
            if (p.getType() == MemoryType.HEAP) {
                peak += p.getPeakUsage().getUsed();
            }
        }
        double check = 0;
        for (int c = 0; c < cells; c++) {
            check += variance[c] + mean[c] + median[c] + tail[c];
        }
        System.out.printf(Locale.ROOT, "GRIDMEMORY cells=%d seconds=%.2f peak_heap_MiB=%.1f max_heap_MiB=%d"
                + " check=%.12e%n", cells, seconds, peak / 1048576.0, Runtime.getRuntime().maxMemory() >> 20, check);
    }
}
