package io.densa.spatial;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.internal.KernelPath;
import org.junit.jupiter.api.Test;

/**
 * The second test execution of this module (Surefire's {@code vector-path}, with
 * {@code --add-modules jdk.incubator.vector} and {@code densa.vector.required=true}) must run the
 * suite on the SIMD kernel path, the first on the plain path; otherwise one of the two runs would
 * silently repeat the other.
 */
class KernelPathActiveTest {
    @Test
    void theSuiteRunsOnThePathItsExecutionAsksFor() {
        if (Boolean.getBoolean("densa.vector.required")) {
            assertTrue(KernelPath.active().lanes() >= 4, KernelPath.active().describe());
        } else if (ModuleLayer.boot().findModule("jdk.incubator.vector").isEmpty()) {
            assertEquals("scalar", KernelPath.active().describe());
        }
    }
}
