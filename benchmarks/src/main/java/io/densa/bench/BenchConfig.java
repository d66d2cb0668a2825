package io.densa.bench;

/**
 * Size switch shared by every benchmark: with the system property {@code densa.bench.quick=true}
 * (set by the quick smoke run in the test suite) each benchmark uses its small size so that the
 * whole set runs in seconds and cannot rot; otherwise it uses the size of its {@code @Param}.
 */
public final class BenchConfig {
    private BenchConfig() {
    }

    /** True in quick mode. */
    public static boolean quick() {
        return Boolean.getBoolean("densa.bench.quick");
    }

    /** The full size, or the quick size in quick mode. */
    public static int size(int full, int quickSize) {
        return quick() ? Math.min(full, quickSize) : full;
    }

    /** One line describing the machine, for result tables. */
    public static String machine() {
        return Runtime.getRuntime().availableProcessors() + " cpus, " + System.getProperty("os.arch") + ", Java "
                + System.getProperty("java.version");
    }
}
