package io.densa.io.model;

import com.fasterxml.jackson.core.JsonEncoding;
import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonGenerator;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.Base64;

/**
 * Writes the JSON of a payload through Jackson's streaming generator: members in a fixed order,
 * no whitespace, doubles as JSON numbers (Java's shortest round-trip text) or the strings "NaN",
 * "Infinity", "-Infinity", 64-bit integers as decimal strings, arrays as base64 little-endian.
 * Package-private.
 */
final class Out implements AutoCloseable {
    private static final JsonFactory FACTORY = JsonFactory.builder().build();
    private final ByteArrayOutputStream bytes = new ByteArrayOutputStream();
    private final JsonGenerator g;

    Out() {
        try {
            g = FACTORY.createGenerator(bytes, JsonEncoding.UTF8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    byte[] toBytes() {
        try {
            g.flush();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return bytes.toByteArray();
    }

    @Override
    public void close() {
        try {
            g.close();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private interface IoAction {
        void run() throws IOException;
    }

    private Out io(IoAction a) {
        try {
            a.run();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return this;
    }

    Out begin() {
        return io(g::writeStartObject);
    }

    Out begin(String name) {
        return io(() -> g.writeObjectFieldStart(name));
    }

    Out end() {
        return io(g::writeEndObject);
    }

    Out beginList(String name) {
        return io(() -> g.writeArrayFieldStart(name));
    }

    Out endList() {
        return io(g::writeEndArray);
    }

    Out text(String name, String value) {
        return io(() -> {
            g.writeFieldName(name);
            if (value == null) {
                g.writeNull();
            } else {
                g.writeString(value);
            }
        });
    }

    Out textItem(String value) {
        return io(() -> g.writeString(value));
    }

    Out nul(String name) {
        return io(() -> g.writeNullField(name));
    }

    Out integer(String name, int value) {
        return io(() -> g.writeNumberField(name, value));
    }

    Out integerItem(int value) {
        return io(() -> g.writeNumber(value));
    }

    Out int64(String name, long value) {
        return io(() -> g.writeStringField(name, Long.toString(value)));
    }

    Out bool(String name, boolean value) {
        return io(() -> g.writeBooleanField(name, value));
    }

    Out real(String name, double value) {
        return io(() -> {
            g.writeFieldName(name);
            writeReal(value);
        });
    }

    private void writeReal(double v) throws IOException {
        if (Double.isNaN(v)) {
            g.writeString("NaN");
        } else if (Double.isInfinite(v)) {
            g.writeString(v > 0 ? "Infinity" : "-Infinity");
        } else {
            g.writeNumber(Double.toString(v));
        }
    }

    Out doubles(String name, double[] values, int... shape) {
        ByteBuffer b = ByteBuffer.allocate(values.length * 8).order(ByteOrder.LITTLE_ENDIAN);
        b.asDoubleBuffer().put(values);
        return array(name, shape.length == 0 ? new int[] {values.length} : shape, "f64le", b.array());
    }

    Out ints(String name, int[] values) {
        ByteBuffer b = ByteBuffer.allocate(values.length * 4).order(ByteOrder.LITTLE_ENDIAN);
        b.asIntBuffer().put(values);
        return array(name, new int[] {values.length}, "i32le", b.array());
    }

    private Out array(String name, int[] shape, String key, byte[] data) {
        return io(() -> {
            g.writeObjectFieldStart(name);
            g.writeArrayFieldStart("shape");
            for (int s : shape) {
                g.writeNumber(s);
            }
            g.writeEndArray();
            g.writeStringField(key, Base64.getEncoder().encodeToString(data));
            g.writeEndObject();
        });
    }

    /** Writes a member name; the next value written is its value. */
    Out field(String name) {
        return io(() -> g.writeFieldName(name));
    }

    /** Starts an unnamed object inside a list. */
    Out beginItem() {
        return io(g::writeStartObject);
    }
}
