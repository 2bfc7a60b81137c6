package org.cryowarden.daemon.mqtt;

import java.util.concurrent.CompletableFuture;
import java.util.function.Consumer;
import org.eclipse.paho.mqttv5.common.util.MqttTopicValidator;

/**
 * One topic filter with its handler. Kept by the link and sent again after every connect (the session starts
 * clean). {@code granted} completes the first time the broker grants it.
 */
record Subscription(String filter, int qos, Consumer<IncomingMessage> handler, CompletableFuture<Void> granted) {

    boolean matches(String topic) {
        return MqttTopicValidator.isMatched(filter, topic);
    }
}
