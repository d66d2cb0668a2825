package io.densa.examples;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.SplittableRandom;

/**
 * The small invented count table shipped as {@code data/district-ages.csv} for the README's JShell
 * session: 30 districts (codes D01–D30, no real places), event counts in 18 five-year age bands on
 * [0, 90), long format {@code district,age_band,count}. Each district's ages follow a normal
 * profile whose centre and spread drift with the district index, plus a flat background of 2 %;
 * 150–1,500 events per district. Seeded: {@code write(path)} rewrites the file exactly, and
 * {@code SampleDataTest} checks that the shipped file is this generator's output.
 *
 * <p>{@code java -cp examples/target/densa-all.jar io.densa.examples.SampleData data/district-ages.csv}
 */
public final class SampleData {
    static final long SEED = 20261202L;
    static final int DISTRICTS = 30;
    static final int BANDS = 18;

    private SampleData() {
    }

    /** The CSV text (LF line ends). */
    public static String districtAges() {
        SplittableRandom rng = new SplittableRandom(SEED);
        StringBuilder sb = new StringBuilder("district,age_band,count\n");
        for (int d = 0; d < DISTRICTS; d++) {
            double centre = 30 + 25 * d / (double) (DISTRICTS - 1) + 6 * (rng.nextDouble() - 0.5);
            double spread = 12 + 8 * rng.nextDouble();
            double[] p = new double[BANDS];
            double sum = 0;
            for (int b = 0; b < BANDS; b++) {
                double mid = 5 * b + 2.5;
                p[b] = 0.02 / BANDS + Math.exp(-0.5 * Math.pow((mid - centre) / spread, 2));
                sum += p[b];
            }
            int events = 150 + rng.nextInt(1351);
            int[] counts = new int[BANDS];
            for (int e = 0; e < events; e++) {
                double u = rng.nextDouble() * sum;
                int b = 0;
                while (b < BANDS - 1 && u >= p[b]) {
                    u -= p[b];
                    b++;
                }
                counts[b]++;
            }
            for (int b = 0; b < BANDS; b++) {
                sb.append(String.format(Locale.ROOT, "D%02d,%d,%d%n", d + 1, b, counts[b]).replace("\r", ""));
            }
        }
        return sb.toString();
    }

    /** Writes {@link #districtAges()} to the file. */
    public static void write(Path file) {
        try {
            Files.writeString(file, districtAges(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + file, e);
        }
    }

    public static void main(String[] args) {
        if (args.length != 1) {
            System.err.println("usage: SampleData FILE.csv");
            System.exit(2);
        }
        write(Path.of(args[0]));
    }
}
