package io.densa.report;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Pattern;

/**
 * The folder a report is written to, kept holding only the files of the last report written
 * there. A manifest ({@value #MANIFEST}) lists the files a report wrote; the next report deletes
 * exactly those (plain files named in the manifest, inside the folder, not symbolic links) before
 * writing its own. A folder that is not empty and has no manifest is refused, so that no file a
 * report did not write is ever deleted or mixed with a report.
 */
final class ReportFolder {
    /** Name of the manifest file. */
    static final String MANIFEST = ".densa-report";
    /** File names a report may write: a plain name with one of the report's extensions. */
    static final Pattern FILE_NAME = Pattern.compile("[A-Za-z0-9][A-Za-z0-9._-]{0,120}\\.(md|html|csv|geojson|png)");
    private static final String HEADER = "# Files written by a Densa report into this folder; the next report "
            + "written here deletes them first.";

    private ReportFolder() {
    }

    /**
     * Checks that a report can be written to {@code dir}, creating it if missing.
     *
     * @return the manifest's list of files of the previous report (empty for a new folder)
     * @throws IllegalArgumentException if the path is a file, cannot be created or written, or is a
     *                                  folder with other content and no manifest
     */
    static List<String> prepare(Path dir) {
        if (Files.exists(dir) && !Files.isDirectory(dir)) {
            throw new IllegalArgumentException("the report folder " + dir + " is an existing file; give the path of a "
                    + "folder (it is created if missing)");
        }
        try {
            Files.createDirectories(dir);
        } catch (IOException | SecurityException e) {
            throw new IllegalArgumentException("cannot create the report folder " + dir + ": " + reason(e));
        }
        Path manifest = dir.resolve(MANIFEST);
        List<String> others = new ArrayList<>();
        try (DirectoryStream<Path> entries = Files.newDirectoryStream(dir)) {
            for (Path p : entries) {
                if (!p.getFileName().toString().equals(MANIFEST)) {
                    others.add(p.getFileName().toString());
                }
            }
        } catch (IOException e) {
            throw new IllegalArgumentException("cannot list the report folder " + dir + ": " + reason(e));
        }
        if (!Files.isRegularFile(manifest, LinkOption.NOFOLLOW_LINKS)) {
            if (!others.isEmpty()) {
                others.sort(null);
                throw new IllegalArgumentException("the report folder " + dir + " is not empty and holds no report "
                        + "written by Densa (it has " + String.join(", ", others.subList(0, Math.min(5, others.size())))
                        + (others.size() > 5 ? " and " + (others.size() - 5) + " more" : "") + "); give a new or "
                        + "empty folder so that no file of yours is overwritten");
            }
            probe(dir);
            return List.of();
        }
        probe(dir);
        try {
            List<String> listed = new ArrayList<>();
            for (String line : Files.readAllLines(manifest, StandardCharsets.UTF_8)) {
                String name = line.strip();
                if (FILE_NAME.matcher(name).matches()) {
                    listed.add(name);
                }
            }
            return listed;
        } catch (IOException e) {
            throw new IllegalArgumentException("cannot read " + manifest + ": " + reason(e));
        }
    }

    /** Checks that the folder takes a new file: creates a fresh uniquely named file and deletes it. */
    private static void probe(Path dir) {
        try {
            Files.delete(Files.createTempFile(dir, ".densa-write-check", ".tmp"));
        } catch (IOException | SecurityException e) {
            throw new IllegalArgumentException("cannot write into the report folder " + dir + ": " + reason(e));
        }
    }

    /**
     * Deletes the files of the previous report (plain files only, by name inside the folder) and
     * writes the manifest of the coming one.
     */
    static void replace(Path dir, List<String> previous, List<String> coming) {
        try {
            for (String name : previous) {
                Path p = dir.resolve(name);
                if (FILE_NAME.matcher(name).matches() && p.getParent().equals(dir)
                        && Files.isRegularFile(p, LinkOption.NOFOLLOW_LINKS)) {
                    Files.delete(p);
                }
            }
            List<String> lines = new ArrayList<>();
            lines.add(HEADER);
            lines.addAll(coming);
            Files.write(dir.resolve(MANIFEST), lines, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot replace the previous report in " + dir + ": " + reason(e), e);
        }
    }

    private static String reason(Exception e) {
        if (e instanceof java.nio.file.AccessDeniedException) {
            return "permission denied";
        }
        if (e instanceof java.nio.file.NoSuchFileException) {
            return "the file system refuses the path (no such file or folder)";
        }
        if (e instanceof java.nio.file.FileSystemException f && f.getReason() != null) {
            return f.getReason().toLowerCase(java.util.Locale.ROOT);
        }
        return e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
    }
}
