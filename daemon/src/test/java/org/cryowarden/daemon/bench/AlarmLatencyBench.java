package org.cryowarden.daemon.bench;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.UUID;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.cryowarden.daemon.run.Daemon;
import org.cryowarden.daemon.run.DaemonSettings;
import org.cryowarden.daemon.run.Payloads;
import org.cryowarden.daemon.run.SiteSetup;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.simulator.EmulatorOptions;
import org.cryowarden.simulator.Endpoint;
import org.cryowarden.simulator.Pace;
import org.cryowarden.simulator.Simulator;
import org.cryowarden.simulator.scenario.ScenarioReader;
import org.eclipse.paho.mqttv5.client.MqttClient;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.MqttSubscription;

/**
 * Measures how long an alarm transition takes from the reading that caused it (its timestamp, taken when the
 * poller read the instrument) to a Paho subscriber on the event topic: 200 oxygen channels on 4 Modbus TCP buses
 * of the simulator, polled at 1 Hz by the daemon in real time, publishing to the machine's Mosquitto. Each channel
 * has a limit just under fresh air, so the sensors' noise makes alarms raise and clear all the time. The same run
 * measures a bare Paho QoS 1 publish-to-subscribe round trip on the same broker, for comparison.
 *
 * <p>Not a test; run it with (after {@code mvn -B -o -q -DskipTests package}):
 * <pre>
 * mvn -B -o -q -pl daemon -am test-compile
 * java -cp "daemon/target/test-classes:daemon/target/cryowarden.jar" org.cryowarden.daemon.bench.AlarmLatencyBench 60
 * </pre>
 * The argument is the measuring time in seconds (default 60).
 */
public final class AlarmLatencyBench {

    private static final int BUSES = 4;
    private static final int PER_BUS = 50;
    private static final String BROKER = "tcp://127.0.0.1:1883";

    private AlarmLatencyBench() {
    }

    public static void main(String[] args) throws Exception {
        Duration measure = Duration.ofSeconds(args.length > 0 ? Long.parseLong(args[0]) : 60);
        Path folder = Files.createTempDirectory("cryowarden-latency-");
        Path scenarioFile = Files.writeString(folder.resolve("bench-scenario.yaml"), scenario());
        Path site = Files.writeString(folder.resolve("bench-site.yaml"), site(folder));
        Path rules = Files.writeString(folder.resolve("bench-rules.yaml"), rules());
        String prefix = "cryowarden-bench/" + UUID.randomUUID();

        List<Double> bare = bareRoundTrips(prefix + "/bare", 1000);
        VirtualTimeSource simClock = new VirtualTimeSource(Instant.now());
        try (Simulator simulator = Simulator.create(ScenarioReader.read(scenarioFile), simClock, true)) {
            List<Endpoint> endpoints = simulator.startEmulators(EmulatorOptions.loopbackAnyPort());
            String text = Files.readString(site);
            for (Endpoint endpoint : endpoints) {
                text = text.replace("PORT-" + endpoint.portId(), Integer.toString(endpoint.tcpPort()));
            }
            Files.writeString(site, text);
            simulator.start(new Pace(1), Duration.ofHours(2));
            DriverCatalog catalog = DriverCatalog.discover(AlarmLatencyBench.class.getClassLoader(), Optional.empty());
            Configuration configuration = SiteSetup.load(site, List.of(rules), catalog, TimeSource.system());
            DaemonSettings settings = DaemonSettings.read(configuration.site(), folder)
                    .withBroker(Optional.of(BROKER), 1883).withPrefix(prefix, "bench-" + UUID.randomUUID())
                    .withJournal(folder.resolve("bench.db")).withApi(Optional.empty(), Optional.empty());

            ConcurrentLinkedQueue<Double> latencies = new ConcurrentLinkedQueue<>();
            MqttClient subscriber = client();
            long[] counting = {Long.MAX_VALUE};
            subscriber.subscribe(new MqttSubscription[] {new MqttSubscription(prefix + "/event", 1)},
                    new org.eclipse.paho.mqttv5.client.IMqttMessageListener[] {(topic, message) -> {
                        JsonNode event = Payloads.JSON.readTree(new String(message.getPayload(),
                                StandardCharsets.UTF_8));
                        String kind = event.path("kind").asText();
                        if (System.nanoTime() > counting[0] && (kind.equals("alarm.raised")
                                || kind.equals("alarm.cleared")) && event.has("reading")) {
                            Instant read = Instant.parse(event.path("reading").path("time").asText());
                            latencies.add((System.currentTimeMillis() - read.toEpochMilli()) * 1.0);
                        }
                    }});
            try (Daemon daemon = Daemon.start(site, List.of(rules), configuration, settings, catalog,
                    TimeSource.system(), Daemon.Options.defaults())) {
                System.out.println("warming up 15 s ...");
                Thread.sleep(15_000); // a benchmark: real time is what it measures
                counting[0] = System.nanoTime();
                Thread.sleep(measure.toMillis());
                counting[0] = Long.MAX_VALUE;
                System.out.printf(Locale.ROOT, "readings evaluated %.0f, reading drops %.0f%n",
                        daemon.meters().get("cryowarden_engine_readings").functionCounter().count(),
                        daemon.meters().get("cryowarden_engine_reading_drops").functionCounter().count());
            }
            subscriber.disconnect();
            subscriber.close();
            List<Double> alarm = new ArrayList<>(latencies);
            report("alarm transition, reading -> subscriber (ms)", alarm, measure);
            report("bare Paho QoS 1 publish -> subscribe (ms)", bare, Duration.ZERO);
        }
    }

    private static List<Double> bareRoundTrips(String topic, int count) throws Exception {
        MqttClient subscriber = client();
        MqttClient publisher = client();
        List<Double> times = Collections.synchronizedList(new ArrayList<>());
        CountDownLatch[] arrived = {new CountDownLatch(1)};
        long[] sent = {0};
        subscriber.subscribe(new MqttSubscription[] {new MqttSubscription(topic, 1)},
                new org.eclipse.paho.mqttv5.client.IMqttMessageListener[] {(t, m) -> {
                    times.add((System.nanoTime() - sent[0]) / 1e6);
                    arrived[0].countDown();
                }});
        for (int i = 0; i < count + 100; i++) {
            arrived[0] = new CountDownLatch(1);
            sent[0] = System.nanoTime();
            MqttMessage message = new MqttMessage(("{\"n\":" + i + "}").getBytes(StandardCharsets.UTF_8));
            message.setQos(1);
            publisher.publish(topic, message);
            arrived[0].await(5, TimeUnit.SECONDS);
        }
        publisher.disconnect();
        publisher.close();
        subscriber.disconnect();
        subscriber.close();
        return new ArrayList<>(times.subList(100, times.size())); // the first 100 warm up
    }

    private static MqttClient client() throws Exception {
        MqttClient client = new MqttClient(BROKER, "bench-" + UUID.randomUUID(), new MemoryPersistence());
        MqttConnectionOptions options = new MqttConnectionOptions();
        options.setCleanStart(true);
        client.connect(options);
        return client;
    }

    private static void report(String what, List<Double> values, Duration over) {
        Collections.sort(values);
        if (values.isEmpty()) {
            System.out.println(what + ": no samples");
            return;
        }
        System.out.printf(Locale.ROOT, "%s: n=%d%s p50=%.1f p99=%.1f max=%.1f%n", what, values.size(),
                over.isZero() ? "" : String.format(Locale.ROOT, " (%.1f/s)", values.size() / (double) over.toSeconds()),
                at(values, 0.50), at(values, 0.99), values.get(values.size() - 1));
    }

    private static double at(List<Double> sorted, double quantile) {
        return sorted.get(Math.min(sorted.size() - 1, (int) Math.ceil(quantile * sorted.size()) - 1));
    }

    // ---- the invented bench site: one hall, 200 oxygen sensors ----

    private static String scenario() {
        StringBuilder text = new StringBuilder("""
                scenario:
                  name: Latency bench hall
                  start: 2025-11-14T22:00:00Z
                  duration: 2h
                  step: 1s
                  seed: 7
                  ambient_pressure: 101.325 kPa
                rooms:
                  - {id: hall, volume: 500 m3, ventilation: 5 m3/min, ventilation_kind: supply, temperature: 20 C}
                vessels:
                  - id: dewar
                    room: hall
                    fluid: nitrogen
                    diameter: 0.5 m
                    straight_height: 0.85 m
                    bottom: torispherical
                    neck_volume: 15 L
                    liquid: 140 L
                    heat_load: 2.5 W
                    vent: {to: room, check_valve: 2 kPa, capacity: 1 m3/h, at: 2 kPa}
                    relief_valve: {set: 150 kPa(g), capacity: 50 m3/h, to: room}
                sensors:
                """);
        for (int i = 0; i < BUSES * PER_BUS; i++) {
            text.append("  - {id: o2-").append(i).append(", kind: oxygen, room: hall, response_time: 1s, noise: 0.05"
                    + " %vol}\n");
        }
        text.append("ports:\n");
        for (int b = 0; b < BUSES; b++) {
            text.append("  - id: bus-").append(b).append("\n    tcp: 0\n    baud: 9600\n    instruments:\n")
                    .append("      - id: aim-").append(b).append("\n        kind: analog-input-module\n")
                    .append("        unit: 3\n        inputs:\n");
            for (int i = 0; i < PER_BUS; i++) {
                text.append("          - {address: ").append(i).append(", sensor: o2-").append(b * PER_BUS + i)
                        .append(", type: uint16, scale: 0.001, range: [0, 25]}\n");
            }
        }
        return text.toString();
    }

    private static String site(Path folder) {
        StringBuilder text = new StringBuilder("site:\n  name: Latency bench hall\n  ambient_pressure: 101.325 kPa\n"
                + "buses:\n");
        for (int b = 0; b < BUSES; b++) {
            text.append("  - id: bus-").append(b).append("\n    transport: {kind: tcp, host: 127.0.0.1, port: PORT-bus-")
                    .append(b).append(", connect_timeout: 2s}\n    instruments:\n      - id: aim-").append(b)
                    .append("\n        driver: modbus-rtu\n        settings: {unit: 3, timeout: 300ms}\n")
                    .append("        channels:\n");
            for (int i = 0; i < PER_BUS; i++) {
                text.append("          - {id: o2-").append(b * PER_BUS + i).append(", unit: \"%vol\", period: 1s,"
                        + " stale_after: 10s, valid_range: [0, 25], point: {table: input, address: ").append(i)
                        .append(", type: uint16, scale: 0.001, current_loop: {range: [0, 25]}}}\n");
            }
        }
        return text.toString();
    }

    private static String rules() {
        StringBuilder text = new StringBuilder("rules:\n");
        for (int i = 0; i < BUSES * PER_BUS; i++) {
            // Just under fresh air (20.9 %vol): the sensor noise raises and clears it every few seconds.
            text.append("  - id: o2-").append(i).append("-low\n    limit: {channel: o2-").append(i)
                    .append(", below: 20.9 %vol}\n    priority: low\n    message: bench alarm\n");
        }
        text.append("alarm_flood: {more_than: 100000, within: 10min}\n");
        return text.toString();
    }
}
