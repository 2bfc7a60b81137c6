package org.cryowarden.daemon.broker;

import static org.cryowarden.daemon.LoopbackPort.freePort;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.UUID;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.TimeUnit;
import org.eclipse.paho.mqttv5.client.IMqttMessageListener;
import org.eclipse.paho.mqttv5.client.MqttClient;
import org.eclipse.paho.mqttv5.client.MqttConnectionOptions;
import org.eclipse.paho.mqttv5.client.persist.MemoryPersistence;
import org.eclipse.paho.mqttv5.common.MqttMessage;
import org.eclipse.paho.mqttv5.common.MqttSubscription;
import org.junit.jupiter.api.Test;

class EmbeddedBrokerTest {

    private static final Duration START_TIMEOUT = Duration.ofSeconds(60);

    @Test
    void startedBrokerDeliversRetainedMessagesToALaterSubscriber() throws Exception {
        try (EmbeddedBroker broker = EmbeddedBroker.start(PortChoice.firstFreeFrom(freePort()), START_TIMEOUT)) {
            String topic = "test/" + UUID.randomUUID() + "/status";
            MqttClient publisher = client(broker.serverUri());
            MqttMessage message = new MqttMessage("online".getBytes(StandardCharsets.UTF_8));
            message.setQos(1);
            message.setRetained(true);
            publisher.publish(topic, message);
            publisher.disconnect();
            publisher.close();

            BlockingQueue<String> received = new ArrayBlockingQueue<>(4);
            MqttClient subscriber = client(broker.serverUri());
            // The (topic, qos, listener) overload recurses forever in Paho 1.2.5 (paho.mqtt.java #816, #863).
            subscriber.subscribe(new MqttSubscription[] {new MqttSubscription(topic, 1)},
                    new IMqttMessageListener[] {(t, m) -> received.add(new String(m.getPayload(), StandardCharsets.UTF_8))});
            assertThat(received.poll(10, TimeUnit.SECONDS)).isEqualTo("online");
            subscriber.disconnect();
            subscriber.close();
            System.out.println("broker start took " + broker.startDuration().toMillis() + " ms");
        }
    }

    @Test
    void takenPortIsAnErrorThatNamesThePortAndWhatToDo() throws Exception {
        try (ServerSocket holder = new ServerSocket()) {
            holder.bind(new InetSocketAddress(InetAddress.getByName("127.0.0.1"), 0));
            int port = holder.getLocalPort();
            assertThatThrownBy(() -> EmbeddedBroker.start(PortChoice.exactly(port), START_TIMEOUT))
                    .isInstanceOf(BrokerStartException.class)
                    .hasMessage("cannot start the embedded MQTT broker: port " + port + " on 127.0.0.1 is in use,"
                            + " another program is listening on it (perhaps another MQTT broker); stop that program,"
                            + " choose another port, or configure the running broker in the site file instead");
        }
    }

    @Test
    void firstFreePortChoiceSkipsATakenPort() throws Exception {
        try (ServerSocket holder = new ServerSocket()) {
            holder.bind(new InetSocketAddress(InetAddress.getByName("127.0.0.1"), 0));
            int taken = holder.getLocalPort();
            try (EmbeddedBroker broker = EmbeddedBroker.start(PortChoice.firstFreeFrom(taken), START_TIMEOUT)) {
                assertThat(broker.port()).isGreaterThan(taken);
                assertThat(broker.serverUri()).isEqualTo("tcp://127.0.0.1:" + broker.port());
            }
        }
    }

    @Test
    void stoppedBrokerFreesItsPortAndDeletesItsFolder() throws Exception {
        EmbeddedBroker broker = EmbeddedBroker.start(PortChoice.firstFreeFrom(freePort()), START_TIMEOUT);
        java.nio.file.Path folder = broker.folder();
        assertThat(folder.resolve("config").resolve("config.xml")).exists();

        long start = System.nanoTime();
        assertThat(broker.stop(Duration.ofSeconds(30))).isTrue();
        System.out.println("broker stop took " + TimeUnit.NANOSECONDS.toMillis(System.nanoTime() - start) + " ms");

        assertThat(folder).doesNotExist();
        assertThat(LocalPorts.isFree(InetAddress.getByName("127.0.0.1"), broker.port())).isTrue();
    }

    @Test
    void portOutsideTheTcpRangeIsRefused() {
        assertThatThrownBy(() -> PortChoice.exactly(70000))
                .isInstanceOf(IllegalArgumentException.class)
                .hasMessage("broker port must be between 1 and 65535, got 70000");
    }

    private static MqttClient client(String uri) throws Exception {
        MqttClient client = new MqttClient(uri, "test-" + UUID.randomUUID(), new MemoryPersistence());
        MqttConnectionOptions options = new MqttConnectionOptions();
        options.setCleanStart(true);
        client.connect(options);
        return client;
    }
}
