package io.densa.spark;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/** The JVM options the module README tells users to pass are the ones the build's tests run with. */
class SparkReadmeTest {
    @Test
    void readmeOptionsAreThePomOptions() throws Exception {
        String readme = Files.readString(Path.of("README.md"));
        String pom = Files.readString(Path.of("pom.xml"));
        Matcher r = Pattern.compile("SPARK_JVM_OPTIONS=\"([^\"]+)\"").matcher(readme);
        Matcher p = Pattern.compile("<spark.jvm.options>([^<]+)</spark.jvm.options>").matcher(pom);
        assertTrue(r.find(), "README states SPARK_JVM_OPTIONS");
        assertTrue(p.find(), "pom defines spark.jvm.options");
        assertEquals(p.group(1).trim(), r.group(1).trim());
    }
}
