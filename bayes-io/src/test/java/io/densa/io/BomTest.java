package io.densa.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/** The bill of materials stays in step with the build: every library module, the project's version. */
class BomTest {
    @Test
    void bomListsEveryLibraryModuleAtTheProjectVersion() throws Exception {
        Path root = Path.of("..").toAbsolutePath().normalize();
        String parent = Files.readString(root.resolve("pom.xml"));
        String bom = Files.readString(root.resolve("densa-bom/pom.xml"));
        Matcher v = Pattern.compile("<artifactId>densa-parent</artifactId>\\s*<version>([^<]+)</version>")
                .matcher(parent);
        assertTrue(v.find());
        String version = v.group(1);
        assertTrue(bom.contains("<artifactId>densa-bom</artifactId>\n  <version>" + version + "</version>"));
        for (String m : new String[] {"bayes-core", "bayes-regression", "bayes-spatial", "bayes-io"}) {
            assertTrue(Files.exists(root.resolve(m).resolve(".library-module")), m + " is a library module");
            assertTrue(bom.contains("<artifactId>" + m + "</artifactId><version>" + version + "</version>"),
                    "BOM lists " + m + " at " + version);
        }
        Matcher d = Pattern.compile("<duckdb.version>([^<]+)</duckdb.version>").matcher(parent);
        assertTrue(d.find());
        assertTrue(bom.contains("<artifactId>duckdb_jdbc</artifactId><version>" + d.group(1) + "</version>"));
        assertEquals(-1, bom.indexOf("<parent>"), "the BOM must not inherit the build's settings");
    }
}
