package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * Everything the engine must remember across a restart: each alarm's lifecycle state and each interlock's latched
 * trip and bypass. The daemon's journal stores it; {@link Engine#restore(EngineSnapshot)} brings it back before the
 * first reading, so that after {@code kill -9} unacknowledged alarms and latched trips are still there.
 */
public record EngineSnapshot(Instant taken, List<AlarmRecord> alarms, List<InterlockRecord> interlocks) {

    public EngineSnapshot {
        Objects.requireNonNull(taken, "taken");
        alarms = List.copyOf(alarms);
        interlocks = List.copyOf(interlocks);
    }

    /**
     * One alarm.
     *
     * @param conditionActive the rule's condition (after delays) when the snapshot was taken
     * @param unacknowledged  whether an acknowledgement was awaited
     */
    public record AlarmRecord(
            String id,
            AlarmState state,
            Instant since,
            boolean conditionActive,
            boolean unacknowledged,
            Optional<String> acknowledgedBy,
            String acknowledgeNote,
            Optional<Shelving> shelving,
            Optional<String> outOfServiceBy,
            String outOfServiceReason) {

        public AlarmRecord {
            Objects.requireNonNull(id, "id");
            Objects.requireNonNull(state, "state");
            Objects.requireNonNull(since, "since");
            Objects.requireNonNull(acknowledgedBy, "acknowledgedBy");
            Objects.requireNonNull(acknowledgeNote, "acknowledgeNote");
            Objects.requireNonNull(shelving, "shelving");
            Objects.requireNonNull(outOfServiceBy, "outOfServiceBy");
            Objects.requireNonNull(outOfServiceReason, "outOfServiceReason");
        }
    }

    /** One interlock: its latched trip (with the alarms that caused it) and its bypass. */
    public record InterlockRecord(
            String id, boolean tripped, Optional<Instant> trippedAt, List<String> causes, Optional<Bypass> bypass) {

        public InterlockRecord {
            Objects.requireNonNull(id, "id");
            Objects.requireNonNull(trippedAt, "trippedAt");
            causes = List.copyOf(causes);
            Objects.requireNonNull(bypass, "bypass");
        }
    }
}
