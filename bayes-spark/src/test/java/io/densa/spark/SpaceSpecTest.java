package io.densa.spark;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import io.densa.core.Reference;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.ObjectInputStream;
import java.io.ObjectOutputStream;
import org.junit.jupiter.api.Test;

/**
 * Spaces with a normal or beta reference travel to executors as numbers (Java serialisation, as
 * Spark ships a broadcast) and are rebuilt equal to the space built on the driver, whether the
 * reference was added to the definition or to the space; a weight-function reference, which
 * cannot be described by numbers, is refused with the way out. No Spark session needed.
 */
class SpaceSpecTest {
    static SpaceSpec shipped(SpaceSpec spec) throws Exception {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (ObjectOutputStream out = new ObjectOutputStream(bytes)) {
            out.writeObject(spec);
        }
        try (ObjectInputStream in = new ObjectInputStream(new ByteArrayInputStream(bytes.toByteArray()))) {
            return (SpaceSpec) in.readObject();
        }
    }

    @Test
    void normalAndBetaReferencesAreRebuiltEqual() throws Exception {
        BayesSpace splines = BayesSpace.splines(0, 10, 4, 5);
        SpaceSpec normal = shipped(SpaceSpec.of(splines).withNormalReference(4, 1.5));
        assertEquals(splines.withReference(Reference.normal(4, 1.5)), normal.space());
        SpaceSpec beta = shipped(SpaceSpec.of(BayesSpace.polynomials(0, 1, 3)).withBetaReference(2, 5));
        assertEquals(BayesSpace.polynomials(0, 1, 3).withReference(Reference.beta(2, 5)), beta.space());
        assertEquals(splines.dimension(), normal.dimension());
        // the reference changes the space: the same coordinates are another density
        assertTrue(!normal.space().equals(SpaceSpec.of(splines).space()));
        // a space built with its reference on the driver is described by the same numbers
        for (BayesSpace s : new BayesSpace[] {splines.withReference(Reference.normal(4, 1.5)),
                BayesSpace.polynomials(0, 1, 3).withReference(Reference.beta(2, 5))}) {
            assertEquals(s, shipped(SpaceSpec.of(s)).space());
        }
    }

    @Test
    void badReferencesAndCustomWeightsAreRefused() {
        SpaceSpec spec = SpaceSpec.of(BayesSpace.splines(0, 10, 4, 5));
        assertThrows(IllegalArgumentException.class, () -> spec.withNormalReference(4, 0));
        assertThrows(IllegalArgumentException.class, () -> spec.withBetaReference(-1, 2));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> SpaceSpec.of(
                BayesSpace.splines(0, 10, 4, 5).withReference(Reference.weight("ramp", x -> 1 + x))));
        assertTrue(e.getMessage().contains("cannot be shipped"), e.getMessage());
    }
}
