package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.cryowarden.daemon.api.ApiServer;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.run.Payloads;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Refused operator commands over MQTT (on the machine's Mosquitto) and HTTP: each gets its reply, changes no
 * alarm, and is journaled as a {@code command.refused} event with the same reason, in sequence with the rest.
 */
class RefusedCommandsOnMosquittoTest {

    @TempDir
    Path folder;

    @BeforeAll
    static void mosquittoRuns() throws Exception {
        Night.mosquittoRuns();
    }

    @Test
    void refusedCommandsAreRepliedToJournaledWithTheirReasonAndChangeNoAlarm() throws Exception {
        TestOperators operators = new TestOperators();
        try (Night night = Night.start(folder, Night.MOSQUITTO, false, s -> s.withOperators(operators.roster()));
             Subscriber console = new Subscriber(Night.MOSQUITTO, night.prefix + "/replies/#")) {
            night.stepUntil(night.daemon::acceptingCommands, 100);
            String before = alarmStates(night);
            String replies = night.prefix + "/replies/console";
            String ack = night.prefix + "/command/ack";
            console.request(ack, "{\"target\": \"o2-magnet-hall-low\", \"operator\": \"ada\", \"force\": \"yes\"}",
                    replies, "unknown-field");
            console.request(ack, "{\"target\": \"o2-magnet-hall-low\", \"operator\": \"ada\", \"note\": \""
                    + "x".repeat(5000) + "\"}", replies, "oversized");
            console.request(ack, "{\"target\": \"o2-magnet-hall-lwo\", \"operator\": \"ada\"}", replies,
                    "unknown-target");
            MqttMessage retained = new MqttMessage("{\"target\": \"magnet-hall-ventilation\", \"operator\": \"Eve\"}"
                    .getBytes(StandardCharsets.UTF_8));
            retained.setRetained(true);
            retained.setQos(1);
            console.requestMessage(night.prefix + "/command/reset", retained, replies, "retained");
            night.stepUntil(() -> console.on(replies).size() >= 4, 200, () -> console.received.toString());

            Map<String, String> answers = new TreeMap<>();
            for (Subscriber.Message reply : console.on(replies)) {
                answers.put(new String(reply.correlation(), StandardCharsets.UTF_8), reply.text());
            }
            assertThat(answers).containsExactly(
                    Map.entry("oversized", "{\"ok\":false,\"error\":\"command body too large: 5063 bytes, at most"
                            + " 4096\"}"),
                    Map.entry("retained", "{\"ok\":false,\"error\":\"commands must not be retained; clear the"
                            + " retained message on " + night.prefix + "/command/reset\"}"),
                    Map.entry("unknown-field", "{\"ok\":false,\"error\":\"unknown field 'force'; expected target,"
                            + " operator, note, duration, reason\"}"),
                    Map.entry("unknown-target", "{\"ok\":false,\"error\":\"there is no alarm 'o2-magnet-hall-lwo':"
                            + " did you mean 'o2-magnet-hall-low'?\"}"));
            // The broker keeps the retained command: clear it.
            console.clearRetained(night.prefix + "/command/reset");

            try (ApiServer api = ApiServer.start(night.daemon, 0)) {
                HttpResponse<String> missing = TestOperators.post(night, api, operators.operatorToken, "ack",
                        "{\"target\": \"o2-magnet-hall-low\"}");
                assertThat(missing.statusCode()).isEqualTo(400);
                assertThat(missing.body()).isEqualTo("{\"ok\":false,\"error\":\"missing operator: say who is"
                        + " acting\"}");
                HttpResponse<String> nothingToReset = TestOperators.post(night, api, operators.supervisorToken,
                        "reset", "{\"target\": \"magnet-hall-ventilation\", \"operator\": \"grace\"}");
                assertThat(nothingToReset.statusCode()).isEqualTo(409);
                night.steps(2);
                night.daemon.awaitQuiet(java.time.Duration.ofSeconds(5));

                List<JournalEvent> refused = night.daemon.eventsAfter(0, 1000).stream()
                        .filter(e -> e.kind().equals("command.refused")).toList();
                assertThat(refused).extracting(e -> e.subject().orElse("-") + " by " + e.operator().orElse("-"))
                        .containsExactlyInAnyOrder("- by -", "- by -", "o2-magnet-hall-lwo by ada", "- by -",
                                "- by -", "magnet-hall-ventilation by grace");
                assertThat(refused).extracting(e -> reason(e)).contains(
                        "mqtt ack: unknown field 'force'; expected target, operator, note, duration, reason",
                        "mqtt ack: command body too large: 5063 bytes, at most 4096",
                        "mqtt ack: there is no alarm 'o2-magnet-hall-lwo': did you mean 'o2-magnet-hall-low'?",
                        "mqtt reset: commands must not be retained; clear the retained message on " + night.prefix
                                + "/command/reset",
                        "http ack: missing operator: say who is acting",
                        "http reset: " + Payloads.JSON.readTree(nothingToReset.body()).path("error").asText());
            }
            assertThat(alarmStates(night)).isEqualTo(before);
            assertThat(night.daemon.eventsAfter(0, 1000)).filteredOn(e -> e.operator().isPresent())
                    .allMatch(e -> e.kind().equals("command.refused"));
        }
    }

    // ---- helpers ----

    /** In driven mode the engine answers at the next step. */
    private static String alarmStates(Night night) throws Exception {
        var alarms = night.daemon.alarms();
        var interlocks = night.daemon.interlocks();
        night.step();
        StringBuilder states = new StringBuilder();
        for (var alarm : alarms.get(5, java.util.concurrent.TimeUnit.SECONDS)) {
            // The night moves on (a gauge's stale alarm may clear): only what an operator could change is compared.
            states.append(alarm.id()).append(alarm.acknowledgedBy()).append(alarm.shelving()).append(';');
        }
        for (var interlock : interlocks.get(5, java.util.concurrent.TimeUnit.SECONDS)) {
            states.append(interlock.id()).append(interlock.bypass()).append(';');
        }
        return states.toString();
    }

    private static String reason(JournalEvent event) {
        try {
            JsonNode payload = Payloads.JSON.readTree(event.payloadJson());
            return payload.path("via").asText() + " " + payload.path("verb").asText() + ": "
                    + payload.path("reason").asText();
        } catch (Exception e) {
            throw new AssertionError(e);
        }
    }
}
