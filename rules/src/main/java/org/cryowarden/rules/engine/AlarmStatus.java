package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.model.Priority;

/**
 * One alarm as the alarm list shows it.
 *
 * @param conditionActive whether the rule's condition is active now (after on- and off-delays), whatever the state
 * @param lastReading     the latest reading the rule evaluated, for its value, unit and quality
 */
public record AlarmStatus(
        String id,
        AlarmState state,
        Priority priority,
        String message,
        Instant since,
        boolean conditionActive,
        Optional<Reading> lastReading,
        Optional<String> acknowledgedBy,
        Optional<Shelving> shelving) {

    public AlarmStatus {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(state, "state");
        Objects.requireNonNull(priority, "priority");
        Objects.requireNonNull(message, "message");
        Objects.requireNonNull(since, "since");
        Objects.requireNonNull(lastReading, "lastReading");
        Objects.requireNonNull(acknowledgedBy, "acknowledgedBy");
        Objects.requireNonNull(shelving, "shelving");
    }
}
