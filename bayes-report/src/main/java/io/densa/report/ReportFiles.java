package io.densa.report;

import java.nio.file.Path;
import java.util.List;
import java.util.Objects;

/**
 * What {@link Report#writeTo(Path)} wrote.
 *
 * @param folder the report folder
 * @param files  the files written, relative to the folder, in order (summary.md and summary.html
 *               last; the folder's manifest {@code .densa-report} is not listed)
 */
public record ReportFiles(Path folder, List<String> files) {
    /** Checks and copies. */
    public ReportFiles {
        Objects.requireNonNull(folder, "folder");
        files = List.copyOf(files);
    }
}
