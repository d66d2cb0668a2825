package io.densa.examples;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;

/** The shipped sample table is exactly the seeded generator's output (so it is invented data). */
class SampleDataTest {
    @Test
    void shippedFileIsTheGeneratorsOutput() throws IOException {
        Path file = ReadmeJShellTest.ROOT.resolve("data/district-ages.csv");
        assertEquals(SampleData.districtAges(), Files.readString(file, StandardCharsets.UTF_8),
                "regenerate with: java -cp examples/target/densa-all.jar io.densa.examples.SampleData "
                        + "data/district-ages.csv");
    }
}
