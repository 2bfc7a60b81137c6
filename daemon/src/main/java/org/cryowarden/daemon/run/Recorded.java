package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.List;
import java.util.Map;
import java.util.OptionalLong;

/**
 * Events as the journal recorded them, with their sequence numbers (empty where the journal failed), and the alarm
 * documents the same engine call changed.
 */
public record Recorded(List<DaemonEvent> events, List<OptionalLong> seqs, Map<String, ObjectNode> alarms) {

    public Recorded {
        events = List.copyOf(events);
        seqs = List.copyOf(seqs);
        alarms = Map.copyOf(alarms);
    }
}
