package org.cryowarden.rules;

import java.time.Duration;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * The duration syntax of every cryowarden file and command: a number and a unit, optionally several in a row
 * ({@code 250ms}, {@code 30s}, {@code 5min}, {@code 2h}, {@code 1d}, {@code 1h30min}).
 */
public final class DurationSyntax {

    private static final Pattern PART = Pattern.compile("(\\d+(?:\\.\\d+)?)\\s*(ms|s|min|h|d)");

    /** Longest duration accepted, 100 years of 365.25 days: beyond that a number is a typing error. */
    private static final double MAX_NANOS = 100 * 365.25 * 86400e9;

    private DurationSyntax() {
    }

    /**
     * Parses a duration.
     *
     * @throws IllegalArgumentException naming the text and the accepted forms
     */
    public static Duration parse(String text) {
        String compact = text.strip();
        if (compact.isEmpty()) {
            throw new IllegalArgumentException("empty duration: expected e.g. 30s, 5min, 2h");
        }
        Matcher matcher = PART.matcher(compact);
        long nanos = 0;
        int position = 0;
        while (position < compact.length()) {
            if (Character.isWhitespace(compact.charAt(position))) {
                position++;
                continue;
            }
            // lookingAt on a region, not find(position): find scans every later start, quadratic in a long
            // run of digits without a unit.
            matcher.region(position, compact.length());
            if (!matcher.lookingAt()) {
                throw new IllegalArgumentException("'" + text + "' is not a duration: expected a number and one of "
                        + "ms, s, min, h, d, e.g. 30s, 5min, 2h or 1h30min");
            }
            double amount = Double.parseDouble(matcher.group(1));
            double partNanos = amount * nanosPer(matcher.group(2));
            if (partNanos >= MAX_NANOS || nanos + partNanos >= MAX_NANOS) {
                throw new IllegalArgumentException("'" + text + "' is too long a duration: at most 100 years");
            }
            nanos += Math.round(partNanos);
            position = matcher.end();
        }
        return Duration.ofNanos(nanos);
    }

    /** The shortest exact form in this syntax: 90 s prints as {@code 1min30s}, 1.5 s as {@code 1s500ms}. */
    public static String format(Duration duration) {
        if (duration.isZero()) {
            return "0s";
        }
        StringBuilder text = new StringBuilder();
        Duration rest = duration;
        if (rest.isNegative()) {
            text.append('-');
            rest = rest.negated();
        }
        long days = rest.toDays();
        long hours = rest.toHoursPart();
        long minutes = rest.toMinutesPart();
        long seconds = rest.toSecondsPart();
        long millis = rest.toMillisPart();
        append(text, days, "d");
        append(text, hours, "h");
        append(text, minutes, "min");
        append(text, seconds, "s");
        append(text, millis, "ms");
        if (text.length() == 0 || text.toString().equals("-")) {
            text.append(rest.toNanos()).append("ns");
        }
        return text.toString();
    }

    private static void append(StringBuilder text, long amount, String unit) {
        if (amount != 0) {
            text.append(amount).append(unit);
        }
    }

    private static double nanosPer(String unit) {
        switch (unit) {
            case "ms":
                return 1e6;
            case "s":
                return 1e9;
            case "min":
                return 60e9;
            case "h":
                return 3600e9;
            case "d":
                return 86400e9;
            default:
                throw new IllegalStateException("unit " + unit);
        }
    }
}
