package org.cryowarden.daemon.demo;

import static org.cryowarden.daemon.LoopbackPort.freePort;
import static org.cryowarden.daemon.demo.Subscriber.json;
import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.TimeUnit;
import org.cryowarden.daemon.mqtt.TcpRelay;
import org.cryowarden.daemon.run.OperatorCommand;
import org.cryowarden.daemon.run.Payloads;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A Mosquitto of the test's own on a free loopback port is stopped mid-night and started again (a second one
 * beside the machine's, which stays untouched). While it is
 * down the daemon goes on evaluating and operators act through the API path; afterwards every event arrives
 * once, in order, without a gap, and the retained readings come back.
 */
class BrokerRestartMidNightTest {

    @TempDir
    Path folder;

    @Test
    void eventsDuringABrokerOutageArriveGaplessAndInOrderAfterRestart() throws Exception {
        int port = freePort();
        List<Long> seqs = new ArrayList<>();
        String uri = "tcp://127.0.0.1:" + port;
        Process broker = Night.ownMosquitto(port);
        // The daemon reaches the broker through a relay, so the test can let it back in only once the
        // dashboard, connected straight to the restarted broker, listens: the dashboard then sees everything.
        try (TcpRelay relay = new TcpRelay(port);
             Night night = Night.start(folder, relay.uri(), false)) {
            String events = night.prefix + "/event";
            try (Subscriber before = new Subscriber(uri, night.prefix + "/#")) {
                night.stepUntil(night.daemon::acceptingCommands, 100);
                command(night, "shelve", "o2-sensors-disagree", Optional.of(Duration.ofHours(1)));
                night.stepUntil(() -> before.on(events).stream().anyMatch(m -> kind(m).startsWith("alarm.shelved")),
                        100);
                // No step, so no new event, until the broker is gone: everything journaled so far reaches the
                // dashboard first. (A broker that acknowledged a message and died before forwarding it would lose
                // it for its subscribers: that is the broker's promise, not the daemon's.)
                int journaled = night.daemon.eventsAfter(0, 10_000).size();
                long deadline = System.nanoTime() + Duration.ofSeconds(10).toNanos();
                while (before.on(events).size() < journaled && System.nanoTime() < deadline) {
                    Thread.sleep(10);
                }
                assertThat(before.on(events)).hasSize(journaled);
                relay.accepting(false);
                broker.destroy();
                assertThat(broker.waitFor(10, TimeUnit.SECONDS)).as("broker stopped").isTrue();
                relay.breakConnections();
                seqs.addAll(seqs(before));
            }
            night.stepUntil(() -> !night.daemon.mqttConnected(), 100);
            // The broker is down: the engine goes on; these events wait in the journal's outbox.
            command(night, "unshelve", "o2-sensors-disagree", Optional.empty());
            command(night, "shelve", "o2-magnet-hall-east-stale", Optional.of(Duration.ofMinutes(30)));
            command(night, "unshelve", "o2-magnet-hall-east-stale", Optional.empty());
            night.steps(30);

            broker = Night.ownMosquitto(port);
            try (Subscriber after = new Subscriber(uri, night.prefix + "/#")) {
                relay.accepting(true);
                night.stepUntil(night.daemon::mqttConnected, 3000);
                night.stepUntil(() -> after.on(events).stream().anyMatch(m -> kind(m).equals(
                        "alarm.unshelved o2-magnet-hall-east-stale"))
                        && after.on(night.prefix + "/reading/o2-magnet-hall-east").size() > 1, 600,
                        () -> after.on(events).toString());
                List<String> kinds = after.on(events).stream().map(m -> kind(m)).toList();
                // In this order, the night's own events (a gauge's stale alarm clearing) between them.
                assertThat(kinds).containsSubsequence("alarm.unshelved o2-sensors-disagree",
                        "alarm.shelved o2-magnet-hall-east-stale", "alarm.unshelved o2-magnet-hall-east-stale");
                List<Subscriber.Message> readings = after.on(night.prefix + "/reading/o2-magnet-hall-east");
                JsonNode reading = Payloads.JSON.readTree(readings.get(readings.size() - 1).text());
                assertThat(reading.path("quality").asText()).isEqualTo("good");
                seqs.addAll(seqs(after));
            }
            for (int i = 0; i < seqs.size(); i++) {
                assertThat(seqs.get(i)).as("event %d of %s", i, seqs).isEqualTo(seqs.get(0) + i);
            }
        } finally {
            broker.destroy();
            broker.waitFor(10, TimeUnit.SECONDS);
        }
    }

    // ---- helpers ----

    private static void command(Night night, String verb, String target, Optional<Duration> duration)
            throws Exception {
        var done = night.daemon.command(new OperatorCommand(verb, target, DemoNight.OPERATOR, "", duration,
                duration.isPresent() ? "sensor swap" : ""));
        night.step();
        assertThat(done.get(5, TimeUnit.SECONDS)).as(verb + " " + target).isEmpty();
    }

    private static List<Long> seqs(Subscriber subscriber) {
        return subscriber.on(subscriber.filterPrefix() + "/event").stream().map(m -> json(m).path("seq").asLong())
                .toList();
    }

    private static String kind(Subscriber.Message message) {
        JsonNode event = json(message);
        return event.path("kind").asText() + " " + event.path("subject").asText();
    }
}
