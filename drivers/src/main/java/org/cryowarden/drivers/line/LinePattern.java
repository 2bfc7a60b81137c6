package org.cryowarden.drivers.line;

import java.util.Objects;
import java.util.Optional;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.regex.PatternSyntaxException;
import org.cryowarden.drivers.text.Printable;

/**
 * The line protocol for simple devices: a regular expression with a named group {@code value} picks the number
 * out of a line ("O2=20.8%" with {@code O2=(?<value>[0-9.]+)%}). No I/O; the simulator formats lines that this
 * parses.
 */
public final class LinePattern {

    /** The name of the group that must hold the number. */
    public static final String VALUE_GROUP = "value";

    private static final Pattern NUMBER = Pattern.compile("[+-]?(\\d+(\\.\\d*)?|\\.\\d+)([eE][+-]?\\d+)?");

    private final Pattern pattern;

    private LinePattern(Pattern pattern) {
        this.pattern = pattern;
    }

    /** Compiles a pattern, or says in one sentence why it cannot be used. */
    public static Result compile(String regex) {
        Objects.requireNonNull(regex, "regex");
        Pattern compiled;
        try {
            compiled = Pattern.compile(regex);
        } catch (PatternSyntaxException e) {
            return new Result(Optional.empty(), "is not a valid regular expression: " + e.getDescription()
                    + " near index " + e.getIndex());
        }
        if (!hasValueGroup(regex)) {
            return new Result(Optional.empty(), "has no named group 'value' (write (?<value>...) around the number)");
        }
        return new Result(Optional.of(new LinePattern(compiled)), "");
    }

    private static boolean hasValueGroup(String regex) {
        // Java 17 has no Pattern.namedGroups(): match the empty string through an added empty alternative and
        // ask the matcher for the group, which throws only when no group of that name exists.
        Matcher probe = Pattern.compile("(?:" + regex + ")|").matcher("");
        probe.lookingAt();
        try {
            probe.group(VALUE_GROUP);
            return true;
        } catch (IllegalArgumentException e) {
            return false;
        }
    }

    /** The outcome of {@link #compile}: a pattern, or the reason there is none. */
    public record Result(Optional<LinePattern> pattern, String problem) {
    }

    public String regex() {
        return pattern.pattern();
    }

    /** What the line says; never throws on device text. */
    public LineMatch match(String line) {
        Matcher matcher = pattern.matcher(line);
        try {
            if (!matcher.find()) {
                return new LineMatch.NoMatch(line);
            }
        } catch (StackOverflowError tooDeep) {
            // A site's own pattern such as (\d|\.)+ recurses once per character in java.util.regex; on a long
            // line that overflows the stack. The line cannot be matched by this pattern: say so, keep polling.
            return new LineMatch.NoMatch(line);
        }
        String text = matcher.group(VALUE_GROUP);
        if (text == null) {
            return new LineMatch.NoMatch(line);
        }
        String trimmed = text.strip();
        if (trimmed.length() > 64 || !NUMBER.matcher(trimmed).matches()) {
            return new LineMatch.NotANumber(text);
        }
        double value = Double.parseDouble(trimmed);
        if (!Double.isFinite(value)) {
            return new LineMatch.NotANumber(text);
        }
        return new LineMatch.Value(value);
    }

    /** What a line said. */
    public sealed interface LineMatch {
        record Value(double value) implements LineMatch {
        }

        record NoMatch(String line) implements LineMatch {
            @Override
            public String toString() {
                return "line '" + Printable.of(line) + "' does not match";
            }
        }

        record NotANumber(String text) implements LineMatch {
        }
    }
}
