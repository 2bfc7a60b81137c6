package org.cryowarden.daemon.replay;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.engine.AlarmState;
import org.cryowarden.rules.engine.AlarmTransition;
import org.cryowarden.rules.engine.EngineEvent;
import org.cryowarden.rules.model.Priority;

/**
 * The part of an alarm transition the analysis needs: built from engine events, or from journal records that keep
 * the same facts.
 */
public record AlarmChange(Instant instant, String alarmId, AlarmState from, AlarmState to, Priority priority) {

    public AlarmChange {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(alarmId, "alarmId");
        Objects.requireNonNull(from, "from");
        Objects.requireNonNull(to, "to");
        Objects.requireNonNull(priority, "priority");
    }

    /** The alarm transitions among {@code events}, in their order. */
    public static List<AlarmChange> of(List<? extends EngineEvent> events) {
        List<AlarmChange> changes = new ArrayList<>();
        for (EngineEvent event : events) {
            if (event instanceof AlarmTransition t) {
                changes.add(new AlarmChange(t.instant(), t.alarmId(), t.from(), t.to(), t.priority()));
            }
        }
        return changes;
    }

    /** Whether this change annunciates the alarm: it enters an active state from one that is not. */
    boolean activates() {
        return !active(from) && active(to);
    }

    /** Whether this change ends an annunciation. */
    boolean deactivates() {
        return active(from) && !active(to);
    }

    /**
     * Active for the analysis: annunciated, acknowledged or not (a latching alarm stays so until acknowledged).
     * Shelved, suppressed and out-of-service alarms are not annunciated, so they do not count.
     */
    static boolean active(AlarmState state) {
        return state == AlarmState.UNACKNOWLEDGED || state == AlarmState.ACKNOWLEDGED;
    }
}
