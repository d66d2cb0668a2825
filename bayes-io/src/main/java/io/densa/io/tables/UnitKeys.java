package io.densa.io.tables;

import io.densa.io.ReadLimits;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/** Index of (id, period) pairs in order of first appearance, with the unit limit. Package-private. */
final class UnitKeys {
    private final Map<String, Integer> index = new HashMap<>();
    final List<String> ids = new ArrayList<>();
    final List<String> periods = new ArrayList<>();
    private final boolean withPeriods;
    private final int maxUnits;
    private final String source;

    UnitKeys(boolean withPeriods, int maxUnits, String source) {
        this.withPeriods = withPeriods;
        this.maxUnits = maxUnits;
        this.source = source;
    }

    int indexOf(String id, String period) {
        String key = withPeriods ? id.length() + ":" + id + period : id;
        Integer i = index.get(key);
        if (i != null) {
            return i;
        }
        if (ids.size() >= maxUnits) {
            throw new IllegalArgumentException(source + " has more than " + maxUnits + " units"
                    + (withPeriods ? " (unit-period pairs)" : "") + ", the limit (ReadLimits.withMaxUnits)");
        }
        int n = ids.size();
        index.put(key, n);
        ids.add(id);
        if (withPeriods) {
            periods.add(period);
        }
        return n;
    }

    int size() {
        return ids.size();
    }

    String[] idArray() {
        return ids.toArray(new String[0]);
    }

    String[] periodArray() {
        return withPeriods ? periods.toArray(new String[0]) : null;
    }

    String name(int u) {
        return "unit '" + ids.get(u) + "'" + (withPeriods ? ", period '" + periods.get(u) + "'" : "");
    }
}
