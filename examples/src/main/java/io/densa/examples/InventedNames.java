package io.densa.examples;

import java.util.HashSet;
import java.util.Locale;
import java.util.Random;
import java.util.Set;

/**
 * Invented place names built from random syllables of an artificial sound set (seeded; checked to
 * be unique). The syllables are chosen so that the names read as invented words.
 */
final class InventedNames {
    private static final String[] SYLLABLES = {"qa", "zu", "vex", "oth", "ryn", "kyl", "xa", "myr", "tov", "zel",
        "quo", "yss", "brax", "ilq", "dro", "vyn", "oq", "tez", "uxa", "nym", "jev", "orz", "kwa", "phy"};
    private final Random random;
    private final Set<String> used = new HashSet<>();

    InventedNames(long seed) {
        this.random = new Random(seed);
    }

    /** A fresh invented name, never returned before by this generator. */
    String next() {
        while (true) {
            int parts = 2 + random.nextInt(2);
            StringBuilder sb = new StringBuilder();
            for (int i = 0; i < parts; i++) {
                sb.append(SYLLABLES[random.nextInt(SYLLABLES.length)]);
            }
            String s = sb.toString();
            String name = s.substring(0, 1).toUpperCase(Locale.ROOT) + s.substring(1);
            if (used.add(name)) {
                return name;
            }
        }
    }
}
