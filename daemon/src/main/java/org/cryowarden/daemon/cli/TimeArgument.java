package org.cryowarden.daemon.cli;

import java.time.Duration;
import java.time.Instant;
import java.time.format.DateTimeParseException;
import java.util.Optional;
import org.cryowarden.rules.DurationSyntax;

/** The instants and durations of the history commands' options, with messages that say which option and what. */
final class TimeArgument {

    private TimeArgument() {
    }

    /** An ISO-8601 UTC instant such as {@code 2025-01-15T22:00:00Z}; empty when the option was not given. */
    static Optional<Instant> parse(String option, String text) {
        if (text == null) {
            return Optional.empty();
        }
        try {
            return Optional.of(Instant.parse(text.strip()));
        } catch (DateTimeParseException e) {
            throw new IllegalArgumentException(option + " must be a UTC time such as 2025-01-15T22:00:00Z, got '"
                    + text + "'");
        }
    }

    /** A positive duration such as {@code 10s} or {@code 1min}. */
    static Duration duration(String option, String text) {
        Duration duration;
        try {
            duration = DurationSyntax.parse(text.strip());
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException(option + ": " + e.getMessage());
        }
        if (duration.isNegative() || duration.isZero()) {
            throw new IllegalArgumentException(option + " must be a positive duration such as 1min, got '" + text
                    + "'");
        }
        return duration;
    }
}
