package org.cryowarden.daemon.replay;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import org.cryowarden.rules.engine.AlarmState;
import org.cryowarden.rules.model.Priority;

/** Hand-built alarm change lists for the analysis and comparison tests, with times as "HH:MM:SS" on one day. */
final class Changes {

    static final Instant DAY = Instant.parse("2025-01-15T00:00:00Z");

    private final List<AlarmChange> changes = new ArrayList<>();

    Changes change(String time, String alarm, AlarmState from, AlarmState to) {
        changes.add(new AlarmChange(at(time), alarm, from, to, Priority.HIGH));
        return this;
    }

    /** normal -> active-unacknowledged. */
    Changes raise(String time, String alarm) {
        return change(time, alarm, AlarmState.NORMAL, AlarmState.UNACKNOWLEDGED);
    }

    /** active-unacknowledged -> returned-unacknowledged. */
    Changes clear(String time, String alarm) {
        return change(time, alarm, AlarmState.UNACKNOWLEDGED, AlarmState.RETURNED_UNACKNOWLEDGED);
    }

    /** One activation from {@code start} to {@code end}, as raise then return to normal. */
    Changes active(String start, String end, String alarm) {
        raise(start, alarm);
        return change(end, alarm, AlarmState.UNACKNOWLEDGED, AlarmState.NORMAL);
    }

    List<AlarmChange> list() {
        return List.copyOf(changes);
    }

    static Instant at(String time) {
        return Instant.parse("2025-01-15T" + time + "Z");
    }
}
