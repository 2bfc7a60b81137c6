package org.cryowarden.daemon.mqtt;

import java.nio.charset.StandardCharsets;
import java.util.Objects;
import java.util.Optional;

/**
 * A message received on a subscription, with the MQTT 5 request/response properties when the sender set them.
 * Hand it to {@link MqttLink#reply} to answer a request.
 *
 * @param topic           the topic it was published on
 * @param payload         its bytes (copied)
 * @param qos             the QoS it was delivered with
 * @param retained        whether it was published retained (replayed on subscribe, or forwarded live: the
 *                        link subscribes with Retain As Published)
 * @param responseTopic   where the sender wants the reply, if it is a request
 * @param correlationData what the reply must carry back, if the sender set it
 */
public record IncomingMessage(String topic, byte[] payload, int qos, boolean retained,
                              Optional<String> responseTopic, Optional<byte[]> correlationData) {

    public IncomingMessage {
        Objects.requireNonNull(topic, "topic");
        Objects.requireNonNull(payload, "payload");
        Objects.requireNonNull(responseTopic, "responseTopic");
        Objects.requireNonNull(correlationData, "correlationData");
        payload = payload.clone();
        correlationData = correlationData.map(byte[]::clone);
    }

    @Override
    public byte[] payload() {
        return payload.clone();
    }

    @Override
    public Optional<byte[]> correlationData() {
        return correlationData.map(byte[]::clone);
    }

    /** The payload decoded as UTF-8 (JSON bodies). */
    public String payloadText() {
        return new String(payload, StandardCharsets.UTF_8);
    }

    @Override
    public String toString() {
        return "IncomingMessage[" + topic + ", " + payload.length + " bytes, qos " + qos + (retained ? ", retained" : "")
                + responseTopic.map(t -> ", reply to " + t).orElse("") + "]";
    }
}
