package org.cryowarden.drivers.settings;

import java.time.Duration;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.OptionalDouble;
import java.util.OptionalInt;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.NameMatch;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.config.ConfigNode;

/**
 * Reads typed values out of a positioned settings mapping and collects every problem with its position, so a
 * driver's {@code validate} reports all mistakes of an instrument at once ("unit must be 1-247, got 300"). Each
 * getter returns empty both for an absent optional key and for a wrong value (then a problem is recorded).
 * Not thread-safe; one reader per validation.
 */
public final class SettingsReader {

    private final ConfigNode.Mapping mapping;
    private final String what;
    private final List<ConfigProblem> problems = new ArrayList<>();

    /** @param what names the mapping in messages: "settings of instrument 'o2-east'" */
    public SettingsReader(ConfigNode.Mapping mapping, String what) {
        this.mapping = Objects.requireNonNull(mapping, "mapping");
        this.what = Objects.requireNonNull(what, "what");
    }

    public List<ConfigProblem> problems() {
        return List.copyOf(problems);
    }

    public ConfigNode.Mapping mapping() {
        return mapping;
    }

    /** Records a problem of the caller's own (a rule between two keys). */
    public void problem(SourcePosition position, String message) {
        problems.add(new ConfigProblem(position, message));
    }

    public boolean has(String key) {
        return mapping.get(key).isPresent();
    }

    /** Flags every key not in {@code allowed}, suggesting the closest allowed one. */
    public void allowOnly(String... allowed) {
        List<String> names = Arrays.asList(allowed);
        for (ConfigNode.Entry entry : mapping.entries()) {
            if (!names.contains(entry.key())) {
                String hint = NameMatch.closest(entry.key(), names).map(c -> "; did you mean '" + c + "'?")
                        .orElse("; expected one of " + String.join(", ", names));
                problems.add(new ConfigProblem(entry.keyPosition(),
                        "unknown key '" + entry.key() + "' in " + what + hint));
            }
        }
    }

    /** A scalar's text. */
    public Optional<String> text(String key, boolean required) {
        Optional<ConfigNode> node = node(key, required);
        if (node.isEmpty()) {
            return Optional.empty();
        }
        if (!(node.get() instanceof ConfigNode.Scalar scalar) || scalar.isNull()) {
            wrong(key, node.get(), "a text value");
            return Optional.empty();
        }
        return Optional.of(scalar.text());
    }

    /** A whole number in {@code [min, max]}. */
    public OptionalInt integer(String key, int min, int max, boolean required) {
        Optional<String> text = text(key, required);
        if (text.isEmpty()) {
            return OptionalInt.empty();
        }
        long value;
        try {
            value = Long.parseLong(text.get().strip());
        } catch (NumberFormatException e) {
            problems.add(new ConfigProblem(position(key), key + " in " + what + " must be a whole number from " + min
                    + " to " + max + ", got '" + text.get() + "'"));
            return OptionalInt.empty();
        }
        if (value < min || value > max) {
            problems.add(new ConfigProblem(position(key), key + " in " + what + " must be " + min + "-" + max
                    + ", got " + value));
            return OptionalInt.empty();
        }
        return OptionalInt.of((int) value);
    }

    /** A finite number. */
    public OptionalDouble number(String key, boolean required) {
        Optional<String> text = text(key, required);
        return text.isEmpty() ? OptionalDouble.empty() : parseNumber(key, text.get(), position(key));
    }

    /** A number inside a list item, for ranges like {@code range: [0, 100]}. */
    public OptionalDouble number(String key, ConfigNode item) {
        if (!(item instanceof ConfigNode.Scalar scalar) || scalar.isNull()) {
            problems.add(new ConfigProblem(item.position(), key + " in " + what + " must hold numbers, got "
                    + item.kind()));
            return OptionalDouble.empty();
        }
        return parseNumber(key, scalar.text(), item.position());
    }

    /** A duration in the file syntax ("500ms", "2s") within {@code [min, max]}. */
    public Optional<Duration> duration(String key, Duration min, Duration max, boolean required) {
        Optional<String> text = text(key, required);
        if (text.isEmpty()) {
            return Optional.empty();
        }
        Duration value;
        try {
            value = DurationSyntax.parse(text.get());
        } catch (IllegalArgumentException e) {
            problems.add(new ConfigProblem(position(key), key + " in " + what + ": " + e.getMessage()));
            return Optional.empty();
        }
        if (value.compareTo(min) < 0 || value.compareTo(max) > 0) {
            problems.add(new ConfigProblem(position(key), key + " in " + what + " must be between "
                    + DurationSyntax.format(min) + " and " + DurationSyntax.format(max) + ", got " + text.get().strip()));
            return Optional.empty();
        }
        return Optional.of(value);
    }

    /** One of a closed set of words. */
    public <E> Optional<E> choice(String key, Map<String, E> options, boolean required) {
        Optional<String> text = text(key, required);
        if (text.isEmpty()) {
            return Optional.empty();
        }
        E value = options.get(text.get().strip());
        if (value == null) {
            List<String> names = new ArrayList<>(options.keySet());
            names.sort(null);
            String hint = NameMatch.closest(text.get().strip(), names)
                    .map(c -> "; did you mean '" + c + "'?").orElse("");
            problems.add(new ConfigProblem(position(key), key + " in " + what + " must be one of "
                    + String.join(", ", names) + ", got '" + text.get() + "'" + hint));
            return Optional.empty();
        }
        return Optional.of(value);
    }

    /** A true/false flag. */
    public Optional<Boolean> flag(String key, boolean required) {
        return choice(key, Map.of("true", Boolean.TRUE, "false", Boolean.FALSE), required);
    }

    /** A nested mapping. */
    public Optional<ConfigNode.Mapping> mapping(String key, boolean required) {
        Optional<ConfigNode> node = node(key, required);
        if (node.isEmpty()) {
            return Optional.empty();
        }
        if (!(node.get() instanceof ConfigNode.Mapping nested)) {
            wrong(key, node.get(), "a mapping");
            return Optional.empty();
        }
        return Optional.of(nested);
    }

    /** A list. */
    public Optional<ConfigNode.Sequence> sequence(String key, boolean required) {
        Optional<ConfigNode> node = node(key, required);
        if (node.isEmpty()) {
            return Optional.empty();
        }
        if (!(node.get() instanceof ConfigNode.Sequence list)) {
            wrong(key, node.get(), "a list");
            return Optional.empty();
        }
        return Optional.of(list);
    }

    /** Where {@code key}'s value is written, or the mapping itself when the key is absent. */
    public SourcePosition position(String key) {
        return mapping.get(key).map(ConfigNode::position).orElse(mapping.position());
    }

    private Optional<ConfigNode> node(String key, boolean required) {
        Optional<ConfigNode> node = mapping.get(key);
        if (node.isEmpty() && required) {
            problems.add(new ConfigProblem(mapping.position(), "missing key '" + key + "' in " + what));
        }
        return node;
    }

    private OptionalDouble parseNumber(String key, String text, SourcePosition position) {
        try {
            double value = Double.parseDouble(text.strip());
            if (Double.isFinite(value) && !text.strip().matches(".*[a-zA-Z&&[^eE]].*")) {
                return OptionalDouble.of(value);
            }
        } catch (NumberFormatException e) {
            // reported below
        }
        problems.add(new ConfigProblem(position, key + " in " + what + " must be a number, got '" + text + "'"));
        return OptionalDouble.empty();
    }

    private void wrong(String key, ConfigNode node, String expected) {
        problems.add(new ConfigProblem(node.position(), key + " in " + what + " must be " + expected + ", got "
                + node.kind()));
    }
}
