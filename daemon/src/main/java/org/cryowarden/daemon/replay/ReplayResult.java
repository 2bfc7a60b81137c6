package org.cryowarden.daemon.replay;

import java.util.List;
import org.cryowarden.rules.engine.EngineEvent;

/**
 * What a replay produced.
 *
 * @param events   every engine event, in the order the engine emitted them
 * @param readings how many readings were fed
 * @param ticks    how many clock ticks were given
 * @param refusals the operator actions the replayed engine refused, each with the engine's reason (e.g. an
 *                 acknowledgement of an alarm the changed rules never raised)
 */
public record ReplayResult(List<EngineEvent> events, long readings, long ticks, List<String> refusals) {

    public ReplayResult {
        events = List.copyOf(events);
        refusals = List.copyOf(refusals);
    }

    /** The alarm changes among the events. */
    public List<AlarmChange> alarmChanges() {
        return AlarmChange.of(events);
    }
}
