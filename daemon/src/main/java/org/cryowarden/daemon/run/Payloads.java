package org.cryowarden.daemon.run;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.time.Instant;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.engine.AlarmStatus;
import org.cryowarden.rules.engine.EngineSnapshot;
import org.cryowarden.rules.engine.InterlockStatus;
import org.cryowarden.rules.model.Priority;

/**
 * The JSON documents cryowarden publishes and serves (MQTT payloads, API bodies): every value with its unit and
 * quality, every instant ISO-8601 in UTC, every word lower-case with dashes.
 */
public final class Payloads {

    /** One mapper for the program; thread-safe once configured. */
    public static final ObjectMapper JSON = new ObjectMapper();

    private Payloads() {
    }

    public static String text(ObjectNode node) {
        try {
            return JSON.writeValueAsString(node);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("cannot write JSON", e);
        }
    }

    public static ObjectNode object() {
        return JSON.createObjectNode();
    }

    /** {@code <prefix>/reading/<channel>}. */
    public static ObjectNode reading(Reading reading) {
        ObjectNode node = object();
        node.put("channel", reading.channel());
        if (Double.isFinite(reading.value())) {
            node.put("value", reading.value());
        } else {
            node.putNull("value");
        }
        node.put("unit", reading.unit().symbol());
        node.put("quality", quality(reading.quality()));
        node.put("reason", reading.reason());
        node.put("time", reading.timestamp().toString());
        return node;
    }

    public static String quality(Quality quality) {
        return quality.name().toLowerCase(java.util.Locale.ROOT);
    }

    /** {@code <prefix>/alarm/<alarm>}: the alarm's lifecycle state and what triggered it. */
    public static ObjectNode alarm(AlarmStatus status, Optional<EngineSnapshot.AlarmRecord> record) {
        ObjectNode node = object();
        node.put("alarm", status.id());
        node.put("state", status.state().wire());
        node.put("priority", status.priority().word());
        node.put("message", status.message());
        node.put("condition_active", status.conditionActive());
        node.put("since", status.since().toString());
        status.lastReading().ifPresentOrElse(r -> {
            if (Double.isFinite(r.value())) {
                node.put("value", r.value());
            } else {
                node.putNull("value");
            }
            node.put("unit", r.unit().symbol());
            node.put("quality", quality(r.quality()));
            node.put("channel", r.channel());
        }, () -> node.putNull("value"));
        putOptional(node, "acknowledged_by", status.acknowledgedBy());
        putOptional(node, "note", record.map(EngineSnapshot.AlarmRecord::acknowledgeNote).filter(n -> !n.isEmpty()));
        status.shelving().ifPresentOrElse(s -> {
            node.put("shelved_until", s.until().toString());
            node.put("shelved_by", s.operator());
            node.put("shelve_reason", s.reason());
        }, () -> node.putNull("shelved_until"));
        return node;
    }

    /** One interlock for the API. */
    public static ObjectNode interlock(InterlockStatus status) {
        ObjectNode node = object();
        node.put("interlock", status.id());
        node.put("description", status.description());
        node.put("tripped", status.tripped());
        putOptional(node, "tripped_at", status.trippedAt().map(Instant::toString));
        node.set("causes", JSON.valueToTree(status.causes()));
        status.bypass().ifPresentOrElse(b -> {
            node.put("bypassed_by", b.owner());
            node.put("bypass_reason", b.reason());
            node.put("bypassed_until", b.until().toString());
        }, () -> node.putNull("bypassed_until"));
        return node;
    }

    /**
     * {@code <prefix>/summary}: counts of active and unacknowledged alarms per priority and the highest active
     * priority, for the building alert system. "Active" means the condition is active in any state other than
     * shelved, suppressed or out of service.
     */
    public static ObjectNode summary(List<AlarmView> alarms, Instant at) {
        ObjectNode node = object();
        ObjectNode active = node.putObject("active");
        ObjectNode unacknowledged = node.putObject("unacknowledged");
        Priority highest = null;
        int activeTotal = 0;
        int unackTotal = 0;
        for (Priority priority : Priority.values()) {
            int a = 0;
            int u = 0;
            for (AlarmView alarm : alarms) {
                if (alarm.priority() != priority) {
                    continue;
                }
                if (alarm.active()) {
                    a++;
                }
                if (alarm.unacknowledged()) {
                    u++;
                }
            }
            active.put(priority.word(), a);
            unacknowledged.put(priority.word(), u);
            activeTotal += a;
            unackTotal += u;
            if (a > 0 && highest == null) {
                highest = priority;
            }
        }
        node.put("active_total", activeTotal);
        node.put("unacknowledged_total", unackTotal);
        if (highest == null) {
            node.putNull("highest_active_priority");
        } else {
            node.put("highest_active_priority", highest.word());
        }
        node.put("time", at.toString());
        return node;
    }

    /** The minimum an alarm contributes to the summary. */
    public record AlarmView(String id, Priority priority, boolean active, boolean unacknowledged) {
    }

    /** {@code <prefix>/status}. */
    public static ObjectNode status(String state, String reason, String version, Optional<Instant> started) {
        ObjectNode node = object();
        node.put("state", state);
        node.put("reason", reason);
        node.put("version", version);
        putOptional(node, "started", started.map(Instant::toString));
        return node;
    }

    /** A command reply: {@code {"ok": true}} or {@code {"ok": false, "error": "..."}}. */
    public static ObjectNode reply(Optional<String> error) {
        ObjectNode node = object();
        node.put("ok", error.isEmpty());
        error.ifPresent(e -> node.put("error", e));
        return node;
    }

    static void putOptional(ObjectNode node, String key, Optional<String> value) {
        value.ifPresentOrElse(v -> node.put(key, v), () -> node.putNull(key));
    }
}
