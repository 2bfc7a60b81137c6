package org.cryowarden.daemon.bench;

import java.util.UUID;
import org.eclipse.paho.mqttv5.client.MqttAsyncClient;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttException;

/** A bare Paho MQTT 5 client for the reference loops: in-memory persistence, TCP_NODELAY, clean start. */
final class BareMqtt {

    private BareMqtt() {
    }

    static MqttAsyncClient connect(String serverUri, String role) throws MqttException {
        MqttAsyncClient client = new MqttAsyncClient(serverUri, "cryowarden-bench-" + role + "-"
                + UUID.randomUUID().toString().substring(0, 8), new MemoryPersistence());
        MqttConnectionOptions options = new MqttConnectionOptions();
        options.setCleanStart(true);
        options.setSocketFactory(new NoDelaySocketFactory());
        options.setConnectionTimeout(10);
        client.connect(options).waitForCompletion(10_000);
        return client;
    }

    static void close(MqttAsyncClient client) {
        try {
            client.disconnect().waitForCompletion(5_000);
        } catch (MqttException e) {
            // closing anyway
        }
        try {
            client.close();
        } catch (MqttException e) {
            // closing anyway
        }
    }
}
