package org.cryowarden.daemon.mqtt;

import java.nio.charset.StandardCharsets;
import java.util.Objects;
import java.util.Optional;
import org.eclipse.paho.mqttv5.common.util.MqttTopicValidator;

/**
 * A message to publish. {@code responseTopic} and {@code correlationData} are the MQTT 5 request/response
 * properties (OASIS MQTT 5.0, 4.10): set on a request, copied onto the reply.
 *
 * @param topic           topic name, without wildcards
 * @param payload         the bytes to send (copied)
 * @param qos             0 or 1 (QoS 2 is not used by cryowarden)
 * @param retained        whether the broker keeps it as the topic's last value
 * @param responseTopic   where the receiver should reply, if this is a request
 * @param correlationData opaque bytes the reply carries back, if any
 */
public record OutgoingMessage(String topic, byte[] payload, int qos, boolean retained,
                              Optional<String> responseTopic, Optional<byte[]> correlationData) {

    public OutgoingMessage {
        Objects.requireNonNull(topic, "topic");
        Objects.requireNonNull(payload, "payload");
        Objects.requireNonNull(responseTopic, "responseTopic");
        Objects.requireNonNull(correlationData, "correlationData");
        MqttTopicValidator.validate(topic, false, true);
        if (qos != 0 && qos != 1) {
            throw new IllegalArgumentException("qos must be 0 or 1, got " + qos + " for topic " + topic);
        }
        responseTopic.ifPresent(t -> MqttTopicValidator.validate(t, false, true));
        payload = payload.clone();
        correlationData = correlationData.map(byte[]::clone);
    }

    /** A QoS 1 message, retained or not, with no request/response properties. */
    public static OutgoingMessage atLeastOnce(String topic, byte[] payload, boolean retained) {
        return new OutgoingMessage(topic, payload, 1, retained, Optional.empty(), Optional.empty());
    }

    /** A QoS 1 message with a UTF-8 payload. */
    public static OutgoingMessage atLeastOnce(String topic, String payload, boolean retained) {
        return atLeastOnce(topic, payload.getBytes(StandardCharsets.UTF_8), retained);
    }

    /** A QoS 0 message (readings, which the next value supersedes anyway). */
    public static OutgoingMessage atMostOnce(String topic, byte[] payload, boolean retained) {
        return new OutgoingMessage(topic, payload, 0, retained, Optional.empty(), Optional.empty());
    }

    /** A QoS 1 request that asks for a reply on {@code responseTopic}, matched by {@code correlationData}. */
    public static OutgoingMessage request(String topic, byte[] payload, String responseTopic, byte[] correlationData) {
        return new OutgoingMessage(topic, payload, 1, false, Optional.of(responseTopic), Optional.of(correlationData));
    }

    @Override
    public byte[] payload() {
        return payload.clone();
    }

    @Override
    public Optional<byte[]> correlationData() {
        return correlationData.map(byte[]::clone);
    }

    byte[] payloadUnsafe() {
        return payload;
    }

    @Override
    public String toString() {
        return "OutgoingMessage[" + topic + ", " + payload.length + " bytes, qos " + qos + (retained ? ", retained" : "")
                + responseTopic.map(t -> ", reply to " + t).orElse("") + "]";
    }
}
