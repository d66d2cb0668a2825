package io.densa.io.model;

/**
 * Limits a model file must stay within before anything it declares is allocated. A reader checks
 * the file's size first, then parses with the depth, text and count limits, and checks every
 * declared array shape against {@link #maxElements()} before allocating the array, and against the
 * number of bytes its base64 data holds. Exceeding a limit is an {@link IllegalArgumentException} naming the
 * file, the field and the limit (and this record's {@code with…} method that raises it).
 *
 * @param maxFileBytes largest accepted file, in bytes (default 256 MiB)
 * @param maxElements  largest accepted number of elements of one stored array (default 2²⁵)
 * @param maxTextChars longest accepted text field (ids, names, messages, keys), in characters
 *                     (default 4,096)
 * @param maxDepth     deepest accepted nesting of JSON objects and arrays (default 32)
 * @param maxNodes     largest accepted number of JSON values in the whole file (default 4,000,000;
 *                     an id is one value)
 */
public record ModelLimits(long maxFileBytes, int maxElements, int maxTextChars, int maxDepth, int maxNodes) {
    /** The defaults (see the components). */
    public static final ModelLimits DEFAULTS = new ModelLimits(256L << 20, 1 << 25, 4096, 32, 4_000_000);

    /** Checks that every limit is positive and the depth at least 8 (the format nests that deep). */
    public ModelLimits {
        if (maxFileBytes < 64 || maxElements < 1 || maxTextChars < 64 || maxDepth < 8 || maxNodes < 64) {
            throw new IllegalArgumentException("model limits must be positive (file >= 64 bytes, elements >= 1,"
                    + " text >= 64 characters, depth >= 8, nodes >= 64), got " + maxFileBytes + " bytes, " + maxElements
                    + " elements, " + maxTextChars + " characters, depth " + maxDepth + ", " + maxNodes + " nodes");
        }
    }

    /** The defaults. */
    public static ModelLimits defaults() {
        return DEFAULTS;
    }

    /** These limits with another largest file size in bytes. */
    public ModelLimits withMaxFileBytes(long bytes) {
        return new ModelLimits(bytes, maxElements, maxTextChars, maxDepth, maxNodes);
    }

    /** These limits with another largest array element count. */
    public ModelLimits withMaxElements(int elements) {
        return new ModelLimits(maxFileBytes, elements, maxTextChars, maxDepth, maxNodes);
    }

    /** These limits with another longest text field. */
    public ModelLimits withMaxTextChars(int chars) {
        return new ModelLimits(maxFileBytes, maxElements, chars, maxDepth, maxNodes);
    }

    /** These limits with another deepest nesting. */
    public ModelLimits withMaxDepth(int depth) {
        return new ModelLimits(maxFileBytes, maxElements, maxTextChars, depth, maxNodes);
    }

    /** These limits with another largest number of JSON values. */
    public ModelLimits withMaxNodes(int nodes) {
        return new ModelLimits(maxFileBytes, maxElements, maxTextChars, maxDepth, nodes);
    }
}
