package io.densa.io;

import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.densa.core.BayesSpace;
import org.junit.jupiter.api.Test;

/** A bin layout on a circle spans one period from any start, as the estimators require. */
class BinsCircleTest {
    @Test
    void layoutsOnACircleSpanOnePeriod() {
        BayesSpace days = BayesSpace.periodicSplines(0, 365, 4, 12);
        Bins wrapping = Bins.of(10, 100, 200, 300, 375); // the last bin [300, 375) wraps past 365 to 10
        assertSame(wrapping, wrapping.checkAgainst(days));
        Bins.of(-20, 345).checkAgainst(days);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Bins.of(0, 100, 200).checkAgainst(days));
        assertTrue(e.getMessage().contains("one period 365"), e.getMessage());
        // a bounded space still takes any layout inside its domain, and no wrapping one
        BayesSpace bounded = BayesSpace.cubicSplines(0, 365, 8);
        Bins.of(0, 100, 200).checkAgainst(bounded);
        assertThrows(IllegalArgumentException.class, () -> wrapping.checkAgainst(bounded));
    }
}
