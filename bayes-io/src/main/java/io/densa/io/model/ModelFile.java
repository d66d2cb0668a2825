package io.densa.io.model;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.Arrays;
import java.util.HexFormat;
import java.util.Objects;

/**
 * Saves and loads fitted models in Densa's model format: one JSON document with a format name, a
 * format version, the model type, and the payload with its length in bytes and SHA-256 checksum;
 * arrays are base64 strings of little-endian IEEE 754 doubles (or 32-bit integers). The format is
 * specified in {@code docs/model-format.md}. A loaded model predicts and scores exactly as the
 * saved one, bit for bit.
 *
 * <p>Types: {@code BayesSpace}, {@code DensitySet} (with ids), {@code PenalizedLikelihoodEstimator}
 * and {@code SmoothingSplineEstimator} (their settings; the progress listener is not saved),
 * {@code Design}, {@code Fpca}, {@code FunctionOnScalarFit}, {@code FunctionOnFunctionFit},
 * {@code ScalarOnFunctionFit}, {@code AnomalyScoring} and {@code AnomalyScoring.Calibrated},
 * {@code Locations}, {@code VariogramModel}, {@code VariogramFit}, {@code Kriging} (with its
 * options and neighbourhood), {@code SpatialWeights}, and a {@link ModelBundle} of these. A
 * space with a custom reference weight (a Java function) cannot be saved.
 *
 * <p>Loading a file it did not write is safe: no Java object deserialization and no class named
 * by the file is ever used (the type is one of the fixed names above); the file's size, the
 * nesting depth, text lengths, the number of JSON values and every declared array shape are
 * checked against {@link ModelLimits} before anything is allocated for them (and each shape
 * against the bytes actually present); nothing in a file makes the reader open another file. A
 * truncated, malformed, altered (checksum mismatch) or newer-version file, or one over a limit,
 * is an {@link IllegalArgumentException} naming the file and the field, and nothing is loaded.
 *
 * <p>Stateless and thread-safe.
 */
public final class ModelFile {
    /** The format name every model file carries in its member {@code format}. */
    public static final String FORMAT = "densa-model";
    /** The format version this Densa writes and the newest it reads. */
    public static final int VERSION = 1;

    private ModelFile() {
    }

    /**
     * Saves a model to a file (replaced if it exists; written to a temporary file in the same
     * folder first and then moved into place, so a reader never sees half a file).
     *
     * @throws IllegalArgumentException if the model is of a type that cannot be saved
     * @throws IOException              if the file cannot be written
     */
    public static void save(Path file, Object model) throws IOException {
        Objects.requireNonNull(file, "file");
        byte[] bytes = toBytes(model);
        Path abs = file.toAbsolutePath();
        Path dir = abs.getParent();
        Path tmp = Files.createTempFile(dir, abs.getFileName().toString(), ".part");
        try {
            Files.write(tmp, bytes);
            try {
                Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING);
            }
        } finally {
            Files.deleteIfExists(tmp);
        }
    }

    /**
     * The bytes of a model file holding the model (for storing it elsewhere, e.g. in a database).
     *
     * @throws IllegalArgumentException if the model is of a type that cannot be saved
     */
    public static byte[] toBytes(Object model) {
        String type = Codecs.typeOf(model);
        byte[] payload;
        try (Out o = new Out()) {
            Codecs.write(o, type, model);
            payload = o.toBytes();
        }
        String head = "{\"format\":\"" + FORMAT + "\",\"version\":" + VERSION + ",\"type\":\"" + type
                + "\",\"payloadBytes\":" + payload.length + ",\"sha256\":\"" + HexFormat.of().formatHex(sha256(payload))
                + "\",\"payload\":";
        byte[] h = head.getBytes(StandardCharsets.US_ASCII);
        byte[] out = Arrays.copyOf(h, h.length + payload.length + 2);
        System.arraycopy(payload, 0, out, h.length, payload.length);
        out[out.length - 2] = '}';
        out[out.length - 1] = '\n';
        return out;
    }

    /**
     * Loads a model of the given type with the default limits.
     *
     * @param type the class of the model ({@code Object.class} accepts any stored type)
     * @throws IllegalArgumentException if the file is not a valid model file of that type (see the
     *                                  class documentation), naming the file and the field
     * @throws IOException              if the file cannot be read
     */
    public static <T> T load(Path file, Class<T> type) throws IOException {
        return load(file, type, ModelLimits.DEFAULTS);
    }

    /**
     * Loads a model of the given type within the given limits.
     *
     * @throws IllegalArgumentException as {@link #load(Path, Class)}, or when the file exceeds a limit
     * @throws IOException              if the file cannot be read
     */
    public static <T> T load(Path file, Class<T> type, ModelLimits limits) throws IOException {
        Objects.requireNonNull(file, "file");
        Objects.requireNonNull(limits, "limits");
        if (!Files.isRegularFile(file)) {
            throw new IllegalArgumentException(file + ": not a regular file; a Densa model file was expected");
        }
        long size = Files.size(file);
        if (size > limits.maxFileBytes()) {
            throw new IllegalArgumentException(file + ": the file has " + size + " bytes; at most "
                    + limits.maxFileBytes() + " are accepted (ModelLimits.withMaxFileBytes)");
        }
        return fromBytes(Files.readAllBytes(file), type, limits, file.toString());
    }

    /**
     * Loads a model from the bytes of a model file.
     *
     * @param source name of the bytes' origin, used in messages
     * @throws IllegalArgumentException as {@link #load(Path, Class, ModelLimits)}
     */
    public static <T> T fromBytes(byte[] bytes, Class<T> type, ModelLimits limits, String source) {
        Objects.requireNonNull(bytes, "bytes");
        Objects.requireNonNull(type, "type");
        Objects.requireNonNull(limits, "limits");
        Objects.requireNonNull(source, "source");
        String wanted = type == Object.class ? null : Codecs.typeOf(type);
        if (bytes.length > limits.maxFileBytes()) {
            throw new IllegalArgumentException(source + ": " + bytes.length + " bytes; at most " + limits.maxFileBytes()
                    + " are accepted (ModelLimits.withMaxFileBytes)");
        }
        Node.Context ctx = new Node.Context(source, limits);
        Node root = Node.parse(bytes, ctx);
        if (root.kind != Node.Kind.OBJECT) {
            throw new IllegalArgumentException(source + ": not a Densa model file: the document is not a JSON object");
        }
        Node format = root.optional("format");
        if (format == null || format.kind != Node.Kind.STRING || !FORMAT.equals(format.text)) {
            throw new IllegalArgumentException(source + ": not a Densa model file: member 'format' must be \"" + FORMAT
                    + "\"");
        }
        Node vn = root.get("version");
        long version = vn.longValue();
        if (version > VERSION) {
            throw vn.error("the file is in format version " + version + ", newer than version " + VERSION
                    + ", the newest this Densa reads; load it with a newer Densa");
        }
        if (version < 1) {
            throw vn.error("is " + version + "; format versions start at 1");
        }
        String stored = root.get("type").text();
        if (!Codecs.TYPES.containsKey(stored)) {
            throw root.get("type").error("'" + stored + "' is not a model type of format version " + VERSION
                    + "; accepted are " + Codecs.TYPES.keySet());
        }
        Node pb = root.get("payloadBytes");
        long declared = pb.longValue();
        String sha = root.get("sha256").text();
        root.get("payload");
        if (!"payload".equals(ctx.lastRootMember)) {
            throw new IllegalArgumentException(source + ": member 'payload' must be the last member of the document");
        }
        long actual = ctx.payloadEnd - ctx.payloadStart;
        if (ctx.payloadStart < 0 || actual != declared) {
            throw pb.error("declares " + declared + " payload bytes but the payload has " + actual
                    + " (the file is truncated or altered)");
        }
        byte[] digest;
        try {
            MessageDigest md = MessageDigest.getInstance("SHA-256");
            md.update(bytes, (int) ctx.payloadStart, (int) actual);
            digest = md.digest();
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is not available", e);
        }
        String got = HexFormat.of().formatHex(digest);
        if (!got.equalsIgnoreCase(sha)) {
            throw root.get("sha256").error("checksum mismatch: the payload's SHA-256 is " + got + " but the file"
                    + " declares " + sha + "; the file is corrupted or was altered, and nothing was loaded");
        }
        if (wanted != null && !wanted.equals(stored)) {
            throw root.get("type").error("the file holds a '" + stored + "', not the requested '" + wanted + "' ("
                    + type.getSimpleName() + ")");
        }
        Object model;
        try {
            model = Codecs.read(root.get("payload"), stored);
        } catch (IllegalArgumentException e) {
            throw e;
        } catch (RuntimeException e) {
            throw new IllegalArgumentException(source + ": the payload of type '" + stored + "' is malformed ("
                    + e.getClass().getSimpleName() + ": " + e.getMessage() + ")", e);
        }
        return type.cast(model);
    }

    private static byte[] sha256(byte[] b) {
        try {
            return MessageDigest.getInstance("SHA-256").digest(b);
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is not available", e);
        }
    }
}
