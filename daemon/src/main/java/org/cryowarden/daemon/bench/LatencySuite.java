package org.cryowarden.daemon.bench;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.UUID;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;
import org.cryowarden.daemon.run.Payloads;
import org.eclipse.paho.mqttv5.client.MqttAsyncClient;
import org.eclipse.paho.mqttv5.client.MqttCallback;
import org.eclipse.paho.mqttv5.client.MqttDisconnectResponse;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.common.MqttException;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;

/**
 * From the last byte of a limit-crossing reading leaving the bench device (arriving at the daemon's TCP
 * transport over loopback) to a Paho subscriber on the broker receiving the {@code alarm.raised} event: the
 * daemon's whole path of poll, driver, engine queue, engine, journal commit and MQTT publish. Two loads: 200
 * channels polled at 1 Hz and 2,000 at 10 Hz, each measured after {@link #WARM_UP} of the same crossings. The
 * reference is a bare Paho QoS 1 publish-to-subscriber round trip on the same broker in the same run.
 */
final class LatencySuite {

    static final double TARGET_EXCESS_MS = 5;
    /** Crossings before the measured ones, not counted, per load (full run). */
    static final Duration WARM_UP = Duration.ofSeconds(15);

    private record Load(int channels, int buses, Duration period, Duration crossingEvery) {
        String key() {
            return Integer.toString(channels);
        }
    }

    private static final List<Load> LOADS = List.of(
            new Load(200, 4, Duration.ofSeconds(1), Duration.ofMillis(200)),
            new Load(2_000, 20, Duration.ofMillis(100), Duration.ofMillis(50)));

    BenchResult run(BenchSettings settings) throws Exception {
        Duration measure = settings.measure(Duration.ofSeconds(40));
        Map<String, Double> figures = new LinkedHashMap<>();
        Map<String, Double> reference = new LinkedHashMap<>();
        Map<String, Double> ratio = new LinkedHashMap<>();
        List<String> lines = new ArrayList<>();
        try (BrokerChoice broker = BrokerChoice.open(settings)) {
            int pings = (int) Math.min(200, Math.max(20, measure.toSeconds() * 20));
            settings.say("latency: bare Paho round trips on the " + broker.description());
            Percentiles bare = roundTrips(broker.uri(), pings);
            reference.put("bare_paho_p50_ms", bare.p50());
            reference.put("bare_paho_p99_ms", bare.p99());
            reference.put("bare_paho_max_ms", bare.max());
            lines.add("latency: last byte of a limit-crossing reading at the daemon's transport -> alarm.raised"
                    + " event at a Paho subscriber, on the " + broker.description() + "; each bus's instruments polled "
                    + (settings.together() ? "all at once (polling: {spread: false})" : "in phases over the period"));
            lines.add(String.format(Locale.ROOT, "  reference, bare Paho QoS 1 publish -> subscriber (%d round trips):"
                    + " p50 %.2f ms, p99 %.2f ms, max %.2f ms", bare.count(), bare.p50(), bare.p99(), bare.max()));
            boolean meets = false;
            for (Load load : LOADS) {
                settings.say("latency: " + load.channels() + " channels every " + load.period().toMillis() + " ms on "
                        + load.buses() + " buses for " + measure.toSeconds() + " s");
                double[] achieved = new double[1];
                List<Double> toJournal = new CopyOnWriteArrayList<>();
                List<String> stageLines = new ArrayList<>();
                Percentiles measured = crossings(load, broker.uri(), measure, settings, achieved, toJournal,
                        stageLines);
                Percentiles journal = Percentiles.of(toJournal.stream().mapToDouble(Double::doubleValue).toArray());
                String k = load.key();
                figures.put("p50_ms_" + k, measured.p50());
                figures.put("p99_ms_" + k, measured.p99());
                figures.put("max_ms_" + k, measured.max());
                figures.put("samples_" + k, (double) measured.count());
                figures.put("to_journal_p50_ms_" + k, journal.p50());
                figures.put("readings_per_second_" + k, achieved[0]);
                ratio.put("p99_to_reference_" + k, measured.p99() / bare.p99());
                double excess = measured.p99() - bare.p99();
                if (load.channels() == 200) {
                    meets = excess <= TARGET_EXCESS_MS;
                }
                double asked = load.channels() * 1e9 / load.period().toNanos();
                lines.add(String.format(Locale.ROOT, "  %,5d channels at %s Hz (%d buses): p50 %.2f ms, p99 %.2f ms,"
                                + " max %.2f ms over %d crossings; p99 %.2f ms above the reference",
                        load.channels(), trim(1e9 / load.period().toNanos()), load.buses(), measured.p50(),
                        measured.p99(), measured.max(), measured.count(), excess));
                lines.add(String.format(Locale.ROOT, "         of which transport -> journal recorded: p50 %.2f ms, p99 %.2f ms",
                        journal.p50(), journal.p99()));
                lines.add(String.format(Locale.ROOT, "         readings taken by the engine: %,.0f/s of %,.0f/s asked"
                        + " (one Modbus request per channel)", achieved[0], asked));
                lines.addAll(stageLines);
            }
            return new BenchResult("latency", figures, reference, ratio,
                    "p99 within 5 ms of the bare Paho round trip at 200 channels", meets, lines);
        }
    }

    /** Bare Paho QoS 1 publish to a subscriber, one message at a time. */
    private static Percentiles roundTrips(String uri, int count) throws Exception {
        String topic = "cryowarden-bench/" + UUID.randomUUID().toString().substring(0, 8) + "/ping";
        LinkedBlockingQueue<Long> arrivals = new LinkedBlockingQueue<>();
        MqttAsyncClient subscriber = BareMqtt.connect(uri, "ping-sub");
        MqttAsyncClient publisher = BareMqtt.connect(uri, "ping-pub");
        try {
            subscriber.setCallback(new Arrivals(message -> arrivals.add(System.nanoTime())));
            subscriber.subscribe(topic, 1).waitForCompletion(10_000);
            List<Double> samples = new ArrayList<>();
            for (int i = 0; i < count + 10; i++) {
                long sent = System.nanoTime();
                publisher.publish(topic, new byte[] {(byte) i}, 1, false);
                Long arrived = arrivals.poll(5, TimeUnit.SECONDS);
                if (arrived != null && i >= 10) {
                    samples.add((arrived - sent) / 1e6);
                }
                Thread.sleep(5);
            }
            return Percentiles.of(samples.stream().mapToDouble(Double::doubleValue).toArray());
        } finally {
            BareMqtt.close(publisher);
            BareMqtt.close(subscriber);
        }
    }

    private static Percentiles crossings(Load load, String uri, Duration measure, BenchSettings settings,
            double[] achieved, List<Double> toJournal, List<String> stageLines) throws Exception {
        try (AlarmPathStages stages = settings.stages() ? new AlarmPathStages() : null;
             BenchPlant plant = BenchPlant.start(load.channels(), load.buses(), load.period(), uri,
                     settings.together())) {
            Map<String, Integer> pending = new ConcurrentHashMap<>();
            Map<String, Long> recordedAt = new ConcurrentHashMap<>();
            List<Double> samples = new CopyOnWriteArrayList<>();
            AtomicBoolean measuring = new AtomicBoolean();
            plant.daemon().addListener(recorded -> {
                long now = System.nanoTime();
                for (var event : recorded.events()) {
                    if (event.kind().equals("alarm.raised") && event.subject().isPresent()
                            && pending.containsKey(event.subject().get())) {
                        recordedAt.put(event.subject().get(), now);
                    }
                }
            });
            MqttAsyncClient subscriber = BareMqtt.connect(uri, "alarm-sub");
            try {
                subscriber.setCallback(new Arrivals(message -> {
                    long arrived = System.nanoTime();
                    JsonNode event = parse(message.getPayload());
                    if (!"alarm.raised".equals(event.path("kind").asText())) {
                        return;
                    }
                    Integer channel = pending.remove(event.path("subject").asText());
                    if (channel == null) {
                        return;
                    }
                    BenchDevice device = plant.deviceOf(channel);
                    long sent = device.sentNanos(plant.registerOf(channel));
                    Long recorded = recordedAt.remove(event.path("subject").asText());
                    if (sent != 0 && measuring.get()) {
                        samples.add((arrived - sent) / 1e6);
                        if (stages != null) {
                            stages.crossing(new AlarmPathStages.Crossing(BenchPlant.channelId(channel),
                                    event.path("subject").asText(), sent, arrived));
                        }
                        if (recorded != null) {
                            toJournal.add((recorded - sent) / 1e6);
                        }
                    }
                    device.set(plant.registerOf(channel), BenchPlant.NORMAL, false);
                }));
                subscriber.subscribe(plant.prefix() + "/event/#", 1).waitForCompletion(10_000);
                awaitFirstReadings(plant, load.channels(), Duration.ofSeconds(20));
                // The same crossings, not counted, until the JIT has compiled the path: a daemon runs for nights.
                Duration warm = settings.seconds().isPresent()
                        ? Duration.ofSeconds(Math.min(WARM_UP.toSeconds(), Math.max(1, measure.toSeconds() / 4)))
                        : WARM_UP;
                int next = cross(load, plant, pending, warm, 0);
                drain(pending);
                pending.values().forEach(c -> plant.deviceOf(c).set(plant.registerOf(c), BenchPlant.NORMAL, false));
                pending.clear();
                measuring.set(true);
                long processedBefore = processed(plant);
                long start = System.nanoTime();
                cross(load, plant, pending, measure, next);
                achieved[0] = (processed(plant) - processedBefore) / ((System.nanoTime() - start) / 1e9);
                drain(pending);
                if (!pending.isEmpty()) {
                    settings.say("latency: " + pending.size() + " crossings at " + load.channels()
                            + " channels raised no alarm event within 5 s of the end; left out");
                }
                if (stages != null) {
                    stageLines.addAll(stages.report(Duration.ofSeconds(5)));
                }
            } finally {
                BareMqtt.close(subscriber);
            }
            return Percentiles.of(samples.stream().mapToDouble(Double::doubleValue).toArray());
        }
    }

    /** Raises one channel after the other every {@code crossingEvery} for {@code length}; the next one to raise. */
    private static int cross(Load load, BenchPlant plant, Map<String, Integer> pending, Duration length, int first)
            throws InterruptedException {
        long start = System.nanoTime();
        long end = start + length.toNanos();
        int next = first;
        long due = start;
        while (System.nanoTime() < end) {
            int channel = next;
            next = (next + 1) % load.channels();
            if (!pending.containsValue(channel)) {
                pending.put(BenchPlant.highRuleId(channel), channel);
                plant.deviceOf(channel).set(plant.registerOf(channel), BenchPlant.HIGH, true);
            }
            due += load.crossingEvery().toNanos();
            long wait = due - System.nanoTime();
            if (wait > 0) {
                TimeUnit.NANOSECONDS.sleep(wait);
            }
        }
        return next;
    }

    /** Waits (at most 5 s) for the alarm events of the crossings still pending. */
    private static void drain(Map<String, Integer> pending) throws InterruptedException {
        long drainEnd = System.nanoTime() + Duration.ofSeconds(5).toNanos();
        while (!pending.isEmpty() && System.nanoTime() < drainEnd) {
            Thread.sleep(10);
        }
    }

    private static void awaitFirstReadings(BenchPlant plant, int channels, Duration bound) throws InterruptedException {
        long end = System.nanoTime() + bound.toNanos();
        while (System.nanoTime() < end && (processed(plant) < 2L * channels || !plant.daemon().mqttConnected())) {
            Thread.sleep(20);
        }
    }

    static long processed(BenchPlant plant) {
        return plant.daemon().status().path("readings_processed").asLong();
    }

    private static JsonNode parse(byte[] payload) {
        try {
            return Payloads.JSON.readTree(new String(payload, StandardCharsets.UTF_8));
        } catch (java.io.IOException e) {
            return Payloads.object();
        }
    }

    private static String trim(double value) {
        return value == Math.rint(value) ? Long.toString((long) value) : Double.toString(value);
    }

    /** Hands every message to {@code onMessage}; nothing else. */
    private record Arrivals(java.util.function.Consumer<MqttMessage> onMessage) implements MqttCallback {
        @Override
        public void disconnected(MqttDisconnectResponse response) {
        }

        @Override
        public void mqttErrorOccurred(MqttException exception) {
        }

        @Override
        public void messageArrived(String topic, MqttMessage message) {
            onMessage.accept(message);
        }

        @Override
        public void deliveryComplete(IMqttToken token) {
        }

        @Override
        public void connectComplete(boolean reconnect, String serverUri) {
        }

        @Override
        public void authPacketArrived(int reasonCode, MqttProperties properties) {
        }
    }
}
