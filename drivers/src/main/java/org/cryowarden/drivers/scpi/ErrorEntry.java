package org.cryowarden.drivers.scpi;

import java.util.Objects;
import java.util.Optional;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * One entry of the SCPI error queue as {@code SYST:ERR?} returns it: {@code <code>,"<text>"}; an empty queue
 * answers {@code 0,"No error"} (SCPI 1999, Volume 2, SYSTem:ERRor subsystem; negative codes are SCPI's own).
 */
public record ErrorEntry(int code, String text) {

    public static final ErrorEntry NO_ERROR = new ErrorEntry(0, "No error");

    // Possessive quantifiers: a plain (?:a|b)* recurses once per character and overflowed the stack on a few
    // thousand characters of error text.
    private static final Pattern FORMAT = Pattern.compile("\\s*([+-]?\\d{1,6})\\s*,\\s*\"((?:[^\"]++|\"\")*+)\"\\s*");

    public ErrorEntry {
        Objects.requireNonNull(text, "text");
    }

    public boolean isNoError() {
        return code == 0;
    }

    /** Parses one response line, or empty when it is not in the error-queue format. */
    public static Optional<ErrorEntry> parse(String response) {
        Matcher matcher = FORMAT.matcher(response);
        if (!matcher.matches()) {
            return Optional.empty();
        }
        return Optional.of(new ErrorEntry(Integer.parseInt(matcher.group(1)), matcher.group(2).replace("\"\"", "\"")));
    }

    /** The response text an instrument sends. */
    public String format() {
        return code + ",\"" + text.replace("\"", "\"\"") + "\"";
    }
}
