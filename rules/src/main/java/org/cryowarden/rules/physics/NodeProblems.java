package org.cryowarden.rules.physics;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.Dimension;
import org.cryowarden.rules.NameMatch;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.config.ConfigNode;

/**
 * Collects the problems found while interpreting a positioned YAML tree (a calibration table, a room file), so
 * that one run reports all of them with {@code FILE:LINE:COLUMN}. Each accessor records a problem and returns
 * empty when the node is not what was expected.
 */
final class NodeProblems {

    private final List<ConfigProblem> problems = new ArrayList<>();

    void add(SourcePosition position, String message) {
        problems.add(new ConfigProblem(position, message));
    }

    boolean isEmpty() {
        return problems.isEmpty();
    }

    void throwIfAny() throws ConfigException {
        if (!problems.isEmpty()) {
            throw new ConfigException(problems);
        }
    }

    Optional<ConfigNode.Mapping> mapping(ConfigNode node, String what) {
        if (node instanceof ConfigNode.Mapping mapping) {
            return Optional.of(mapping);
        }
        add(node.position(), what + " must be a mapping, got " + node.kind());
        return Optional.empty();
    }

    Optional<ConfigNode.Sequence> sequence(ConfigNode node, String what) {
        if (node instanceof ConfigNode.Sequence sequence) {
            return Optional.of(sequence);
        }
        add(node.position(), what + " must be a list, got " + node.kind());
        return Optional.empty();
    }

    /** Reports every key not in {@code allowed}, with a "did you mean" for a near miss. */
    void allowOnly(ConfigNode.Mapping mapping, Set<String> allowed, String what) {
        for (ConfigNode.Entry entry : mapping.entries()) {
            if (!allowed.contains(entry.key())) {
                add(entry.keyPosition(), "unknown key '" + entry.key() + "' in " + what + nearest(entry.key(), allowed)
                        + "; expected one of " + String.join(", ", allowed.stream().sorted().toList()));
            }
        }
    }

    Optional<ConfigNode> required(ConfigNode.Mapping mapping, String key, String what) {
        Optional<ConfigNode> value = mapping.get(key);
        if (value.isEmpty()) {
            add(mapping.position(), what + " needs '" + key + "'");
        }
        return value;
    }

    Optional<String> text(ConfigNode node, String what) {
        if (node instanceof ConfigNode.Scalar scalar && !scalar.isNull() && !scalar.text().isBlank()) {
            return Optional.of(scalar.text());
        }
        add(node.position(), what + " must be a single value, got "
                + (node instanceof ConfigNode.Scalar ? "nothing" : node.kind()));
        return Optional.empty();
    }

    Optional<Double> number(ConfigNode node, String what) {
        Optional<String> text = text(node, what);
        if (text.isEmpty()) {
            return Optional.empty();
        }
        try {
            double value = Double.parseDouble(text.get().strip());
            if (Double.isFinite(value) && !text.get().strip().matches("(?i).*(nan|infinity|[fd])$")) {
                return Optional.of(value);
            }
        } catch (NumberFormatException e) {
            // reported below
        }
        add(node.position(), what + " must be a number, got '" + text.get() + "'");
        return Optional.empty();
    }

    Optional<Quantity> quantity(ConfigNode node, Dimension dimension, String what) {
        Optional<String> text = text(node, what);
        if (text.isEmpty()) {
            return Optional.empty();
        }
        try {
            return Optional.of(Quantity.parse(text.get(), dimension));
        } catch (IllegalArgumentException e) {
            add(node.position(), what + ": " + e.getMessage());
            return Optional.empty();
        }
    }

    /** A key that starts a longer allowed one ("rate" for "rate_per_h"), else the project's closest name. */
    private static String nearest(String key, Set<String> allowed) {
        String lower = key.toLowerCase(Locale.ROOT);
        List<String> sorted = allowed.stream().sorted().toList();
        Optional<String> prefixed = lower.length() >= 3
                ? sorted.stream().filter(candidate -> candidate.startsWith(lower)).findFirst()
                : Optional.empty();
        return prefixed.or(() -> NameMatch.closest(key, sorted)).map(best -> " (did you mean '" + best + "'?)")
                .orElse("");
    }
}
