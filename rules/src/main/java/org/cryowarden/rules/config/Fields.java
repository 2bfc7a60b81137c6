package org.cryowarden.rules.config;

import java.time.Duration;
import java.time.LocalTime;
import java.time.ZoneId;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;

/**
 * Typed, positioned access to the keys of one mapping, as the loaders read them. Every failed access reports
 * one problem (missing key, wrong node type, value that does not parse) and returns empty, so that loading
 * goes on and a run reports every error. Remembers the position of each value read, for {@link SourceMap}.
 */
final class Fields {

    private static final Pattern TIME_OF_DAY = Pattern.compile("(\\d{1,2}):(\\d{2})");
    private static final Pattern NUMBER = Pattern.compile("[-+]?(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][-+]?\\d+)?");

    private final ConfigNode.Mapping mapping;
    private final List<String> allowed;
    private final Problems problems;
    private final Map<String, SourcePosition> positions = new HashMap<>();
    private String context;

    private Fields(ConfigNode.Mapping mapping, String context, List<String> allowed, Problems problems) {
        this.mapping = mapping;
        this.context = context;
        this.allowed = List.copyOf(allowed);
        this.problems = problems;
    }

    /**
     * Opens a node that must be a mapping; reports it (as {@code what}, e.g. "a channel") when it is not.
     *
     * @param allowed every key this mapping may have, in the order the documentation lists them
     */
    static Optional<Fields> open(ConfigNode node, String what, List<String> allowed, Problems problems) {
        if (node instanceof ConfigNode.Mapping mapping) {
            return Optional.of(new Fields(mapping, what, allowed, problems));
        }
        problems.add(node.position(), "expected " + what + " (a mapping of keys), found " + found(node));
        return Optional.empty();
    }

    /** Renames the mapping in later messages, e.g. from "a channel" to "channel 'o2-east'" once its id is known. */
    void describeAs(String context) {
        this.context = context;
    }

    String context() {
        return context;
    }

    SourcePosition position() {
        return mapping.position();
    }

    ConfigNode.Mapping mapping() {
        return mapping;
    }

    /** Where each value read so far was written, keyed by YAML key. */
    Map<String, SourcePosition> positions() {
        return positions;
    }

    /** Reports every key that is not allowed here, with a suggestion. Call once, after the id is known. */
    void rejectUnknownKeys() {
        for (ConfigNode.Entry entry : mapping.entries()) {
            if (!allowed.contains(entry.key())) {
                problems.add(entry.keyPosition(), "unknown key '" + entry.key() + "' in " + context + ": expected "
                        + oneOf(allowed) + Suggestions.didYouMean(entry.key(), allowed));
            }
        }
    }

    boolean has(String key) {
        return mapping.get(key).isPresent();
    }

    /** The position of the value of {@code key}, or of the mapping when it is absent. */
    SourcePosition valuePosition(String key) {
        return mapping.get(key).map(ConfigNode::position).orElse(mapping.position());
    }

    SourcePosition keyPosition(String key) {
        return mapping.entry(key).map(ConfigNode.Entry::keyPosition).orElse(mapping.position());
    }

    Optional<ConfigNode> node(String key, boolean required) {
        Optional<ConfigNode> value = mapping.get(key);
        if (value.isEmpty()) {
            if (required) {
                problems.add(mapping.position(), "missing required key '" + key + "' in " + context);
            }
            return Optional.empty();
        }
        positions.put(key, value.get().position());
        return value;
    }

    Optional<ConfigNode.Scalar> scalar(String key, boolean required, String expected) {
        Optional<ConfigNode> value = node(key, required);
        if (value.isEmpty()) {
            return Optional.empty();
        }
        if (value.get() instanceof ConfigNode.Scalar scalar && !scalar.isNull() && !scalar.text().isBlank()) {
            return Optional.of(scalar);
        }
        wrongType(key, value.get(), expected);
        return Optional.empty();
    }

    Optional<String> text(String key, boolean required) {
        return scalar(key, required, "a text").map(ConfigNode.Scalar::text);
    }

    /** An id: a text without spaces, as used in references, topics and journal records. */
    Optional<String> id(String key, boolean required) {
        Optional<ConfigNode.Scalar> scalar = scalar(key, required, "an id");
        if (scalar.isPresent() && !validId(scalar.get().text())) {
            problems.add(scalar.get().position(), "'" + key + "' in " + context + " must be an id of letters, digits, "
                    + "'-', '_' and '.', found '" + scalar.get().text() + "'");
            return Optional.empty();
        }
        return scalar.map(ConfigNode.Scalar::text);
    }

    Optional<Duration> duration(String key, boolean required) {
        Optional<ConfigNode.Scalar> scalar = scalar(key, required, "a duration such as 30s, 5min or 2h");
        if (scalar.isEmpty()) {
            return Optional.empty();
        }
        try {
            Duration duration = DurationSyntax.parse(scalar.get().text());
            return Optional.of(duration);
        } catch (IllegalArgumentException e) {
            problems.add(scalar.get().position(), "'" + key + "' in " + context + ": " + e.getMessage());
            return Optional.empty();
        }
    }

    /** A local time of day written {@code HH:MM} (24-hour clock), e.g. {@code 07:00}. */
    Optional<LocalTime> timeOfDay(String key, boolean required) {
        Optional<ConfigNode.Scalar> scalar = scalar(key, required, "a time of day such as 07:00");
        if (scalar.isEmpty()) {
            return Optional.empty();
        }
        String text = scalar.get().text().strip();
        Matcher matcher = TIME_OF_DAY.matcher(text);
        if (matcher.matches()) {
            int hours = Integer.parseInt(matcher.group(1));
            int minutes = Integer.parseInt(matcher.group(2));
            if (hours < 24 && minutes < 60) {
                return Optional.of(LocalTime.of(hours, minutes));
            }
        }
        problems.add(scalar.get().position(), "'" + key + "' in " + context + " must be a local time of day HH:MM "
                + "on the 24-hour clock (00:00 to 23:59), such as 07:00, found '" + text + "'");
        return Optional.empty();
    }

    /** A time-zone region of the tz database, e.g. {@code Europe/Berlin}; never the machine's default. */
    Optional<ZoneId> zone(String key, boolean required) {
        Optional<ConfigNode.Scalar> scalar = scalar(key, required, "a time zone such as Europe/Berlin");
        if (scalar.isEmpty()) {
            return Optional.empty();
        }
        String text = scalar.get().text().strip();
        if (ZoneId.getAvailableZoneIds().contains(text) || text.equals("UTC")) {
            return Optional.of(ZoneId.of(text));
        }
        problems.add(scalar.get().position(), "unknown time zone '" + text + "' in " + context + ": expected a "
                + "region of the tz database such as Europe/Berlin or America/Chicago"
                + Suggestions.didYouMean(text, new java.util.TreeSet<>(ZoneId.getAvailableZoneIds())));
        return Optional.empty();
    }

    /** A whole number of at least {@code min}. */
    Optional<Integer> count(String key, boolean required, int min) {
        Optional<ConfigNode.Scalar> scalar = scalar(key, required, "a whole number");
        if (scalar.isEmpty()) {
            return Optional.empty();
        }
        String text = scalar.get().text().strip();
        if (text.matches("\\d{1,6}") && Integer.parseInt(text) >= min) {
            return Optional.of(Integer.parseInt(text));
        }
        problems.add(scalar.get().position(), "'" + key + "' in " + context + " must be a whole number of at least "
                + min + ", found '" + text + "'");
        return Optional.empty();
    }

    Optional<Quantity> quantity(String key, boolean required) {
        Optional<ConfigNode.Scalar> scalar = scalar(key, required, "a quantity with its unit, e.g. 19.5 %vol");
        if (scalar.isEmpty()) {
            return Optional.empty();
        }
        return Fields.quantity(scalar.get(), "'" + key + "' in " + context, problems);
    }

    /**
     * A quantity, or a bare number meaning a plain number (unit {@code 1}), for set points on channels without
     * a unit (a key switch, a relay state). A bare number on a channel with a unit is reported by the checks
     * across files, which know the channel.
     */
    Optional<Quantity> quantityOrPlain(String key, boolean required) {
        Optional<ConfigNode.Scalar> scalar = scalar(key, required, "a quantity with its unit, e.g. 19.5 %vol");
        if (scalar.isEmpty()) {
            return Optional.empty();
        }
        if (Units.isBareNumber(scalar.get().text())) {
            return Optional.of(Quantity.of(Double.parseDouble(scalar.get().text().strip()), Unit.ONE));
        }
        return Fields.quantity(scalar.get(), "'" + key + "' in " + context, problems);
    }

    static Optional<Quantity> quantity(ConfigNode.Scalar scalar, String where, Problems problems) {
        try {
            return Optional.of(Quantity.parse(scalar.text()));
        } catch (IllegalArgumentException e) {
            problems.add(scalar.position(), where + ": " + e.getMessage());
            return Optional.empty();
        }
    }

    Optional<Double> number(String key, boolean required) {
        Optional<ConfigNode.Scalar> scalar = scalar(key, required, "a number");
        if (scalar.isEmpty()) {
            return Optional.empty();
        }
        return Fields.number(scalar.get(), "'" + key + "' in " + context, problems);
    }

    static Optional<Double> number(ConfigNode node, String where, Problems problems) {
        if (node instanceof ConfigNode.Scalar scalar && !scalar.isNull()) {
            String text = scalar.text().strip();
            if (NUMBER.matcher(text).matches()) {
                return Optional.of(Double.parseDouble(text));
            }
            String hint = text.equals("true") || text.equals("false") ? " (write 1 for on, 0 for off)" : "";
            problems.add(scalar.position(), where + " must be a number, found '" + text + "'" + hint);
            return Optional.empty();
        }
        problems.add(node.position(), where + " must be a number, found " + found(node));
        return Optional.empty();
    }

    Optional<Boolean> bool(String key) {
        Optional<ConfigNode.Scalar> scalar = scalar(key, false, "true or false");
        if (scalar.isEmpty()) {
            return Optional.empty();
        }
        switch (scalar.get().text()) {
            case "true":
            case "True":
            case "TRUE":
                return Optional.of(true);
            case "false":
            case "False":
            case "FALSE":
                return Optional.of(false);
            default:
                problems.add(scalar.get().position(), "'" + key + "' in " + context + " must be true or false, found '"
                        + scalar.get().text() + "'");
                return Optional.empty();
        }
    }

    /** One word of a closed set, e.g. a priority; reports the words allowed and a suggestion. */
    Optional<String> word(String key, boolean required, List<String> words, String what) {
        Optional<ConfigNode.Scalar> scalar = scalar(key, required, what);
        if (scalar.isEmpty()) {
            return Optional.empty();
        }
        String text = scalar.get().text();
        if (words.contains(text)) {
            return Optional.of(text);
        }
        problems.add(scalar.get().position(), "unknown " + what + " '" + text + "' in " + context + ": expected "
                + oneOf(words) + Suggestions.didYouMean(text, words));
        return Optional.empty();
    }

    Optional<ConfigNode.Sequence> list(String key, boolean required, String expected) {
        Optional<ConfigNode> value = node(key, required);
        if (value.isEmpty()) {
            return Optional.empty();
        }
        if (value.get() instanceof ConfigNode.Sequence sequence) {
            return Optional.of(sequence);
        }
        wrongType(key, value.get(), expected);
        return Optional.empty();
    }

    Optional<ConfigNode.Mapping> mapping(String key, boolean required, String expected) {
        Optional<ConfigNode> value = node(key, required);
        if (value.isEmpty()) {
            return Optional.empty();
        }
        if (value.get() instanceof ConfigNode.Mapping nested) {
            return Optional.of(nested);
        }
        wrongType(key, value.get(), expected);
        return Optional.empty();
    }

    /** A list of ids (channel or alarm references); each item's position is recorded as {@code key[i]}. */
    Optional<List<String>> ids(String key, boolean required, String expected) {
        Optional<ConfigNode.Sequence> list = list(key, required, expected);
        if (list.isEmpty()) {
            return Optional.empty();
        }
        List<String> ids = new ArrayList<>();
        boolean complete = true;
        List<ConfigNode> items = list.get().items();
        for (int i = 0; i < items.size(); i++) {
            ConfigNode item = items.get(i);
            if (item instanceof ConfigNode.Scalar scalar && !scalar.isNull() && validId(scalar.text())) {
                ids.add(scalar.text());
                positions.put(key + "[" + i + "]", item.position());
            } else {
                problems.add(item.position(), "items of '" + key + "' in " + context + " must be ids, found "
                        + found(item));
                complete = false;
            }
        }
        return complete ? Optional.of(ids) : Optional.empty();
    }

    void wrongType(String key, ConfigNode value, String expected) {
        problems.add(value.position(), "'" + key + "' in " + context + " must be " + expected + ", found "
                + found(value));
    }

    static boolean validId(String text) {
        return text.matches("[A-Za-z0-9][A-Za-z0-9._-]*");
    }

    /** How a node is described in messages: {@code 'text'}, {@code nothing}, {@code a list}, {@code a mapping}. */
    static String found(ConfigNode node) {
        if (node instanceof ConfigNode.Scalar scalar) {
            return scalar.isNull() || scalar.text().isBlank() ? "nothing" : "'" + scalar.text() + "'";
        }
        return node instanceof ConfigNode.Sequence ? "a list" : "a mapping";
    }

    static String oneOf(List<String> words) {
        if (words.size() == 1) {
            return "'" + words.get(0) + "'";
        }
        if (words.size() == 2) {
            return words.get(0) + " or " + words.get(1);
        }
        return "one of " + String.join(", ", words);
    }
}
