package io.densa.examples;

import java.io.PrintStream;
import java.util.Locale;

/** Progress lines with the elapsed time, e.g. {@code [  3.4 s] study1: fitting the baseline}. */
final class Progress {
    private final String name;
    private final PrintStream out;
    private final long start = System.nanoTime();

    Progress(String name, PrintStream out) {
        this.name = name;
        this.out = out;
    }

    void line(String message) {
        out.printf(Locale.ROOT, "[%6.1f s] %s: %s%n", seconds(), name, message);
        out.flush();
    }

    double seconds() {
        return (System.nanoTime() - start) / 1e9;
    }
}
