package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * Everything the engine must remember across a restart: each alarm's lifecycle state, each interlock's latched
 * trip and bypass, and each fill's lockout. The daemon's journal stores it; {@link Engine#restore(EngineSnapshot)}
 * brings it back before the first reading, so that after {@code kill -9} unacknowledged alarms, latched trips and
 * fill lockouts are still there.
 */
public record EngineSnapshot(Instant taken, List<AlarmRecord> alarms, List<InterlockRecord> interlocks,
        List<FillRecord> fills) {

    public EngineSnapshot {
        Objects.requireNonNull(taken, "taken");
        alarms = List.copyOf(alarms);
        interlocks = List.copyOf(interlocks);
        fills = List.copyOf(fills);
    }

    /** A snapshot without fill controllers (as taken before they existed). */
    public EngineSnapshot(Instant taken, List<AlarmRecord> alarms, List<InterlockRecord> interlocks) {
        this(taken, alarms, interlocks, List.of());
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

    /**
     * One fill controller.
     *
     * @param lockedOut whether it was locked out (it stays locked out after the restart)
     * @param since     when it entered its state
     * @param lockout   the cause of the lockout, when locked out
     * @param valveOpen whether its valve was open (after the restart it is closed until the controller decides)
     */
    public record FillRecord(String id, boolean lockedOut, Instant since, Optional<String> lockout,
            boolean valveOpen) {

        public FillRecord {
            Objects.requireNonNull(id, "id");
            Objects.requireNonNull(since, "since");
            Objects.requireNonNull(lockout, "lockout");
        }
    }
}
