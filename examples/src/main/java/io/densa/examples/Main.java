package io.densa.examples;

import java.io.IOException;
import java.io.PrintStream;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

/**
 * Command-line entry point of the examples.
 *
 * <pre>
 * java -jar examples/target/densa-all.jar [study1|study2] [--out DIR] [--seed N] [--size small|medium|full|N]
 * </pre>
 *
 * <p>study1 (the default) is age-profile surveillance in an invented region; study2 concentration
 * distributions from an invented monitor network. Each writes a report folder (summary.md,
 * summary.html, CSV, GeoJSON, PNG) and prints progress lines.
 */
public final class Main {
    private Main() {
    }

    /**
     * Parsed command line.
     *
     * @param study  {@code study1} or {@code study2}
     * @param out    report folder
     * @param seed   seed of the scenario generator
     * @param size   size name ({@code small}, {@code medium}, {@code full}) or {@code custom}
     * @param units  number of districts (study 1) or monitors (study 2); 0 for the size's default
     */
    public record Options(String study, Path out, long seed, String size, int units) {
        /** The default seed. */
        public static final long DEFAULT_SEED = 20261201L;

        /** Parses the arguments; throws IllegalArgumentException with a usage hint on a bad one. */
        public static Options parse(String... args) {
            String study = "study1";
            Path out = null;
            long seed = DEFAULT_SEED;
            String size = "full";
            int units = 0;
            for (int i = 0; i < args.length; i++) {
                String a = args[i];
                switch (a) {
                    case "study1", "study2" -> study = a;
                    case "--out" -> out = Path.of(value(args, ++i, a));
                    case "--seed" -> {
                        String v = value(args, ++i, a);
                        try {
                            seed = Long.parseLong(v);
                        } catch (NumberFormatException e) {
                            throw new IllegalArgumentException("--seed needs an integer, got '" + v + "'");
                        }
                    }
                    case "--size" -> {
                        String v = value(args, ++i, a).toLowerCase(Locale.ROOT);
                        if (v.equals("small") || v.equals("medium") || v.equals("full")) {
                            size = v;
                        } else {
                            try {
                                units = Integer.parseInt(v);
                                size = "custom";
                            } catch (NumberFormatException e) {
                                throw new IllegalArgumentException(
                                        "--size accepts small, medium, full or a number of units, got '" + v + "'");
                            }
                            if (units < 12 || units > 5000) {
                                throw new IllegalArgumentException("--size N needs 12 <= N <= 5000, got " + units);
                            }
                        }
                    }
                    case "-h", "--help" -> throw new IllegalArgumentException("help");
                    default -> throw new IllegalArgumentException("unknown argument '" + a + "'");
                }
            }
            if (out == null) {
                out = Path.of("densa-report-" + study);
            }
            return new Options(study, out, seed, size, units);
        }

        private static String value(String[] args, int i, String option) {
            if (i >= args.length) {
                throw new IllegalArgumentException(option + " needs a value");
            }
            return args[i];
        }

        /** Units for this size: the given number, or the study's small / medium / full default. */
        public int unitsOr(int small, int medium, int full) {
            if (units > 0) {
                return units;
            }
            return switch (size) {
                case "small" -> small;
                case "medium" -> medium;
                default -> full;
            };
        }
    }

    static final String USAGE = """
            usage: java -jar densa-all.jar [study1|study2] [--out DIR] [--seed N] [--size small|medium|full|N]
              study1   age-profile surveillance in ~300 invented districts (default)
              study2   fine-particle concentration distributions from ~80 invented monitors
              --out    report folder (default densa-report-<study>)
              --seed   seed of the invented scenario (default 20261201)
              --size   small, medium, full (default) or a number of districts / monitors
            """;

    /**
     * Runs a study.
     *
     * @param args see the class description
     */
    public static void main(String[] args) {
        System.setProperty("java.awt.headless", "true");
        Options options;
        try {
            options = Options.parse(args);
        } catch (IllegalArgumentException e) {
            if (!e.getMessage().equals("help")) {
                System.err.println("densa examples: " + e.getMessage());
            }
            System.err.print(USAGE);
            System.exit(e.getMessage().equals("help") ? 0 : 2);
            return;
        }
        run(options, System.out);
    }

    /**
     * Runs the chosen study and returns what it measured (used by the tests).
     *
     * @param options parsed options
     * @param log     where progress lines go
     */
    public static StudyResult run(Options options, PrintStream log) {
        System.setProperty("java.awt.headless", "true");
        try {
            Files.createDirectories(options.out());
        } catch (IOException e) {
            throw new UncheckedIOException("cannot create the report folder " + options.out(), e);
        }
        Progress progress = new Progress(options.study(), log);
        StudyResult result = options.study().equals("study2") ? Study2.run(options, progress)
                : Study1.run(options, progress);
        progress.line("report written to " + options.out().toAbsolutePath().resolve("summary.html"));
        return result;
    }
}
