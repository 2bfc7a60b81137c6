package org.cryowarden.daemon.mqtt;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.UUID;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.function.BooleanSupplier;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

/**
 * What an {@link MqttLink} does against a real broker. Each subclass names the broker; every test works under
 * its own topic prefix and talks to the broker through a {@link TcpRelay} where it needs to break things.
 */
abstract class MqttLinkContract {

    static final Duration BOUND = Duration.ofSeconds(15);

    /** The broker's port on 127.0.0.1. */
    abstract int brokerPort();

    /** Whether the broker's own threads live in this JVM (then only the link's named threads are counted). */
    abstract boolean brokerRunsInThisJvm();

    String prefix;
    final List<AutoCloseable> toClose = new ArrayList<>();

    @BeforeEach
    void choosePrefix() {
        prefix = "cryowarden-test/" + UUID.randomUUID();
    }

    @AfterEach
    void closeEverything() throws Exception {
        for (int i = toClose.size() - 1; i >= 0; i--) {
            toClose.get(i).close();
        }
        toClose.clear();
    }

    @Test
    void publishIsReportedDeliveredAndReachesASubscriber() throws Exception {
        MqttProbe probe = probe().subscribe(prefix + "/event");
        MqttLink link = connectedLink(directUri(), 32, 100);

        PublishResult result = link.publish(OutgoingMessage.atLeastOnce(prefix + "/event", "{\"seq\":1}", false))
                .get(BOUND.toSeconds(), TimeUnit.SECONDS);

        assertThat(result).isEqualTo(new PublishResult.Delivered());
        assertThat(probe.await(r -> r.topic().endsWith("/event"), BOUND).text()).isEqualTo("{\"seq\":1}");
    }

    @Test
    void onlineStatusIsRetainedAfterConnect() throws Exception {
        connectedLink(directUri(), 32, 100);

        MqttProbe late = probe().subscribe(prefix + "/status");

        MqttProbe.Received status = late.next(BOUND);
        assertThat(status.text()).isEqualTo("online");
        assertThat(status.retained()).isTrue();
        clearRetained(prefix + "/status");
    }

    @Test
    void cleanCloseLeavesTheOfflinePayloadRetainedNotTheWill() throws Exception {
        MqttLink link = connectedLink(directUri(), 32, 100);

        boolean clean = link.close("offline: shutdown".getBytes(StandardCharsets.UTF_8), BOUND);

        assertThat(clean).isTrue();
        MqttProbe late = probe().subscribe(prefix + "/status");
        assertThat(late.next(BOUND).text()).isEqualTo("offline: shutdown");
        clearRetained(prefix + "/status");
    }

    @Test
    void brokenConnectionLeavesTheWillAndReconnectPublishesOnlineAgain() throws Exception {
        TcpRelay relay = relay();
        MqttProbe watcher = probe().subscribe(prefix + "/status");
        MqttLink link = connectedLink(relay.uri(), 32, 100);
        assertThat(watcher.await(r -> r.text().equals("online"), BOUND)).isNotNull();

        relay.breakConnections();

        assertThat(watcher.await(r -> !r.text().equals("online"), BOUND).text()).isEqualTo("offline: connection lost");
        assertThat(watcher.await(r -> r.text().equals("online"), BOUND)).isNotNull();
        waitUntil(link::isConnected, "the link reconnects");
        clearRetained(prefix + "/status");
    }

    @Test
    void subscriptionsAreSentAgainAfterReconnect() throws Exception {
        TcpRelay relay = relay();
        LinkedBlockingQueue<String> commands = new LinkedBlockingQueue<>();
        LinkedBlockingQueue<Boolean> connects = new LinkedBlockingQueue<>();
        MqttLink link = link(relay.uri(), 32, 100);
        link.addConnectionListener(new ConnectionListener() {
            @Override
            public void connected(boolean reconnect) {
                connects.add(reconnect);
            }
        });
        link.subscribe(prefix + "/command/+", 1, m -> commands.add(m.topic() + " " + m.payloadText()));
        link.start();
        assertThat(connects.poll(BOUND.toSeconds(), TimeUnit.SECONDS)).isFalse();

        relay.breakConnections();
        assertThat(connects.poll(BOUND.toSeconds(), TimeUnit.SECONDS)).isTrue();
        MqttProbe operator = probe();
        // The re-subscription may still be on its way when the listener runs: publish until it arrives.
        String got = null;
        for (int attempt = 0; attempt < 50 && got == null; attempt++) {
            operator.publish(prefix + "/command/ack", "{\"target\":\"o2-low\"}", false);
            got = commands.poll(200, TimeUnit.MILLISECONDS);
        }

        assertThat(got).isEqualTo(prefix + "/command/ack {\"target\":\"o2-low\"}");
    }

    @Test
    void firstConnectIsRetriedUntilTheBrokerAnswers() throws Exception {
        TcpRelay relay = relay();
        relay.accepting(false);
        MqttLink link = link(relay.uri(), 32, 100);
        link.start();
        waitUntil(() -> relay.connectionsSeen() >= 2, "the link tries to connect twice");
        assertThat(link.isConnected()).isFalse();

        relay.accepting(true);

        assertThat(link.awaitFirstConnect(BOUND)).isTrue();
    }

    @Test
    void publishWhileDisconnectedFailsAtOnceWithTheReason() throws Exception {
        TcpRelay relay = relay();
        relay.accepting(false);
        MqttLink link = link(relay.uri(), 32, 100);
        link.start();

        PublishResult result = link.publish(OutgoingMessage.atLeastOnce(prefix + "/event", "x", false))
                .get(BOUND.toSeconds(), TimeUnit.SECONDS);

        assertThat(result).isEqualTo(new PublishResult.Failed("not connected to the MQTT broker at " + relay.uri()));
    }

    @Test
    void publishBeyondTheQueueCapacityFailsAtOnce() throws Exception {
        TcpRelay relay = relay();
        MqttLink link = connectedLink(relay.uri(), 1, 2);
        assertThat(link.publish(OutgoingMessage.atLeastOnce(prefix + "/e", "0", false))
                .get(BOUND.toSeconds(), TimeUnit.SECONDS).isDelivered()).isTrue();
        relay.stall(true);
        // From now on acknowledgements never arrive: "1" holds the only window slot, "2" and "3" fill the queue.
        CompletableFuture<PublishResult> first = link.publish(OutgoingMessage.atLeastOnce(prefix + "/e", "1", false));
        waitUntil(() -> link.waitingCount() == 0, "the first publish is taken into the window");
        link.publish(OutgoingMessage.atLeastOnce(prefix + "/e", "2", false));
        link.publish(OutgoingMessage.atLeastOnce(prefix + "/e", "3", false));

        PublishResult overflow = link.publish(OutgoingMessage.atLeastOnce(prefix + "/e", "4", false))
                .get(BOUND.toSeconds(), TimeUnit.SECONDS);

        assertThat(overflow).isEqualTo(new PublishResult.Failed("the MQTT publish queue is full (2 waiting)"));
        assertThat(first).isNotDone();
        relay.breakConnections();
        assertThat(first.get(BOUND.toSeconds(), TimeUnit.SECONDS).isDelivered()).isFalse();
    }

    @Test
    void burstBeyondTheBrokersReceiveMaximumIsDeliveredCompleteAndInOrder() throws Exception {
        // Below Mosquitto's default per-client queue of 1,000 QoS 1 messages (mosquitto.conf(5),
        // max_queued_messages): beyond it the broker itself drops what a slow subscriber has not yet taken.
        int count = 900;
        MqttProbe probe = probe().subscribe(prefix + "/burst");
        // A window of 200 is far above any broker's default Receive Maximum, so Paho refuses with 32202 and the
        // link has to hold messages back and retry.
        MqttLink link = connectedLink(directUri(), 200, count + 10);

        long start = System.nanoTime();
        List<CompletableFuture<PublishResult>> results = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            results.add(link.publish(OutgoingMessage.atLeastOnce(prefix + "/burst", Integer.toString(i), false)));
        }
        CompletableFuture.allOf(results.toArray(CompletableFuture[]::new)).get(60, TimeUnit.SECONDS);
        long elapsed = System.nanoTime() - start;

        assertThat(results).allSatisfy(r -> assertThat(r.join()).isEqualTo(new PublishResult.Delivered()));
        List<Integer> got = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            got.add(Integer.parseInt(probe.next(BOUND).text()));
        }
        List<Integer> expected = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            expected.add(i);
        }
        assertThat(got).containsExactlyElementsOf(expected);
        System.out.printf("%s: %d QoS 1 publishes acknowledged in %d ms (%.0f msg/s)%n", getClass().getSimpleName(),
                count, TimeUnit.NANOSECONDS.toMillis(elapsed), count / (elapsed / 1e9));
    }

    @Test
    void requestWithResponseTopicGetsAReplyCarryingItsCorrelationData() throws Exception {
        MqttLink link = link(directUri(), 32, 100);
        link.subscribe(prefix + "/command/+", 1, request -> link.reply(request, "{\"ok\": true}"));
        link.start();
        assertThat(link.awaitFirstConnect(BOUND)).isTrue();
        MqttProbe console = probe().subscribe(prefix + "/reply/console-1");
        byte[] correlation = {1, 2, 3, 42};

        String got = null;
        for (int attempt = 0; attempt < 50 && got == null; attempt++) {
            console.request(prefix + "/command/ack", "{\"target\":\"o2-low\",\"operator\":\"kim\"}",
                    prefix + "/reply/console-1", correlation);
            try {
                MqttProbe.Received reply = console.next(Duration.ofMillis(200));
                assertThat(reply.correlationData()).containsExactly(correlation);
                got = reply.text();
            } catch (AssertionError notYetSubscribed) {
                // the subscription is granted asynchronously after connect
            }
        }

        assertThat(got).isEqualTo("{\"ok\": true}");
    }

    @Test
    void replyToAMessageWithoutResponseTopicFails() throws Exception {
        MqttLink link = connectedLink(directUri(), 32, 100);
        IncomingMessage plain = new IncomingMessage(prefix + "/command/ack", new byte[0], 1, false,
                java.util.Optional.empty(), java.util.Optional.empty());

        PublishResult result = link.reply(plain, "{}").get(BOUND.toSeconds(), TimeUnit.SECONDS);

        assertThat(result).isEqualTo(new PublishResult.Failed("the message on " + prefix
                + "/command/ack carries no response topic; there is nowhere to reply"));
    }

    @Test
    void connectReconnectCloseCycleLeavesNoThreadsBehind() throws Exception {
        TcpRelay relay = relay();
        MqttProbe watcher = probe().subscribe(prefix + "/status");
        int before = countThreads();

        for (int cycle = 0; cycle < 3; cycle++) {
            MqttLink link = new MqttLink(settings(relay.uri(), 32, 100));
            link.start();
            assertThat(link.awaitFirstConnect(BOUND)).isTrue();
            relay.breakConnections();
            watcher.await(r -> r.text().equals("offline: connection lost"), BOUND);
            watcher.await(r -> r.text().equals("online"), BOUND);
            assertThat(link.close("offline: shutdown".getBytes(StandardCharsets.UTF_8), BOUND)).isTrue();
        }

        waitUntil(() -> (brokerRunsInThisJvm() || countThreads() <= before) && linkThreads().isEmpty(),
                "threads return to " + before + " (now " + countThreads() + ", link threads " + linkThreads() + ")");
        clearRetained(prefix + "/status");
    }

    // ---- helpers ----------------------------------------------------------------------------------------------

    String directUri() {
        return "tcp://127.0.0.1:" + brokerPort();
    }

    MqttLinkSettings settings(String uri, int window, int queue) {
        return MqttLinkSettings.of(uri, "test-" + UUID.randomUUID(), prefix + "/status",
                        "online", "offline: connection lost")
                .withWindow(window, queue)
                .withRetryDelays(Duration.ofMillis(50), Duration.ofMillis(400))
                .withTimeouts(Duration.ofSeconds(5), Duration.ofSeconds(5));
    }

    MqttLink link(String uri, int window, int queue) {
        MqttLink link = new MqttLink(settings(uri, window, queue));
        toClose.add(() -> link.close("offline: test over".getBytes(StandardCharsets.UTF_8), BOUND));
        return link;
    }

    MqttLink connectedLink(String uri, int window, int queue) throws InterruptedException {
        MqttLink link = link(uri, window, queue);
        link.start();
        assertThat(link.awaitFirstConnect(BOUND)).as("link connects to " + uri).isTrue();
        return link;
    }

    MqttProbe probe() throws Exception {
        MqttProbe probe = new MqttProbe(directUri());
        toClose.add(probe);
        return probe;
    }

    TcpRelay relay() throws Exception {
        TcpRelay relay = new TcpRelay(brokerPort());
        toClose.add(relay);
        return relay;
    }

    void clearRetained(String topic) throws Exception {
        try (MqttProbe cleaner = new MqttProbe(directUri())) {
            cleaner.publish(topic, "", true);
        }
    }

    static void waitUntil(BooleanSupplier condition, String what) throws InterruptedException {
        long deadline = System.nanoTime() + BOUND.toNanos();
        while (!condition.getAsBoolean()) {
            if (System.nanoTime() > deadline) {
                throw new AssertionError("timed out after " + BOUND.toSeconds() + " s waiting until " + what);
            }
            Thread.sleep(10);
        }
    }

    static int countThreads() {
        return (int) Thread.getAllStackTraces().keySet().stream()
                .filter(Thread::isAlive)
                .filter(t -> !t.getName().startsWith(TcpRelay.THREAD_PREFIX))
                .filter(t -> !t.getName().startsWith("MQTT Call: probe-") && !t.getName().startsWith("MQTT "))
                .count();
    }

    static List<String> linkThreads() {
        return Thread.getAllStackTraces().keySet().stream()
                .filter(Thread::isAlive)
                .map(Thread::getName)
                .filter(n -> n.startsWith("cryowarden-mqtt-test-") || n.contains("MQTT Reconnect: test-")
                        || n.contains(": test-"))
                .toList();
    }
}
