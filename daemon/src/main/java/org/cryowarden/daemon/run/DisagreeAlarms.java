package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.engine.AlarmState;
import org.cryowarden.rules.model.Priority;

/**
 * The daemon's own "command disagree" alarms, one per output: raised when a write fails or its readback does not
 * match within the timeout, returned to normal by the next write that agrees, acknowledged like any alarm. Its id
 * is {@code <output>-command-disagree}. Used on the engine thread only.
 */
final class DisagreeAlarms {

    static final String SUFFIX = "-command-disagree";

    private final Map<String, Entry> alarms = new LinkedHashMap<>();

    private static final class Entry {
        AlarmState state = AlarmState.NORMAL;
        Instant since;
        String message = "";
        Optional<String> acknowledgedBy = Optional.empty();
        String note = "";
    }

    boolean knows(String alarmId) {
        return alarms.containsKey(alarmId);
    }

    /** A failed or disagreeing write of {@code output}; empty when the alarm was already active. */
    Optional<DaemonEvent> disagree(String output, String reason, Instant at) {
        String id = output + SUFFIX;
        Entry entry = alarms.computeIfAbsent(id, k -> new Entry());
        entry.message = "Output " + output + " did not take the commanded value: " + reason
                + "; check the device and the wiring";
        if (entry.state == AlarmState.UNACKNOWLEDGED || entry.state == AlarmState.ACKNOWLEDGED) {
            return Optional.empty();
        }
        AlarmState from = entry.state;
        entry.state = AlarmState.UNACKNOWLEDGED;
        entry.since = at;
        entry.acknowledgedBy = Optional.empty();
        entry.note = "";
        return Optional.of(event("alarm.raised", id, from, entry, Optional.empty(), at));
    }

    /** A write of {@code output} that agreed; empty when nothing changes. */
    Optional<DaemonEvent> agree(String output, Instant at) {
        String id = output + SUFFIX;
        Entry entry = alarms.get(id);
        if (entry == null || entry.state == AlarmState.NORMAL || entry.state == AlarmState.RETURNED_UNACKNOWLEDGED) {
            return Optional.empty();
        }
        AlarmState from = entry.state;
        entry.state = from == AlarmState.UNACKNOWLEDGED ? AlarmState.RETURNED_UNACKNOWLEDGED : AlarmState.NORMAL;
        entry.since = at;
        return Optional.of(event("alarm.cleared", id, from, entry, Optional.empty(), at));
    }

    /** Acknowledges; the refusal when there is nothing to acknowledge. */
    String acknowledge(String id, String operator, String note, Instant at, List<DaemonEvent> events) {
        Entry entry = alarms.get(id);
        if (entry == null || !entry.state.awaitsAcknowledgement()) {
            return "alarm " + id + " is " + (entry == null ? "normal" : entry.state.wire())
                    + "; there is nothing to acknowledge";
        }
        AlarmState from = entry.state;
        entry.state = from == AlarmState.UNACKNOWLEDGED ? AlarmState.ACKNOWLEDGED : AlarmState.NORMAL;
        entry.acknowledgedBy = Optional.of(operator);
        entry.note = note;
        entry.since = at;
        events.add(event("alarm.acknowledged", id, from, entry, Optional.of(operator), at));
        return null;
    }

    List<Payloads.AlarmView> views() {
        List<Payloads.AlarmView> views = new ArrayList<>();
        alarms.forEach((id, e) -> views.add(new Payloads.AlarmView(id, Priority.HIGH,
                e.state == AlarmState.UNACKNOWLEDGED || e.state == AlarmState.ACKNOWLEDGED,
                e.state.awaitsAcknowledgement())));
        return views;
    }

    Map<String, ObjectNode> documents() {
        Map<String, ObjectNode> documents = new LinkedHashMap<>();
        alarms.forEach((id, e) -> documents.put(id, document(id, e)));
        return documents;
    }

    ObjectNode document(String id) {
        return document(id, alarms.get(id));
    }

    private static ObjectNode document(String id, Entry e) {
        ObjectNode node = Payloads.object();
        node.put("alarm", id);
        node.put("state", e.state.wire());
        node.put("priority", Priority.HIGH.word());
        node.put("message", e.message);
        node.put("condition_active", e.state == AlarmState.UNACKNOWLEDGED || e.state == AlarmState.ACKNOWLEDGED);
        node.put("since", e.since.toString());
        node.putNull("value");
        Payloads.putOptional(node, "acknowledged_by", e.acknowledgedBy);
        Payloads.putOptional(node, "note", Optional.of(e.note).filter(n -> !n.isEmpty()));
        node.putNull("shelved_until");
        return node;
    }

    private static DaemonEvent event(String kind, String id, AlarmState from, Entry e, Optional<String> operator,
            Instant at) {
        ObjectNode payload = Payloads.object();
        payload.put("cause", e.message);
        payload.put("from", from.wire());
        payload.put("to", e.state.wire());
        payload.put("priority", Priority.HIGH.word());
        payload.put("message", e.message);
        payload.put("note", e.note);
        return new DaemonEvent(kind, at, Optional.of(id), operator, payload);
    }
}
