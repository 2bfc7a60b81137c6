package org.cryowarden.daemon.mqtt;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.UUID;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;
import org.eclipse.paho.mqttv5.client.IMqttMessageListener;
import org.eclipse.paho.mqttv5.client.MqttClient;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.MqttSubscription;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;

/** A plain Paho client playing the subscriber or operator console in tests: records what it receives. */
final class MqttProbe implements AutoCloseable {

    /** One received message, as a test looks at it. */
    record Received(String topic, String text, boolean retained, String responseTopic, byte[] correlationData) {
    }

    private final MqttClient client;
    private final LinkedBlockingQueue<Received> received = new LinkedBlockingQueue<>();

    MqttProbe(String uri) throws Exception {
        client = new MqttClient(uri, "probe-" + UUID.randomUUID(), new MemoryPersistence());
        MqttConnectionOptions options = new MqttConnectionOptions();
        options.setCleanStart(true);
        client.connect(options);
    }

    /** Subscribes at QoS 1; the (filter, qos, listener) overload recurses in Paho 1.2.5 (#816), so use arrays. */
    MqttProbe subscribe(String filter) throws Exception {
        IMqttMessageListener listener = (topic, message) -> {
            MqttProperties p = message.getProperties();
            received.add(new Received(topic, new String(message.getPayload(), StandardCharsets.UTF_8),
                    message.isRetained(), p == null ? null : p.getResponseTopic(),
                    p == null ? null : p.getCorrelationData()));
        };
        client.subscribe(new MqttSubscription[] {new MqttSubscription(filter, 1)}, new IMqttMessageListener[] {listener});
        return this;
    }

    void publish(String topic, String text, boolean retained) throws Exception {
        MqttMessage message = new MqttMessage(text.getBytes(StandardCharsets.UTF_8));
        message.setQos(1);
        message.setRetained(retained);
        client.publish(topic, message);
    }

    void request(String topic, String text, String responseTopic, byte[] correlation) throws Exception {
        MqttMessage message = new MqttMessage(text.getBytes(StandardCharsets.UTF_8));
        message.setQos(1);
        MqttProperties properties = new MqttProperties();
        properties.setResponseTopic(responseTopic);
        properties.setCorrelationData(correlation);
        message.setProperties(properties);
        client.publish(topic, message);
    }

    /** The next message that matches, skipping others; fails the test after {@code timeout}. */
    Received await(Predicate<Received> wanted, Duration timeout) throws InterruptedException {
        long deadline = System.nanoTime() + timeout.toNanos();
        while (true) {
            long left = deadline - System.nanoTime();
            Received next = left > 0 ? received.poll(left, TimeUnit.NANOSECONDS) : null;
            if (next == null) {
                throw new AssertionError("no matching message within " + timeout.toMillis() + " ms");
            }
            if (wanted.test(next)) {
                return next;
            }
        }
    }

    /** The next message, whatever it is. */
    Received next(Duration timeout) throws InterruptedException {
        return await(r -> true, timeout);
    }

    @Override
    public void close() throws Exception {
        if (client.isConnected()) {
            client.disconnect();
        }
        client.close();
    }
}
