package io.densa.core.internal;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

class SeedsTest {
    /**
     * Second derivation of {@link Seeds#mix}: it is the SplitMix64 output function (Steele, Lea &amp;
     * Flood (2014), Fast splittable pseudorandom number generators, OOPSLA — from memory) applied to
     * seed + (i + 1)·γ, γ = 0x9E3779B97F4A7C15, which is exactly what the JDK's independent
     * implementation {@code java.util.SplittableRandom(seed)} returns as its (i + 1)-th
     * {@code nextLong()}.
     */
    @Test
    void mixIsTheSplitMix64StreamOfTheJdk() {
        for (long seed : new long[] {0L, 1L, -7L, 0x123456789ABCDEFL, Long.MIN_VALUE}) {
            SplittableRandom jdk = new SplittableRandom(seed);
            for (int i = 0; i < 1000; i++) {
                assertEquals(jdk.nextLong(), Seeds.mix(seed, i), "seed " + seed + ", index " + i);
            }
        }
    }
}
