package io.densa.examples;

import java.io.PrintStream;
import java.util.Locale;

/** Progress lines with the elapsed time, e.g. {@code [  3.4 s] study1: fitting the baseline}. */
final class Progress {
    private final String name;
    private final PrintStream out;
    private final long start = System.nanoTime();
    private final java.util.List<String> lines = new java.util.ArrayList<>();

    Progress(String name, PrintStream out) {
        this.name = name;
        this.out = out;
    }

    void line(String message) {
        String text = String.format(Locale.ROOT, "[%6.1f s] %s: %s", seconds(), name, message);
        lines.add(text);
        out.println(text);
        out.flush();
    }

    /** The lines printed so far. */
    java.util.List<String> lines() {
        return java.util.List.copyOf(lines);
    }

    double seconds() {
        return (System.nanoTime() - start) / 1e9;
    }
}
