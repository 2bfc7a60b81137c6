package org.cryowarden.rules.config;

import java.util.HashMap;
import java.util.IdentityHashMap;
import java.util.Map;
import org.cryowarden.rules.SourcePosition;

/**
 * Where the parts of loaded records were written (a rule's setpoint, the third channel of a vote, an action's
 * output), so that checks across files can point at the exact value rather than at the whole rule. Keyed by
 * record identity; field names are the YAML keys, list items {@code key[index]}.
 */
final class SourceMap {

    private final Map<Object, Map<String, SourcePosition>> positions = new IdentityHashMap<>();

    void put(Object record, String field, SourcePosition position) {
        positions.computeIfAbsent(record, r -> new HashMap<>()).put(field, position);
    }

    void putAll(Object record, Map<String, SourcePosition> fields) {
        positions.computeIfAbsent(record, r -> new HashMap<>()).putAll(fields);
    }

    /** The position of {@code field} of {@code record}, or {@code fallback} when it was not recorded. */
    SourcePosition get(Object record, String field, SourcePosition fallback) {
        Map<String, SourcePosition> fields = positions.get(record);
        if (fields == null) {
            return fallback;
        }
        return fields.getOrDefault(field, fallback);
    }

    void merge(SourceMap other) {
        positions.putAll(other.positions);
    }
}
