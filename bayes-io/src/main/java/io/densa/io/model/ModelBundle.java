package io.densa.io.model;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Objects;

/**
 * Several saved models under names, in one file: what a backend loads together (for example a
 * baseline regression, its anomaly calibration and the estimator for new counts). Entries keep
 * their order; a bundle does not hold another bundle. Immutable.
 *
 * <pre>{@code
 * ModelFile.save(path, ModelBundle.of(Map.of("fit", fit, "calibration", calibrated)));
 * FunctionOnFunctionFit fit = ModelFile.load(path, ModelBundle.class).get("fit", FunctionOnFunctionFit.class);
 * }</pre>
 */
public final class ModelBundle {
    private final Map<String, Object> entries;

    private ModelBundle(Map<String, Object> entries) {
        this.entries = entries;
    }

    /**
     * A bundle of the given entries (in the map's iteration order).
     *
     * @throws IllegalArgumentException on an empty or blank name, a null model, or a model of a
     *                                  type that cannot be saved (naming the entry)
     */
    public static ModelBundle of(Map<String, ?> entries) {
        Objects.requireNonNull(entries, "entries");
        Map<String, Object> copy = new LinkedHashMap<>();
        for (Map.Entry<String, ?> e : entries.entrySet()) {
            String name = e.getKey();
            if (name == null || name.isBlank()) {
                throw new IllegalArgumentException("bundle entry names must be non-blank, got '" + name + "'");
            }
            if (e.getValue() == null) {
                throw new IllegalArgumentException("bundle entry '" + name + "' is null");
            }
            if (e.getValue() instanceof ModelBundle) {
                throw new IllegalArgumentException("bundle entry '" + name + "' is itself a bundle; bundles do not nest");
            }
            try {
                Codecs.typeOf(e.getValue());
            } catch (IllegalArgumentException x) {
                throw new IllegalArgumentException("bundle entry '" + name + "': " + x.getMessage());
            }
            copy.put(name, e.getValue());
        }
        return new ModelBundle(Collections.unmodifiableMap(copy));
    }

    /** The entries, in order (unmodifiable). */
    public Map<String, Object> entries() {
        return entries;
    }

    /**
     * The entry of the given name as the given type.
     *
     * @throws IllegalArgumentException if there is no such entry or it is of another type
     */
    public <T> T get(String name, Class<T> type) {
        Object v = entries.get(name);
        if (v == null) {
            throw new IllegalArgumentException("the bundle has no entry '" + name + "'; it has " + entries.keySet());
        }
        if (!type.isInstance(v)) {
            throw new IllegalArgumentException("bundle entry '" + name + "' is a " + v.getClass().getSimpleName()
                    + ", not a " + type.getSimpleName());
        }
        return type.cast(v);
    }

    @Override
    public String toString() {
        Map<String, String> types = new LinkedHashMap<>();
        entries.forEach((k, v) -> types.put(k, v.getClass().getSimpleName()));
        return "ModelBundle" + types;
    }
}
