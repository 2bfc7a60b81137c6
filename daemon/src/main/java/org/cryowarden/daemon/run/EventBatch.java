package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.List;
import java.util.Map;

/**
 * What one engine call produced, handed from the engine thread to the journal thread: the events to number and
 * record, the restart facts they changed (journal key to JSON), the alarm documents to publish retained once
 * recorded, and the new summary.
 */
record EventBatch(List<DaemonEvent> events, Map<String, String> states, Map<String, ObjectNode> alarms,
                  ObjectNode summary) {

    EventBatch {
        events = List.copyOf(events);
        states = Map.copyOf(states);
        alarms = Map.copyOf(alarms);
    }
}
