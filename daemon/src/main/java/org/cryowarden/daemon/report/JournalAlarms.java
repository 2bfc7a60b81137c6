package org.cryowarden.daemon.report;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.replay.AlarmChange;
import org.cryowarden.rules.engine.AlarmState;
import org.cryowarden.rules.model.Priority;

/**
 * Alarm transitions as the journal keeps them: each {@code alarm.*} event carries the states it joins
 * ({@code from}, {@code to}) and the priority, the facts the replay analysis works on.
 */
final class JournalAlarms {

    private static final ObjectMapper JSON = new ObjectMapper();

    private JournalAlarms() {
    }

    /** One alarm event, read. */
    record Transition(JournalEvent event, String alarmId, AlarmState from, AlarmState to, Priority priority,
                      Optional<String> readingChannel) {

        AlarmChange change() {
            return new AlarmChange(event.at(), alarmId, from, to, priority);
        }
    }

    /** The alarm transitions among {@code events}, in order; an event without the states is left out. */
    static List<Transition> transitions(List<JournalEvent> events) {
        List<Transition> result = new ArrayList<>();
        for (JournalEvent event : events) {
            if (!event.kind().startsWith("alarm.") || event.subject().isEmpty()) {
                continue;
            }
            JsonNode payload = payload(event);
            Optional<AlarmState> from = AlarmState.fromWire(payload.path("from").asText(""));
            Optional<AlarmState> to = AlarmState.fromWire(payload.path("to").asText(""));
            Optional<Priority> priority = priority(payload.path("priority").asText(""));
            if (from.isEmpty() || to.isEmpty() || priority.isEmpty()) {
                continue;
            }
            String channel = payload.path("reading").path("channel").asText("");
            result.add(new Transition(event, event.subject().get(), from.get(), to.get(), priority.get(),
                    channel.isEmpty() ? Optional.empty() : Optional.of(channel)));
        }
        return result;
    }

    static List<AlarmChange> changes(List<Transition> transitions) {
        return transitions.stream().map(Transition::change).toList();
    }

    /** The payload as a tree; an unreadable one (never written by cryowarden) as an empty object. */
    static JsonNode payload(JournalEvent event) {
        try {
            return JSON.readTree(event.payloadJson());
        } catch (IOException e) {
            return JSON.createObjectNode();
        }
    }

    private static Optional<Priority> priority(String word) {
        for (Priority p : Priority.values()) {
            if (p.word().equals(word.toLowerCase(Locale.ROOT))) {
                return Optional.of(p);
            }
        }
        return Optional.empty();
    }
}
