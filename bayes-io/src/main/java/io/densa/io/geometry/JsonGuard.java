package io.densa.io.geometry;

import io.densa.io.ReadLimits;

/**
 * A lexical pass over a JSON text before it is parsed: nesting depth, number count and string
 * lengths against the limits, so the parser and the geometry builder never see a document that
 * would exhaust the stack or the heap. Package-private.
 */
final class JsonGuard {
    private JsonGuard() {
    }

    static void check(String text, ReadLimits limits, String source) {
        int depth = 0;
        long numbers = 0;
        int n = text.length();
        int i = 0;
        while (i < n) {
            char c = text.charAt(i);
            if (c == '"') {
                int start = i++;
                while (i < n && text.charAt(i) != '"') {
                    i += text.charAt(i) == '\\' ? 2 : 1;
                }
                if (i - start > limits.maxRecordChars()) {
                    throw new IllegalArgumentException(source + ", character " + start + ": a string of "
                            + (i - start) + " characters exceeds the limit of " + limits.maxRecordChars()
                            + " (ReadLimits.withMaxRecordChars)");
                }
                i++;
                continue;
            }
            if (c == '[' || c == '{') {
                if (++depth > limits.maxJsonDepth()) {
                    throw new IllegalArgumentException(source + ", character " + i + ": JSON nested deeper than "
                            + limits.maxJsonDepth() + " levels (ReadLimits.withMaxJsonDepth)");
                }
            } else if (c == ']' || c == '}') {
                depth--;
            } else if (c == '-' || (c >= '0' && c <= '9')) {
                if (++numbers > limits.maxJsonNumbers()) {
                    throw new IllegalArgumentException(source + ": more than " + limits.maxJsonNumbers()
                            + " numbers (ReadLimits.withMaxJsonNumbers)");
                }
                while (i + 1 < n && "0123456789+-.eE".indexOf(text.charAt(i + 1)) >= 0) {
                    i++;
                }
            }
            i++;
        }
    }
}
