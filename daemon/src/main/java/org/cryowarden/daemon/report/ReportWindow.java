package org.cryowarden.daemon.report;

import java.time.Duration;
import java.time.Instant;
import java.time.LocalDateTime;
import java.time.OffsetDateTime;
import java.time.ZoneId;
import java.time.format.DateTimeParseException;
import java.util.Objects;

/** The period a report covers, {@code [from, until)}, in wall-clock time (UTC instants). */
public record ReportWindow(Instant from, Instant until) {

    public ReportWindow {
        Objects.requireNonNull(from, "from");
        Objects.requireNonNull(until, "until");
        if (!until.isAfter(from)) {
            throw new IllegalArgumentException("the report period must end after it starts, got " + from + " to "
                    + until);
        }
    }

    public Duration length() {
        return Duration.between(from, until);
    }

    /**
     * Reads a {@code --since}/{@code --until} value: an instant with an offset ({@code 2025-11-14T22:00:00Z},
     * {@code 2025-11-14T23:00+01:00}) or a local date and time ({@code 2025-11-14T22:00}) in {@code zone}.
     *
     * @throws IllegalArgumentException saying what was found and what is expected
     */
    public static Instant parseTime(String text, ZoneId zone) {
        String trimmed = text.strip();
        try {
            return OffsetDateTime.parse(trimmed).toInstant();
        } catch (DateTimeParseException e) {
            // not with an offset; try a local date-time below
        }
        try {
            return LocalDateTime.parse(trimmed).atZone(zone).toInstant();
        } catch (DateTimeParseException e) {
            throw new IllegalArgumentException("'" + text + "' is not a date and time; write it as 2025-11-14T22:00"
                    + " (in " + (zone.normalized().equals(java.time.ZoneOffset.UTC) ? "UTC" : zone.getId()) + ") or 2025-11-14T22:00:00Z");
        }
    }
}
