package org.cryowarden.drivers.builtin;

import org.cryowarden.drivers.spi.FaultCounters;
import org.cryowarden.drivers.text.Printable;
import org.cryowarden.drivers.text.TextExchange;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import java.time.Instant;
import java.time.Duration;

/** Readings for the ways a text reply can fail, shared by the SCPI and line drivers. */
final class TextReplies {

    private TextReplies() {
    }

    /** A reading for a receive that gave no line, counting it; the caller handles {@code Received.Line}. */
    static Reading failed(String channel, Unit unit, Instant now, TextExchange.Received received, String asked,
            Duration timeout, FaultCounters counters) {
        if (received instanceof TextExchange.Received.Oversized oversized) {
            counters.increment("oversized_line");
            return Reading.bad(channel, unit, now, "reply to " + asked + " longer than " + oversized.limit()
                    + " bytes (" + oversized.droppedBytes() + " dropped)");
        }
        TextExchange.Received.Timeout timedOut = (TextExchange.Received.Timeout) received;
        if (timedOut.partial().isPresent()) {
            counters.increment("partial_line");
            return Reading.bad(channel, unit, now, "partial reply to " + asked + " without terminator after "
                    + timeout.toMillis() + " ms: '" + Printable.of(timedOut.partial().get()) + "'");
        }
        counters.increment("timeout");
        return new Reading(channel, Double.NaN, unit, now, Quality.STALE, "no reply to " + asked + " within "
                + timeout.toMillis() + " ms");
    }
}
