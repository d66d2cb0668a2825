package io.densa.io.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import io.densa.core.BayesSpace;
import io.densa.core.DensitySet;
import io.densa.regression.Fpca;
import io.densa.spatial.Locations;
import io.densa.spatial.SpatialWeights;
import io.densa.spatial.kriging.Kriging;
import io.densa.spatial.kriging.KrigingOptions;
import io.densa.spatial.kriging.Neighbourhood;
import io.densa.spatial.variogram.VariogramModel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.time.Duration;
import java.util.Arrays;
import java.util.HexFormat;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;
import org.junit.jupiter.api.io.TempDir;

/**
 * Truncated, oversized, malformed and adversarial model files: each is refused with an
 * IllegalArgumentException naming the file and what was wrong, before anything large is
 * allocated. The timeout is only a guard against a hang, not a speed check.
 */
class HostileModelFileTest {
    private static final Duration GUARD = Duration.ofSeconds(60);
    private static final BayesSpace SPACE = BayesSpace.splines(0, 10, 4, 3);

    @TempDir
    Path dir;

    private static DensitySet data(int n) {
        return ModelFileRoundTripTest.profiles(SPACE, n, 31, "id");
    }

    private static Kriging kriging() {
        Locations loc = ModelFileRoundTripTest.stations(30, 32);
        return Kriging.ordinary(loc, data(30), VariogramModel.spherical(1, 50),
                KrigingOptions.withDefaults().withNeighbourhood(Neighbourhood.nearest(8)));
    }

    private Path file(byte[] bytes) throws Exception {
        Path p = dir.resolve("hostile" + System.nanoTime() + ".json");
        Files.write(p, bytes);
        return p;
    }

    private static byte[] ascii(String s) {
        return s.getBytes(StandardCharsets.UTF_8);
    }

    /** A well-formed envelope (correct length and checksum) around the given payload text. */
    static byte[] envelope(String type, String payload) throws Exception {
        return envelope(1, type, ascii(payload));
    }

    static byte[] envelope(int version, String type, byte[] payload) throws Exception {
        String sha = HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(payload));
        byte[] head = ascii("{\"format\":\"densa-model\",\"version\":" + version + ",\"type\":\"" + type
                + "\",\"payloadBytes\":" + payload.length + ",\"sha256\":\"" + sha + "\",\"payload\":");
        byte[] out = Arrays.copyOf(head, head.length + payload.length + 1);
        System.arraycopy(payload, 0, out, head.length, payload.length);
        out[out.length - 1] = '}';
        return out;
    }

    /** The payload bytes of a file written by ModelFile. */
    static byte[] payloadOf(byte[] file) {
        String text = new String(file, StandardCharsets.UTF_8);
        int start = text.indexOf("\"payload\":") + "\"payload\":".length();
        int end = text.stripTrailing().length() - 1;
        return Arrays.copyOfRange(file, start, end);
    }

    private IllegalArgumentException refused(Path p, Class<?> type, ModelLimits limits, String... fragments) {
        IllegalArgumentException[] holder = new IllegalArgumentException[1];
        assertTimeoutPreemptively(GUARD, () -> {
            holder[0] = assertThrows(IllegalArgumentException.class, () -> ModelFile.load(p, type, limits));
        });
        String m = holder[0].getMessage();
        assertTrue(m.startsWith(p.toString()), "message does not name the file: " + m);
        for (String f : fragments) {
            assertTrue(m.contains(f), "message '" + m + "' lacks '" + f + "'");
        }
        return holder[0];
    }

    private IllegalArgumentException refused(byte[] bytes, Class<?> type, String... fragments) throws Exception {
        return refused(file(bytes), type, ModelLimits.DEFAULTS, fragments);
    }

    @Test
    void truncatedFilesAtEveryTenthOfTheirLength() throws Exception {
        byte[] ok = ModelFile.toBytes(kriging());
        assertEquals(Kriging.class, ModelFile.load(file(ok), Kriging.class).getClass());
        for (int i = 0; i < 10; i++) {
            int len = (int) ((long) ok.length * i / 10);
            refused(Arrays.copyOf(ok, len), Kriging.class, i == 0 ? "empty" : "truncated");
        }
        refused(Arrays.copyOf(ok, ok.length - 2), Kriging.class, "truncated");
    }

    @Test
    void corruptedPayloadFailsTheChecksum() throws Exception {
        byte[] ok = ModelFile.toBytes(data(6));
        String text = new String(ok, StandardCharsets.UTF_8);
        int at = text.indexOf("\"f64le\":\"") + 20;
        byte[] bad = ok.clone();
        bad[at] = (byte) (bad[at] == 'A' ? 'B' : 'A');
        refused(bad, DensitySet.class, "field sha256", "checksum mismatch", "nothing was loaded");
        // a number edited in place (same length)
        int lo = text.indexOf("\"lower\":0.0");
        byte[] edited = ok.clone();
        edited[lo + "\"lower\":".length()] = '1';
        refused(edited, DensitySet.class, "checksum mismatch");
        // payload length altered
        refused(ascii(text.replaceFirst("\"payloadBytes\":(\\d+)", "\"payloadBytes\":12")), DensitySet.class,
                "field payloadBytes", "truncated or altered");
    }

    @Test
    void newerVersionIsRefusedWithTheVersionsNamed() throws Exception {
        byte[] ok = ModelFile.toBytes(data(4));
        byte[] newer = envelope(2, "density-set", payloadOf(ok));
        refused(newer, DensitySet.class, "field version", "format version 2", "newer Densa");
        refused(envelope(0, "density-set", payloadOf(ok)), DensitySet.class, "field version");
    }

    @Test
    void declaredTrillionByTrillionMatrixIsRefusedBeforeAllocation() throws Exception {
        String sp = new String(payloadOf(ModelFile.toBytes(SPACE)), StandardCharsets.UTF_8);
        String spaceJson = sp.substring(sp.indexOf("{\"lower\""), sp.length() - 1);
        String payload = "{\"densities\":{\"space\":" + spaceJson + ",\"rows\":1000000000000,\"coordinates\":{\"shape\":"
                + "[1000000000000,1000000000000],\"f64le\":\"AAAAAAAAAAA=\"},\"ids\":null}}";
        refused(envelope("density-set", payload), DensitySet.class, "densities.rows", "1000000000000");
        String fpca = "{\"fpca\":{\"space\":" + spaceJson + ",\"sampleSize\":10,\"mean\":{\"shape\":[6],\"f64le\":\"\"},"
                + "\"eigenvalues\":{\"shape\":[6],\"f64le\":\"\"},\"eigenvectors\":{\"shape\":[1000000000000,"
                + "1000000000000],\"f64le\":\"AAAAAAAAAAA=\"}}}";
        refused(envelope("fpca", fpca.replace("\"mean\":{\"shape\":[6],\"f64le\":\"\"}", "\"mean\":"
                + b64Array(6)).replace("\"eigenvalues\":{\"shape\":[6],\"f64le\":\"\"}", "\"eigenvalues\":"
                + b64Array(6))), Fpca.class, "fpca.eigenvectors.shape[0]", "1000000000000 elements",
                "ModelLimits.withMaxElements");
        // within each dimension's limit but not in product
        refused(envelope("fpca", fpca.replace("1000000000000,1000000000000", "40000,40000")
                .replace("\"mean\":{\"shape\":[6],\"f64le\":\"\"}", "\"mean\":" + b64Array(6))
                .replace("\"eigenvalues\":{\"shape\":[6],\"f64le\":\"\"}", "\"eigenvalues\":" + b64Array(6))),
                Fpca.class, "eigenvectors.shape", "1600000000 elements");
    }

    private static String b64Array(int n) {
        return "{\"shape\":[" + n + "],\"f64le\":\"" + java.util.Base64.getEncoder().encodeToString(new byte[8 * n])
                + "\"}";
    }

    @Test
    void declaredShapeLargerThanTheBytesPresent() throws Exception {
        byte[] ok = ModelFile.toBytes(data(5));
        String p = new String(payloadOf(ok), StandardCharsets.UTF_8);
        String lied = p.replace("\"rows\":5", "\"rows\":50000").replaceFirst("\"shape\":\\[5,6\\]",
                "\"shape\":[50000,6]");
        refused(envelope("density-set", lied), DensitySet.class, "densities.coordinates.f64le",
                "holds 240 bytes of base64 data, but the declared shape needs 2400000 bytes");
    }

    @Test
    void limitsTheCallerSets() throws Exception {
        Path p = file(ModelFile.toBytes(data(40)));
        refused(p, DensitySet.class, ModelLimits.DEFAULTS.withMaxFileBytes(1000), "at most 1000",
                "ModelLimits.withMaxFileBytes");
        refused(p, DensitySet.class, ModelLimits.DEFAULTS.withMaxElements(100), "ModelLimits.withMaxElements");
        refused(p, DensitySet.class, ModelLimits.DEFAULTS.withMaxNodes(64), "ModelLimits.withMaxNodes");
        String longId = "x".repeat(5000);
        DensitySet d = DensitySet.of(SPACE, data(1).coordinates(), new String[] {longId});
        refused(file(ModelFile.toBytes(d)), DensitySet.class, ModelLimits.DEFAULTS, "densities.ids[0]",
                "5000 characters", "ModelLimits.withMaxTextChars");
    }

    @Test
    void malformedDocuments() throws Exception {
        refused(new byte[0], DensitySet.class, "empty");
        refused(ascii("not json at all"), DensitySet.class, "malformed JSON", "line 1");
        refused(ascii("[1, 2, 3]"), DensitySet.class, "not a Densa model file");
        refused(ascii("{\"format\":\"something-else\",\"version\":1}"), DensitySet.class, "not a Densa model file");
        refused(ascii("{\"format\":\"densa-model\",\"version\":1,\"format\":\"densa-model\"}"), DensitySet.class,
                "malformed JSON", "format");
        refused(new byte[] {'{', '"', (byte) 0xC3, (byte) 0x28, '"', ':', '1', '}'}, DensitySet.class, "malformed");
        refused(ascii("{\"format\":\"densa-model\",\"version\":1,\"type\":\"bayes-space\",\"payloadBytes\":2,"
                + "\"sha256\":\"00\",\"payload\":{}} trailing"), BayesSpace.class, "malformed JSON", "'trailing'");
        String deep = "[".repeat(100_000) + "]".repeat(100_000);
        refused(envelope("bayes-space", deep), BayesSpace.class, "malformed JSON", "nesting depth");
        refused(envelope("bayes-space", "{\"space\":{\"lower\":1" + "0".repeat(500) + "}}"), BayesSpace.class,
                "malformed JSON");
        refused(envelope("bayes-space", "{\"space\":{\"lower\":\"zero\"}}"), BayesSpace.class, "space.lower",
                "expected a number");
        refused(envelope("bayes-space", "{\"space\":{}}"), BayesSpace.class, "space.lower", "is missing");
    }

    @Test
    void typesAreAClosedListAndMustMatch() throws Exception {
        Path k = file(ModelFile.toBytes(kriging()));
        refused(k, Fpca.class, ModelLimits.DEFAULTS, "field type", "holds a 'kriging'", "'fpca'");
        refused(envelope("java.lang.Runtime", "{}"), Object.class, "field type", "not a model type");
        refused(envelope("bundle", "{\"entries\":[{\"name\":\"a\",\"type\":\"bundle\",\"payload\":{\"entries\":[]}}]}"),
                ModelBundle.class, "entries[0].type", "except bundle");
        assertThrows(IllegalArgumentException.class, () -> ModelFile.toBytes("a string is not a model"));
    }

    @Test
    void pathsInAFileAreOnlyText() throws Exception {
        // ids that look like paths or devices load as text; nothing is opened
        DensitySet d = DensitySet.of(SPACE, data(3).coordinates(), new String[] {"/dev/zero", "../../etc/passwd",
            "file:///proc/self/environ"});
        DensitySet back = assertTimeoutPreemptively(GUARD, () -> ModelFile.load(file(ModelFile.toBytes(d)),
                DensitySet.class));
        assertEquals(d.ids(), back.ids());
        // unknown members (e.g. a reference to another file) are ignored, never followed
        String p = new String(payloadOf(ModelFile.toBytes(SPACE)), StandardCharsets.UTF_8);
        String withRef = "{\"include\":\"/dev/zero\",\"$ref\":\"other.json\"," + p.substring(1);
        assertEquals(SPACE, ModelFile.load(file(envelope("bayes-space", withRef)), BayesSpace.class));
    }

    @Test
    void inconsistentContentIsRefusedByTheLibraryChecks() throws Exception {
        String p = new String(payloadOf(ModelFile.toBytes(kriging())), StandardCharsets.UTF_8);
        // a negative error variance, refused by KrigingOptions
        byte[] ev = new byte[8 * 30];
        java.nio.ByteBuffer.wrap(ev).order(java.nio.ByteOrder.LITTLE_ENDIAN).putDouble(8, -1.0);
        String x = p.replace("\"errorVariances\":null", "\"errorVariances\":{\"shape\":[30],\"f64le\":\""
                + java.util.Base64.getEncoder().encodeToString(ev) + "\"}");
        refused(envelope("kriging", x), Kriging.class, "field payload.options: cannot be restored",
                "error variance at location 1");
        String w = new String(payloadOf(ModelFile.toBytes(SpatialWeights.fromNeighbours(new int[][] {{1}, {0}}))),
                StandardCharsets.UTF_8);
        byte[] cols = new byte[8];
        cols[0] = 5; // link 0 -> 5, outside 0..1
        cols[4] = 0;
        String bad = w.replaceFirst("\"columns\":\\{\"shape\":\\[2\\],\"i32le\":\"[^\"]*\"",
                "\"columns\":{\"shape\":[2],\"i32le\":\"" + java.util.Base64.getEncoder().encodeToString(cols) + "\"");
        refused(envelope("spatial-weights", bad), SpatialWeights.class, "cannot be restored", "neighbour 5");
        // NaN coordinates
        String d = new String(payloadOf(ModelFile.toBytes(data(2))), StandardCharsets.UTF_8);
        byte[] nan = new byte[8 * 12];
        java.nio.ByteBuffer.wrap(nan).order(java.nio.ByteOrder.LITTLE_ENDIAN).putDouble(Double.NaN);
        String withNan = d.replaceFirst("\"coordinates\":\\{\"shape\":\\[2,6\\],\"f64le\":\"[^\"]*\"",
                "\"coordinates\":{\"shape\":[2,6],\"f64le\":\"" + java.util.Base64.getEncoder().encodeToString(nan) + "\"");
        refused(envelope("density-set", withNan), DensitySet.class, "densities");
    }

    /**
     * Seeded mutations of valid payloads, re-signed so that they pass the checksum and reach the
     * decoders: every load either succeeds or is an IllegalArgumentException naming the file.
     */
    @Test
    void mutatedAndReSignedPayloadsOnlyEverGiveIllegalArgument() throws Exception {
        Object[] models = {kriging(), Fpca.fit(data(12)), data(5), SpatialWeights.fromNeighbours(new int[][] {{1, 2},
            {0}, {0}})};
        Random r = new Random(33);
        int refusedCount = 0;
        for (Object m : models) {
            byte[] ok = ModelFile.toBytes(m);
            String type = new String(ok, StandardCharsets.UTF_8).replaceAll("(?s).*?\"type\":\"([^\"]+)\".*", "$1");
            byte[] payload = payloadOf(ok);
            for (int it = 0; it < 150; it++) {
                byte[] mut = payload.clone();
                int kind = r.nextInt(3);
                int at = r.nextInt(mut.length);
                if (kind == 0) {
                    mut[at] = (byte) "0123456789-+.eE,:{}[]\"AZaz/ ".charAt(r.nextInt(29));
                } else if (kind == 1) {
                    int to = Math.min(mut.length, at + 1 + r.nextInt(20));
                    byte[] cut = new byte[mut.length - (to - at)];
                    System.arraycopy(mut, 0, cut, 0, at);
                    System.arraycopy(mut, to, cut, at, mut.length - to);
                    mut = cut;
                } else {
                    mut[at] = (byte) r.nextInt(256);
                }
                Path p = file(envelope(1, type, mut));
                try {
                    assertTimeoutPreemptively(GUARD, () -> ModelFile.load(p, Object.class));
                } catch (IllegalArgumentException e) {
                    refusedCount++;
                    assertTrue(e.getMessage().startsWith(p.toString()), e.getMessage());
                } catch (Throwable t) {
                    fail("mutation " + it + " of " + type + " threw " + t, t);
                }
            }
        }
        assertTrue(refusedCount > 300, "most mutations must be refused, got " + refusedCount);
    }

    @Test
    void unsavableModelsAreNamed() {
        BayesSpace custom = SPACE.withReference(io.densa.core.Reference.weight("w", x -> 1 + x));
        Executable e = () -> ModelFile.toBytes(custom);
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, e);
        assertTrue(ex.getMessage().contains("custom reference"), ex.getMessage());
    }
}
