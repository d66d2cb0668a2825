package io.densa.examples;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;

/** Study 2: concentration distributions from an invented monitor network. */
final class Study2 {
    private Study2() {
    }

    static StudyResult run(Main.Options options, Progress progress) {
        int n = options.unitsOr(30, 50, 80);
        AirScenario sc = AirScenario.generate(options.seed(), n);
        progress.line(sc.size() + " monitors generated");
        return new StudyResult(options.out(), sc.size(), new ArrayList<>(), new LinkedHashMap<>(), List.of());
    }
}
