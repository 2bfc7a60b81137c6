package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.model.Priority;

/**
 * An alarm changed state.
 *
 * @param alarmId  the alarm (the rule's id)
 * @param reading  the reading that caused the transition, when a reading did (not for acknowledgements, shelving
 *                 expiry or a stale timeout)
 * @param operator who caused it, for operator actions (acknowledge, shelve, ...)
 * @param note     the operator's note or reason; empty when none
 */
public record AlarmTransition(
        Instant instant,
        String alarmId,
        AlarmState from,
        AlarmState to,
        Priority priority,
        String message,
        Optional<Reading> reading,
        Optional<String> operator,
        String note,
        String cause) implements EngineEvent {

    public AlarmTransition {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(alarmId, "alarmId");
        Objects.requireNonNull(from, "from");
        Objects.requireNonNull(to, "to");
        Objects.requireNonNull(priority, "priority");
        Objects.requireNonNull(message, "message");
        Objects.requireNonNull(reading, "reading");
        Objects.requireNonNull(operator, "operator");
        Objects.requireNonNull(note, "note");
        Objects.requireNonNull(cause, "cause");
    }
}
