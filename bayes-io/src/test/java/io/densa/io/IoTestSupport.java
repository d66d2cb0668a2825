package io.densa.io;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.function.Executable;

public final class IoTestSupport {
    private IoTestSupport() {
    }

    public static Path write(Path dir, String name, String text) {
        try {
            Path p = dir.resolve(name);
            Files.write(p, text.getBytes(StandardCharsets.UTF_8));
            return p;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Asserts an IllegalArgumentException whose message contains every fragment. */
    public static IllegalArgumentException rejects(Executable e, String... fragments) {
        IllegalArgumentException ex = assertThrows(IllegalArgumentException.class, e);
        for (String f : fragments) {
            assertTrue(ex.getMessage().contains(f), "message '" + ex.getMessage() + "' lacks '" + f + "'");
        }
        return ex;
    }
}
