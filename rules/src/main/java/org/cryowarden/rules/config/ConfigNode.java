package org.cryowarden.rules.config;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.SourcePosition;

/**
 * A YAML node that remembers where it was written, so that whoever interprets it later (a driver validating its
 * settings, a later section of the site file) can still report {@code FILE:LINE:COLUMN}. Built by the loaders
 * from SnakeYAML Engine's composed node tree; values stay text until someone asks for a type.
 */
public sealed interface ConfigNode permits ConfigNode.Scalar, ConfigNode.Sequence, ConfigNode.Mapping {

    SourcePosition position();

    /** A short word for messages: "a scalar", "a list", "a mapping". */
    String kind();

    /** A single value, kept as written. {@code null} in YAML is an empty text with {@code isNull} set. */
    record Scalar(String text, boolean isNull, SourcePosition position) implements ConfigNode {
        public Scalar {
            Objects.requireNonNull(text, "text");
            Objects.requireNonNull(position, "position");
        }

        @Override
        public String kind() {
            return "a scalar";
        }
    }

    /** A list. */
    record Sequence(List<ConfigNode> items, SourcePosition position) implements ConfigNode {
        public Sequence {
            items = List.copyOf(items);
            Objects.requireNonNull(position, "position");
        }

        @Override
        public String kind() {
            return "a list";
        }
    }

    /** One key of a mapping with the position of the key itself (where "unknown key" errors point). */
    record Entry(String key, SourcePosition keyPosition, ConfigNode value) {
        public Entry {
            Objects.requireNonNull(key, "key");
            Objects.requireNonNull(keyPosition, "keyPosition");
            Objects.requireNonNull(value, "value");
        }
    }

    /** A mapping with unique string keys, in file order. */
    record Mapping(List<Entry> entries, SourcePosition position) implements ConfigNode {
        public Mapping {
            entries = List.copyOf(entries);
            Objects.requireNonNull(position, "position");
        }

        public Optional<ConfigNode> get(String key) {
            for (Entry entry : entries) {
                if (entry.key().equals(key)) {
                    return Optional.of(entry.value());
                }
            }
            return Optional.empty();
        }

        public Optional<Entry> entry(String key) {
            for (Entry entry : entries) {
                if (entry.key().equals(key)) {
                    return Optional.of(entry);
                }
            }
            return Optional.empty();
        }

        public List<String> keys() {
            List<String> keys = new ArrayList<>(entries.size());
            for (Entry entry : entries) {
                keys.add(entry.key());
            }
            return keys;
        }

        @Override
        public String kind() {
            return "a mapping";
        }
    }
}
