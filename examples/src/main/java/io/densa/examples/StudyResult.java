package io.densa.examples;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;

/**
 * What a study run produced, for tests and callers that embed the studies.
 *
 * @param folder   the report folder
 * @param units    number of units (districts or monitors)
 * @param files    files written, relative to the folder
 * @param metrics  key numbers (e.g. {@code recall}, {@code precision}, {@code seconds})
 * @param missing  steps that could not be run, each with the reason
 */
public record StudyResult(Path folder, int units, List<String> files, Map<String, Double> metrics,
        List<String> missing) {
}
