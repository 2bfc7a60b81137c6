package org.cryowarden.daemon.run;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.engine.AlarmState;
import org.cryowarden.rules.engine.Bypass;
import org.cryowarden.rules.engine.EngineSnapshot;
import org.cryowarden.rules.engine.Shelving;

/**
 * The engine's restart facts as the JSON kept in the journal's {@code alarm_state} table. Interlocks share that
 * table under the key {@code interlock:<id>} (ids never contain a colon), so one transaction keeps an event and
 * the states it changed in step.
 */
final class SnapshotJson {

    static final String INTERLOCK_KEY = "interlock:";
    /** Fill controllers are stored the same way, under {@code fill:<id>}. */
    static final String FILL_KEY = "fill:";

    private SnapshotJson() {
    }

    static String alarm(EngineSnapshot.AlarmRecord record) {
        ObjectNode node = Payloads.object();
        node.put("id", record.id());
        node.put("state", record.state().wire());
        node.put("since", record.since().toString());
        node.put("condition_active", record.conditionActive());
        node.put("unacknowledged", record.unacknowledged());
        Payloads.putOptional(node, "acknowledged_by", record.acknowledgedBy());
        node.put("acknowledge_note", record.acknowledgeNote());
        record.shelving().ifPresent(s -> {
            ObjectNode shelving = node.putObject("shelving");
            shelving.put("operator", s.operator());
            shelving.put("reason", s.reason());
            shelving.put("until", s.until().toString());
            shelving.put("remaining", s.remaining().toString());
        });
        Payloads.putOptional(node, "out_of_service_by", record.outOfServiceBy());
        node.put("out_of_service_reason", record.outOfServiceReason());
        return Payloads.text(node);
    }

    static String interlock(EngineSnapshot.InterlockRecord record) {
        ObjectNode node = Payloads.object();
        node.put("id", record.id());
        node.put("tripped", record.tripped());
        Payloads.putOptional(node, "tripped_at", record.trippedAt().map(Instant::toString));
        ArrayNode causes = node.putArray("causes");
        record.causes().forEach(causes::add);
        record.bypass().ifPresent(b -> {
            ObjectNode bypass = node.putObject("bypass");
            bypass.put("owner", b.owner());
            bypass.put("reason", b.reason());
            bypass.put("until", b.until().toString());
            bypass.put("remaining", b.remaining().toString());
        });
        return Payloads.text(node);
    }

    static String fill(EngineSnapshot.FillRecord record) {
        ObjectNode node = Payloads.object();
        node.put("id", record.id());
        node.put("locked_out", record.lockedOut());
        node.put("since", record.since().toString());
        Payloads.putOptional(node, "lockout", record.lockout());
        node.put("valve_open", record.valveOpen());
        return Payloads.text(node);
    }

    /** Parses what {@link #alarm} wrote; empty (and the caller logs) for a record this version cannot read. */
    static Optional<EngineSnapshot.AlarmRecord> parseAlarm(String json) {
        try {
            JsonNode node = Payloads.JSON.readTree(json);
            Optional<AlarmState> state = AlarmState.fromWire(node.path("state").asText());
            if (state.isEmpty()) {
                return Optional.empty();
            }
            Optional<Shelving> shelving = Optional.empty();
            if (node.hasNonNull("shelving")) {
                JsonNode s = node.get("shelving");
                shelving = Optional.of(new Shelving(s.path("operator").asText(), s.path("reason").asText(),
                        Instant.parse(s.path("until").asText()), Duration.parse(s.path("remaining").asText())));
            }
            return Optional.of(new EngineSnapshot.AlarmRecord(node.path("id").asText(), state.get(),
                    Instant.parse(node.path("since").asText()), node.path("condition_active").asBoolean(),
                    node.path("unacknowledged").asBoolean(), optionalText(node, "acknowledged_by"),
                    node.path("acknowledge_note").asText(""), shelving, optionalText(node, "out_of_service_by"),
                    node.path("out_of_service_reason").asText("")));
        } catch (JsonProcessingException | RuntimeException e) {
            return Optional.empty();
        }
    }

    static Optional<EngineSnapshot.InterlockRecord> parseInterlock(String json) {
        try {
            JsonNode node = Payloads.JSON.readTree(json);
            List<String> causes = new ArrayList<>();
            node.path("causes").forEach(c -> causes.add(c.asText()));
            Optional<Bypass> bypass = Optional.empty();
            if (node.hasNonNull("bypass")) {
                JsonNode b = node.get("bypass");
                bypass = Optional.of(new Bypass(b.path("owner").asText(), b.path("reason").asText(),
                        Instant.parse(b.path("until").asText()), Duration.parse(b.path("remaining").asText())));
            }
            return Optional.of(new EngineSnapshot.InterlockRecord(node.path("id").asText(),
                    node.path("tripped").asBoolean(), optionalText(node, "tripped_at").map(Instant::parse), causes,
                    bypass));
        } catch (JsonProcessingException | RuntimeException e) {
            return Optional.empty();
        }
    }

    /** Parses what {@link #fill} wrote; empty for a record this version cannot read. */
    static Optional<EngineSnapshot.FillRecord> parseFill(String json) {
        try {
            JsonNode node = Payloads.JSON.readTree(json);
            return Optional.of(new EngineSnapshot.FillRecord(node.path("id").asText(),
                    node.path("locked_out").asBoolean(), Instant.parse(node.path("since").asText()),
                    optionalText(node, "lockout"), node.path("valve_open").asBoolean()));
        } catch (JsonProcessingException | RuntimeException e) {
            return Optional.empty();
        }
    }

    private static Optional<String> optionalText(JsonNode node, String key) {
        return node.hasNonNull(key) ? Optional.of(node.get(key).asText()) : Optional.empty();
    }
}
