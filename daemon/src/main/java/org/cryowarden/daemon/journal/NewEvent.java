package org.cryowarden.daemon.journal;

import java.time.Instant;
import java.util.Objects;
import java.util.Optional;

/**
 * An event to append to the journal; the journal gives it its sequence number.
 *
 * @param kind        what happened, e.g. {@code alarm.raised}, {@code interlock.trip}, {@code operator.ack}
 * @param at          wall-clock instant of the event (UTC)
 * @param subject     the alarm, interlock or channel id it concerns, if any
 * @param operator    who did it, for operator actions
 * @param payloadJson the event itself as a JSON document (the engine's own form)
 */
public record NewEvent(String kind, Instant at, Optional<String> subject, Optional<String> operator,
                       String payloadJson) {

    public NewEvent {
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(at, "at");
        Objects.requireNonNull(subject, "subject");
        Objects.requireNonNull(operator, "operator");
        Objects.requireNonNull(payloadJson, "payloadJson");
        if (kind.isBlank()) {
            throw new IllegalArgumentException("event kind must not be blank");
        }
    }

    /** An event about {@code subject} with no operator (the engine's own transitions). */
    public static NewEvent about(String kind, Instant at, String subject, String payloadJson) {
        return new NewEvent(kind, at, Optional.of(subject), Optional.empty(), payloadJson);
    }

    /** An operator's action on {@code subject}. */
    public static NewEvent byOperator(String kind, Instant at, String subject, String operator, String payloadJson) {
        return new NewEvent(kind, at, Optional.of(subject), Optional.of(operator), payloadJson);
    }

    /** Words for error messages: "event alarm.raised for o2-low". */
    String describe() {
        return "event " + kind + subject.map(s -> " for " + s).orElse("");
    }
}
