package org.cryowarden.daemon.bench;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.UUID;
import java.util.concurrent.Semaphore;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import org.cryowarden.daemon.mqtt.MqttLink;
import org.cryowarden.daemon.mqtt.MqttLinkSettings;
import org.cryowarden.daemon.mqtt.OutgoingMessage;
import org.cryowarden.daemon.mqtt.PublishResult;
import org.cryowarden.daemon.run.Payloads;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.eclipse.paho.mqttv5.client.IMqttToken;
import org.eclipse.paho.mqttv5.client.MqttActionListener;
import org.eclipse.paho.mqttv5.client.MqttAsyncClient;

/**
 * Readings published per second through the daemon's MQTT link (QoS 0, retained, the reading document the
 * daemon publishes, 200 channel topics) against a bare Paho loop with the same QoS, retain flag, payload and
 * in-flight window. The two loops run alternately, twice each, each loop once first. The retained topics are
 * cleared at the end.
 */
final class PublishSuite {

    static final double TARGET = 0.80;
    static final int CHANNELS = 200;
    /** Readings handed to either client and not yet completed: the link's own Paho window is 32. */
    static final int WINDOW = 32;
    private static final int ROUNDS = 2;

    BenchResult run(BenchSettings settings) throws Exception {
        Duration measure = settings.measure(Duration.ofSeconds(20));
        String prefix = "cryowarden-bench/" + UUID.randomUUID().toString().substring(0, 8);
        byte[] payload = Payloads.text(Payloads.reading(Reading.good("o2-bench-017", 20.93, Unit.PERCENT,
                Instant.parse("2025-11-13T21:00:00Z")))).getBytes(StandardCharsets.UTF_8);
        try (BrokerChoice broker = BrokerChoice.open(settings)) {
            MqttLink link = new MqttLink(MqttLinkSettings.of(broker.uri(), "cryowarden-bench-link-"
                    + UUID.randomUUID().toString().substring(0, 8), prefix + "/status", "online", "offline"));
            link.start();
            MqttAsyncClient bare = BareMqtt.connect(broker.uri(), "publish");
            try {
                if (!link.awaitFirstConnect(Duration.ofSeconds(10))) {
                    throw new IllegalStateException("the MQTT link did not connect to " + broker.uri());
                }
                settings.say("publish: warming up against " + broker.description());
                Duration warm = settings.warmUp(Duration.ofSeconds(20));
                viaLink(link, prefix, payload, warm.dividedBy(2));
                viaPaho(bare, prefix, payload, warm.dividedBy(2));
                double[] linkTotal = new double[2];
                double[] bareTotal = new double[2];
                Duration slice = measure.dividedBy(2L * ROUNDS);
                for (int round = 0; round < ROUNDS; round++) {
                    // Link first, then bare first: the broker still working off one loop's burst slows the
                    // loop after it, so each loop takes each place once.
                    if (round % 2 == 0) {
                        add(linkTotal, viaLink(link, prefix, payload, slice));
                        add(bareTotal, viaPaho(bare, prefix, payload, slice));
                    } else {
                        add(bareTotal, viaPaho(bare, prefix, payload, slice));
                        add(linkTotal, viaLink(link, prefix, payload, slice));
                    }
                }
                double linkRate = linkTotal[0] / linkTotal[1];
                double bareRate = bareTotal[0] / bareTotal[1];
                double share = linkRate / bareRate;
                clearRetained(bare, prefix);
                List<String> lines = new ArrayList<>();
                lines.add("publish: reading documents of " + payload.length + " bytes, QoS 0, retained, "
                        + CHANNELS + " topics, " + WINDOW + " in flight, on the " + broker.description());
                lines.add(String.format(Locale.ROOT, "  daemon MQTT link: %,.0f readings/s", linkRate));
                lines.add(String.format(Locale.ROOT, "  bare Paho loop:   %,.0f readings/s", bareRate));
                lines.add(String.format(Locale.ROOT, "  ratio:            %.1f %% of the bare loop (target %.0f %%)",
                        share * 100, TARGET * 100));
                return new BenchResult("publish", Map.of("readings_per_second", linkRate),
                        Map.of("bare_paho_per_second", bareRate), Map.of("link_to_bare_paho", share),
                        ">= 80 % of a bare Paho publish loop (same QoS and payload)", share >= TARGET, lines);
            } finally {
                BareMqtt.close(bare);
                link.close();
            }
        }
    }

    private static void add(double[] total, double[] part) {
        total[0] += part[0];
        total[1] += part[1];
    }

    /** Returns {completed, seconds}. */
    private static double[] viaLink(MqttLink link, String prefix, byte[] payload, Duration length)
            throws InterruptedException {
        Semaphore window = new Semaphore(WINDOW);
        AtomicLong done = new AtomicLong();
        AtomicLong failed = new AtomicLong();
        long start = System.nanoTime();
        long end = start + length.toNanos();
        for (int i = 0; System.nanoTime() < end; i++) {
            window.acquire();
            link.publish(OutgoingMessage.atMostOnce(topic(prefix, "link", i), payload, true))
                    .whenComplete((result, error) -> {
                        if (result instanceof PublishResult.Delivered) {
                            done.incrementAndGet();
                        } else {
                            failed.incrementAndGet();
                        }
                        window.release();
                    });
        }
        window.tryAcquire(WINDOW, 10, TimeUnit.SECONDS);
        double seconds = (System.nanoTime() - start) / 1e9;
        return new double[] {done.get(), seconds};
    }

    /** Returns {completed, seconds}. */
    private static double[] viaPaho(MqttAsyncClient client, String prefix, byte[] payload, Duration length)
            throws Exception {
        Semaphore window = new Semaphore(WINDOW);
        AtomicLong done = new AtomicLong();
        MqttActionListener listener = new MqttActionListener() {
            @Override
            public void onSuccess(IMqttToken token) {
                done.incrementAndGet();
                window.release();
            }

            @Override
            public void onFailure(IMqttToken token, Throwable failure) {
                window.release();
            }
        };
        long start = System.nanoTime();
        long end = start + length.toNanos();
        for (int i = 0; System.nanoTime() < end; i++) {
            window.acquire();
            try {
                client.publish(topic(prefix, "bare", i), payload, 0, true, null, listener);
            } catch (org.eclipse.paho.mqttv5.common.MqttException e) {
                window.release(); // 32202 "too many publishes in progress": try the next one
            }
        }
        window.tryAcquire(WINDOW, 10, TimeUnit.SECONDS);
        double seconds = (System.nanoTime() - start) / 1e9;
        return new double[] {done.get(), seconds};
    }

    private static String topic(String prefix, String who, int i) {
        return prefix + "/" + who + "/reading/ch" + (i % CHANNELS);
    }

    /** An empty retained message deletes the retained one (MQTT 5.0, 3.3.1.3). */
    private static void clearRetained(MqttAsyncClient client, String prefix) throws Exception {
        for (String who : List.of("link", "bare")) {
            for (int c = 0; c < CHANNELS; c++) {
                publishRetrying(client, topic(prefix, who, c));
            }
        }
    }

    /**
     * Paho refuses a publish with 32202 while its window is still full of the measured loop's messages
     * (paho.mqtt.java #530): wait for room and try again, for at most 10 s.
     */
    private static void publishRetrying(MqttAsyncClient client, String topic) throws Exception {
        long deadline = System.nanoTime() + 10_000_000_000L;
        while (true) {
            try {
                client.publish(topic, new byte[0], 1, true).waitForCompletion(5_000);
                return;
            } catch (org.eclipse.paho.mqttv5.common.MqttException e) {
                if (e.getReasonCode() != 32202 || System.nanoTime() > deadline) {
                    throw e;
                }
                Thread.sleep(5);
            }
        }
    }
}
