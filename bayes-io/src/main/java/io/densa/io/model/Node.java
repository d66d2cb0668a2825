package io.densa.io.model;

import com.fasterxml.jackson.core.Base64Variants;
import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.core.StreamReadConstraints;
import com.fasterxml.jackson.core.StreamReadFeature;
import java.io.IOException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;

/**
 * A parsed JSON value with its path in the file (for messages), built by Jackson's streaming
 * parser under {@link ModelLimits}; typed getters check what they read and name the path.
 * Package-private.
 */
final class Node {
    enum Kind { OBJECT, ARRAY, STRING, BINARY, NUMBER, INTEGER, BOOLEAN, NULL }

    final Kind kind;
    final String path;
    final String text;
    final Map<String, Node> members;
    final List<Node> items;
    /** The decoded bytes of an array's data member ({@code f64le}, {@code i32le}). */
    final byte[] bytes;
    private final Context ctx;

    private Node(Kind kind, String path, String text, Map<String, Node> members, List<Node> items, Context ctx) {
        this(kind, path, text, members, items, null, ctx);
    }

    private Node(Kind kind, String path, String text, Map<String, Node> members, List<Node> items, byte[] bytes,
            Context ctx) {
        this.kind = kind;
        this.path = path;
        this.text = text;
        this.members = members;
        this.items = items;
        this.bytes = bytes;
        this.ctx = ctx;
    }

    /** What every node of one file shares: its name for messages and its limits. */
    static final class Context {
        final String source;
        final ModelLimits limits;
        int nodes;
        long payloadStart = -1;
        long payloadEnd = -1;
        String lastRootMember;

        Context(String source, ModelLimits limits) {
            this.source = source;
            this.limits = limits;
        }

        IllegalArgumentException error(String path, String message) {
            return new IllegalArgumentException(source + ": field " + path + ": " + message);
        }
    }

    // ---------------------------------------------------------------- parsing

    /** Parses a whole document; records the byte range of the root member "payload". */
    static Node parse(byte[] bytes, Context ctx) {
        ModelLimits lim = ctx.limits;
        JsonFactory f = JsonFactory.builder()
                .streamReadConstraints(StreamReadConstraints.builder()
                        .maxNestingDepth(lim.maxDepth())
                        .maxStringLength((int) Math.min(Integer.MAX_VALUE - 16, lim.maxFileBytes()))
                        .maxNameLength(lim.maxTextChars())
                        .maxNumberLength(64)
                        .maxDocumentLength(lim.maxFileBytes())
                        .build())
                .enable(StreamReadFeature.STRICT_DUPLICATE_DETECTION)
                .build();
        try (JsonParser p = f.createParser(bytes)) {
            JsonToken t = p.nextToken();
            if (t == null) {
                throw new IllegalArgumentException(ctx.source + ": the file is empty; a Densa model file (JSON) was"
                        + " expected");
            }
            Node root = read(p, t, "$", 0, ctx);
            if (p.nextToken() != null) {
                throw new IllegalArgumentException(ctx.source + ": content follows the end of the JSON document at "
                        + where(p.currentTokenLocation()));
            }
            return root;
        } catch (JsonProcessingException e) {
            JsonLocation at = e.getLocation();
            String msg = e.getOriginalMessage();
            boolean eof = msg != null && msg.contains("end-of-input");
            throw new IllegalArgumentException(ctx.source + ": " + (eof ? "truncated" : "malformed") + " JSON"
                    + (at == null ? "" : " at " + where(at)) + ": " + firstLine(msg), e);
        } catch (IOException e) {
            throw new IllegalArgumentException(ctx.source + ": cannot be parsed: " + e.getMessage(), e);
        }
    }

    private static String where(JsonLocation at) {
        return "line " + at.getLineNr() + ", column " + at.getColumnNr() + " (byte " + at.getByteOffset() + ")";
    }

    private static String firstLine(String s) {
        if (s == null) {
            return "";
        }
        int nl = s.indexOf('\n');
        String line = nl < 0 ? s : s.substring(0, nl);
        return line.length() > 300 ? line.substring(0, 300) + "…" : line;
    }

    private static Node read(JsonParser p, JsonToken t, String path, int depth, Context ctx) throws IOException {
        if (++ctx.nodes > ctx.limits.maxNodes()) {
            throw ctx.error(path, "the file holds more than " + ctx.limits.maxNodes()
                    + " JSON values (ModelLimits.withMaxNodes)");
        }
        switch (t) {
            case START_OBJECT: {
                Map<String, Node> m = new LinkedHashMap<>();
                JsonToken n;
                while ((n = p.nextToken()) == JsonToken.FIELD_NAME) {
                    String name = p.currentName();
                    JsonToken v = p.nextToken();
                    boolean payload = depth == 0 && name.equals("payload");
                    if (payload) {
                        ctx.payloadStart = p.currentTokenLocation().getByteOffset();
                    }
                    m.put(name, read(p, v, path.equals("$") ? name : path + "." + name, depth + 1, ctx));
                    if (payload) {
                        ctx.payloadEnd = p.currentLocation().getByteOffset();
                    }
                    if (depth == 0) {
                        ctx.lastRootMember = name;
                    }
                }
                if (n != JsonToken.END_OBJECT) {
                    throw ctx.error(path, "unexpected token " + n);
                }
                return new Node(Kind.OBJECT, path, null, m, null, ctx);
            }
            case START_ARRAY: {
                List<Node> l = new ArrayList<>();
                JsonToken n;
                while ((n = p.nextToken()) != JsonToken.END_ARRAY) {
                    if (n == null) {
                        throw ctx.error(path, "truncated array");
                    }
                    l.add(read(p, n, path + "[" + l.size() + "]", depth + 1, ctx));
                }
                return new Node(Kind.ARRAY, path, null, null, l, ctx);
            }
            case VALUE_STRING: {
                String name = p.currentName();
                if ("f64le".equals(name) || "i32le".equals(name)) {
                    // array data: decoded straight from the input (standard base64 with padding, RFC 4648 §4);
                    // the bytes are at most 3/4 of the text the file already holds
                    return new Node(Kind.BINARY, path, null, null, null, p.getBinaryValue(Base64Variants.MIME_NO_LINEFEEDS),
                            ctx);
                }
                return new Node(Kind.STRING, path, p.getText(), null, null, ctx);
            }
            case VALUE_NUMBER_INT:
                return new Node(Kind.INTEGER, path, p.getText(), null, null, ctx);
            case VALUE_NUMBER_FLOAT:
                return new Node(Kind.NUMBER, path, p.getText(), null, null, ctx);
            case VALUE_TRUE:
            case VALUE_FALSE:
                return new Node(Kind.BOOLEAN, path, p.getText(), null, null, ctx);
            case VALUE_NULL:
                return new Node(Kind.NULL, path, null, null, null, ctx);
            default:
                throw ctx.error(path, "unexpected token " + t);
        }
    }

    // ---------------------------------------------------------------- typed access

    IllegalArgumentException error(String message) {
        return ctx.error(path, message);
    }

    Context context() {
        return ctx;
    }

    private void expect(Kind k, String what) {
        if (kind != k) {
            throw error("expected " + what + ", found " + describe());
        }
    }

    private String describe() {
        switch (kind) {
            case OBJECT: return "an object";
            case ARRAY: return "an array";
            case STRING: return "a string";
            case BINARY: return "base64 data";
            case NULL: return "null";
            case BOOLEAN: return "a boolean";
            default: return "a number";
        }
    }

    boolean isNull() {
        return kind == Kind.NULL;
    }

    /** A required member of this object. */
    Node get(String name) {
        expect(Kind.OBJECT, "an object");
        Node n = members.get(name);
        if (n == null) {
            throw ctx.error(path.equals("$") ? name : path + "." + name, "is missing");
        }
        return n;
    }

    /** A member that may be absent or null (returns null then). */
    Node optional(String name) {
        expect(Kind.OBJECT, "an object");
        Node n = members.get(name);
        return n == null || n.isNull() ? null : n;
    }

    List<Node> list() {
        expect(Kind.ARRAY, "an array");
        return items;
    }

    List<Node> list(int size) {
        List<Node> l = list();
        if (l.size() != size) {
            throw error("has " + l.size() + " entries; " + size + " are required");
        }
        return l;
    }

    String text() {
        expect(Kind.STRING, "a string");
        if (text.length() > ctx.limits.maxTextChars()) {
            throw error("a text of " + text.length() + " characters exceeds the limit of " + ctx.limits.maxTextChars()
                    + " (ModelLimits.withMaxTextChars)");
        }
        return text;
    }

    boolean bool() {
        expect(Kind.BOOLEAN, "true or false");
        return text.equals("true");
    }

    int integer(int min, int max) {
        long v = longValue();
        if (v < min || v > max) {
            throw error("is " + v + "; accepted are integers in [" + min + ", " + max + "]");
        }
        return (int) v;
    }

    long longValue() {
        String s;
        if (kind == Kind.INTEGER) {
            s = text;
        } else if (kind == Kind.STRING && text.length() <= 21) {
            s = text;
        } else {
            throw error("expected an integer, found " + describe());
        }
        try {
            return Long.parseLong(s);
        } catch (NumberFormatException e) {
            throw error("'" + s + "' is not a 64-bit integer");
        }
    }

    /** A double: a JSON number, or one of the strings "NaN", "Infinity", "-Infinity". */
    double real() {
        if (kind == Kind.NUMBER || kind == Kind.INTEGER) {
            return Double.parseDouble(text);
        }
        if (kind == Kind.STRING) {
            switch (text) {
                case "NaN": return Double.NaN;
                case "Infinity": return Double.POSITIVE_INFINITY;
                case "-Infinity": return Double.NEGATIVE_INFINITY;
                default: break;
            }
        }
        throw error("expected a number (or \"NaN\", \"Infinity\", \"-Infinity\"), found " + describe());
    }

    <E extends Enum<E>> E enumValue(Class<E> type) {
        String s = text();
        for (E e : type.getEnumConstants()) {
            if (e.name().equals(s)) {
                return e;
            }
        }
        List<String> names = new ArrayList<>();
        for (E e : type.getEnumConstants()) {
            names.add(e.name());
        }
        throw error("'" + s + "' is not one of " + names);
    }

    // ---------------------------------------------------------------- arrays

    /** Declared shape of a stored array, checked against the element limit (no allocation). */
    int[] shape() {
        List<Node> dims = get("shape").list();
        if (dims.isEmpty() || dims.size() > 2) {
            throw ctx.error(path + ".shape", "must list 1 or 2 dimensions, got " + dims.size());
        }
        long total = 1;
        int[] s = new int[dims.size()];
        for (int i = 0; i < s.length; i++) {
            Node d = dims.get(i);
            long v = d.longValue();
            if (v < 0) {
                throw d.error("is " + v + "; a dimension must be >= 0");
            }
            if (v > ctx.limits.maxElements()) {
                throw d.error("declares " + v + " elements along dimension " + i + "; at most "
                        + ctx.limits.maxElements() + " elements per array are accepted (ModelLimits.withMaxElements)");
            }
            s[i] = (int) v;
            total *= v; // both factors <= 2^31: no overflow
            if (total > ctx.limits.maxElements()) {
                throw ctx.error(path + ".shape", "declares " + total + (i + 1 < s.length ? " or more" : "")
                        + " elements; at most " + ctx.limits.maxElements()
                        + " per array are accepted (ModelLimits.withMaxElements)");
            }
        }
        return s;
    }

    private byte[] payload(String key, int count, int width) {
        Node data = get(key);
        data.expect(Kind.BINARY, "a base64 string");
        long need = (long) count * width;
        if (data.bytes.length != need) {
            throw data.error("holds " + data.bytes.length + " bytes of base64 data, but the declared shape needs "
                    + need + " bytes (the file is truncated or altered)");
        }
        return data.bytes;
    }

    /** A stored array of doubles: {"shape": [...], "f64le": base64}; checks the shape if given. */
    double[] doubles(int... expected) {
        int[] s = shape();
        checkShape(s, expected);
        int count = count(s);
        ByteBuffer b = ByteBuffer.wrap(payload("f64le", count, 8)).order(ByteOrder.LITTLE_ENDIAN);
        double[] out = new double[count];
        b.asDoubleBuffer().get(out);
        return out;
    }

    /** A stored array of 32-bit integers: {"shape": [...], "i32le": base64}. */
    int[] ints(int... expected) {
        int[] s = shape();
        checkShape(s, expected);
        int count = count(s);
        ByteBuffer b = ByteBuffer.wrap(payload("i32le", count, 4)).order(ByteOrder.LITTLE_ENDIAN);
        int[] out = new int[count];
        b.asIntBuffer().get(out);
        return out;
    }

    /** The declared shape of a stored array (checked against the limits). */
    int[] declaredShape() {
        return shape();
    }

    private static int count(int[] s) {
        int c = 1;
        for (int v : s) {
            c *= v;
        }
        return c;
    }

    private void checkShape(int[] s, int[] expected) {
        if (expected.length == 0) {
            return;
        }
        boolean ok = s.length == expected.length;
        for (int i = 0; ok && i < s.length; i++) {
            ok = expected[i] < 0 || s[i] == expected[i];
        }
        if (!ok) {
            throw ctx.error(path + ".shape", "is " + java.util.Arrays.toString(s) + "; "
                    + java.util.Arrays.toString(expected).replace("-1", "any") + " is required");
        }
    }
}
