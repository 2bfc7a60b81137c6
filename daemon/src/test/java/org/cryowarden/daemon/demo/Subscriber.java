package org.cryowarden.daemon.demo;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.List;
import java.util.UUID;
import java.util.concurrent.CopyOnWriteArrayList;
import org.eclipse.paho.mqttv5.client.IMqttMessageListener;
import org.eclipse.paho.mqttv5.client.MqttClient;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.MqttSubscription;
import org.eclipse.paho.mqttv5.common.packet.MqttProperties;

/** A plain Paho v5 client standing in for a dashboard or an operator's tool: records everything it receives. */
final class Subscriber implements AutoCloseable {

    record Message(String topic, String text, boolean retained, byte[] correlation) {
    }

    /** The payload of {@code message} as JSON; a payload that is not JSON fails the test. */
    static com.fasterxml.jackson.databind.JsonNode json(Message message) {
        try {
            return org.cryowarden.daemon.run.Payloads.JSON.readTree(message.text());
        } catch (java.io.IOException e) {
            throw new AssertionError("not JSON on " + message.topic() + ": " + message.text(), e);
        }
    }

    private final MqttClient client;
    private final String filter;
    final List<Message> received = new CopyOnWriteArrayList<>();

    Subscriber(String uri, String filter) throws Exception {
        this.filter = filter;
        client = new MqttClient(uri, "test-" + UUID.randomUUID(), new MemoryPersistence());
        MqttConnectionOptions options = new MqttConnectionOptions();
        options.setCleanStart(true);
        client.connect(options);
        IMqttMessageListener listener = (topic, message) -> received.add(new Message(topic,
                new String(message.getPayload(), StandardCharsets.UTF_8), message.isRetained(),
                message.getProperties() == null ? null : message.getProperties().getCorrelationData()));
        client.subscribe(new MqttSubscription[] {new MqttSubscription(filter, 1)},
                new IMqttMessageListener[] {listener});
    }

    void request(String topic, String body, String responseTopic, String correlation) throws Exception {
        MqttMessage message = new MqttMessage(body.getBytes(StandardCharsets.UTF_8));
        message.setQos(1);
        requestMessage(topic, message, responseTopic, correlation);
    }

    /** Publishes {@code message} (its QoS and retain flag as set) as an MQTT 5 request. */
    void requestMessage(String topic, MqttMessage message, String responseTopic, String correlation)
            throws Exception {
        MqttProperties properties = new MqttProperties();
        properties.setResponseTopic(responseTopic);
        properties.setCorrelationData(correlation.getBytes(StandardCharsets.UTF_8));
        message.setProperties(properties);
        client.publish(topic, message);
    }

    /** Removes the retained message on {@code topic} (an empty retained publish). */
    void clearRetained(String topic) throws Exception {
        client.publish(topic, new byte[0], 1, true);
    }

    /** The subscription filter without its trailing {@code /#}. */
    String filterPrefix() {
        return filter.endsWith("/#") ? filter.substring(0, filter.length() - 2) : filter;
    }

    List<Message> on(String topic) {
        return received.stream().filter(m -> m.topic().equals(topic)).toList();
    }

    /** The last message on {@code topic}, waiting at most {@code bound} for one. */
    Message last(String topic, Duration bound) throws InterruptedException {
        long deadline = System.nanoTime() + bound.toNanos();
        while (on(topic).isEmpty()) {
            if (System.nanoTime() > deadline) {
                throw new AssertionError("nothing on " + topic + " within " + bound.toMillis() + " ms");
            }
            Thread.sleep(10);
        }
        List<Message> messages = on(topic);
        return messages.get(messages.size() - 1);
    }

    @Override
    public void close() throws Exception {
        if (client.isConnected()) {
            try {
                client.disconnect();
            } catch (org.eclipse.paho.mqttv5.common.MqttException e) {
                // the broker went away meanwhile (a test stopped it): nothing left to disconnect
            }
        }
        client.close();
    }
}
