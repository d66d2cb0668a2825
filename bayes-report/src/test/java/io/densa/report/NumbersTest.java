package io.densa.report;

import io.densa.report.colour.ColourScale;
import io.densa.report.colour.Oklab;
import io.densa.report.colour.Palette;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/** Number formats: rankable p-values, significant digits, round ticks. */
class NumbersTest {
    @Test
    void significantDigitsInPlainAndScientificNotation() {
        assertEquals("0.0012", Numbers.significant(0.0012345, 2));
        assertEquals("1.2e-05", Numbers.significant(0.0000123, 2));
        assertEquals("123", Numbers.significant(123.4, 3));
        assertEquals("0.1", Numbers.significant(0.1, 3));
        assertEquals("n/a", Numbers.significant(Double.NaN, 3));
        assertEquals("3.14", Numbers.fixed(Math.PI, 2));
    }

    @Test
    void pValuesGetEnoughDigitsToRankAndTiesStayTied() {
        // conformal p-values k / (n + 1) with n = 600 (common practice: the attainable values of a
        // split-conformal p-value) plus values that differ only in the fourth digit
        double[] p = {1 / 601.0, 2 / 601.0, 1 / 601.0, 0.04512, 0.04518, 0.5, 0.5};
        String[] s = Numbers.rankable(p);
        for (int i = 0; i < p.length; i++) {
            for (int j = 0; j < p.length; j++) {
                if (p[i] == p[j]) {
                    assertEquals(s[i], s[j]);
                } else {
                    assertNotEquals(s[i], s[j], p[i] + " and " + p[j] + " must read differently");
                    assertEquals(Double.compare(p[i], p[j]), Double.compare(Double.parseDouble(s[i]),
                            Double.parseDouble(s[j])), "order of " + s[i] + " and " + s[j]);
                }
            }
        }
        assertEquals("0.0451", s[3]);
        assertEquals("0.0452", s[4]);
        // two digits suffice when the values are far apart
        assertArrayEquals(new String[] {"0.012", "0.5"}, Numbers.rankable(new double[] {0.0123, 0.5}));
    }

    @Test
    void rankableHoldsForRandomColumns() {
        Random r = new Random(3);
        for (int trial = 0; trial < 200; trial++) {
            double[] p = new double[30];
            for (int i = 0; i < p.length; i++) {
                p[i] = Math.floor(r.nextDouble() * 1e6) / 1e6;
            }
            String[] s = Numbers.rankable(p);
            long distinctValues = Arrays.stream(p).distinct().count();
            long distinctText = Arrays.stream(s).distinct().count();
            assertEquals(distinctValues, distinctText, "trial " + trial);
        }
    }

    @Test
    void ticksAreRoundAndInsideTheRange() {
        assertArrayEquals(new double[] {0, 0.2, 0.4, 0.6, 0.8, 1}, Numbers.ticks(0, 1, 6));
        assertArrayEquals(new double[] {30, 40, 50, 60}, Numbers.ticks(27.3, 61.2, 5));
        assertArrayEquals(new double[] {1, 2, 5, 10, 20, 50, 100}, Numbers.logTicks(1, 150));
        assertArrayEquals(new double[] {1e-3, 1e-2, 1e-1, 1, 10}, Numbers.logTicks(1e-3, 12));
        assertArrayEquals(new String[] {"0", "0.25", "1000"}, Numbers.tickLabels(new double[] {0, 0.25, 1000}));
        assertThrows(IllegalArgumentException.class, () -> Numbers.ticks(1, Double.NaN, 5));
        assertThrows(IllegalArgumentException.class, () -> Numbers.logTicks(0, 5));
    }

    @Test
    void colourScalesWidenToRoundEndsAndLabelTheirUnit() {
        ColourScale lin = ColourScale.of(new double[] {27.3, 61.2, Double.NaN}, "median age", "years");
        assertEquals(20, lin.lower());
        assertEquals(70, lin.upper());
        assertEquals("median age (years)", lin.title());
        ColourScale log = ColourScale.log(new double[] {13, 2400}, "visits", "visits per season");
        assertEquals(10, log.lower());
        assertEquals(5000, log.upper());
        assertArrayEquals(new String[] {"10", "20", "50", "100", "200", "500", "1000", "2000", "5000"},
                log.tickLabels());
        assertEquals("visits (visits per season, log scale)", log.title());
        assertEquals(0.5, log.position(Math.sqrt(10 * 5000.0)), 1e-12);
        ColourScale div = ColourScale.diverging(3.7, "score", "");
        assertEquals(-4, div.lower());
        assertEquals(4, div.upper());
        assertTrue(Oklab.of(div.colour(0))[0] > 0.9, "zero is near white on the diverging scale");
        assertEquals(Palette.NO_DATA, lin.colour(Double.NaN));
    }
}
