package io.densa.spark;

import static org.junit.jupiter.api.Assertions.assertEquals;

import io.densa.core.BayesSpace;
import io.densa.core.Reference;
import org.junit.jupiter.api.Test;

/** Periodic spaces travel to executors as their definition and come back equal (no Spark session needed). */
class SpaceSpecCircleTest {
    @Test
    void periodicSpacesAreRebuiltEqual() {
        for (BayesSpace s : new BayesSpace[] {BayesSpace.periodicSplines(0.1, 0.2, 4, 6),
                BayesSpace.periodicSplines(-1, 10, 3, new double[] {-1, 0.5, 2, 6.5}),
                BayesSpace.fourier(0, 365, 3).withReference(Reference.uniform())}) {
            BayesSpace back = SpaceSpec.of(s).space();
            assertEquals(s, back);
            assertEquals(s.period(), back.period(), 0.0);
        }
    }
}
