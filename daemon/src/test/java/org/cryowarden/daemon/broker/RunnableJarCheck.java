package org.cryowarden.daemon.broker;

import static org.cryowarden.daemon.LoopbackPort.freePort;
import java.net.URL;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.UUID;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import org.cryowarden.daemon.mqtt.MqttLink;
import org.cryowarden.daemon.mqtt.MqttLinkSettings;
import org.cryowarden.daemon.mqtt.OutgoingMessage;
import org.cryowarden.daemon.mqtt.PublishResult;

/**
 * Run by {@link RunnableJarTest} with only the runnable jar (plus this class) on the class path: starts the
 * embedded broker, sends a message through it with an {@link MqttLink} and stops it, printing what it measured.
 * Exit code 0 when the message came back.
 */
public final class RunnableJarCheck {

    private RunnableJarCheck() {
    }

    public static void main(String[] args) throws Exception {
        URL logback = RunnableJarCheck.class.getClassLoader().getResource("logback.xml");
        System.out.println("logback.xml from " + logback);
        try {
            System.exit(roundTrip() ? 0 : 1);
        } catch (Exception | LinkageError e) {
            e.printStackTrace(System.out);
            System.exit(2);
        }
    }

    private static boolean roundTrip() throws Exception {
        EmbeddedBroker broker = EmbeddedBroker.start(PortChoice.firstFreeFrom(freePort()), Duration.ofSeconds(60));
        System.out.println("broker started in " + broker.startDuration().toMillis() + " ms on " + broker.serverUri());
        String got = null;
        try {
            String prefix = "cryowarden-jar-check/" + UUID.randomUUID();
            MqttLink link = new MqttLink(MqttLinkSettings.of(broker.serverUri(), "jar-check-" + UUID.randomUUID(),
                    prefix + "/status", "online", "offline"));
            CompletableFuture<String> echoed = new CompletableFuture<>();
            link.subscribe(prefix + "/echo", 1, m -> echoed.complete(m.payloadText()));
            link.start();
            boolean ok = link.awaitFirstConnect(Duration.ofSeconds(30));
            for (int attempt = 0; ok && attempt < 50 && got == null; attempt++) {
                PublishResult result = link.publish(OutgoingMessage.atLeastOnce(prefix + "/echo", "ping", false))
                        .get(10, TimeUnit.SECONDS);
                ok = result.isDelivered();
                try {
                    got = echoed.get(200, TimeUnit.MILLISECONDS);
                } catch (java.util.concurrent.TimeoutException notYetSubscribed) {
                    // the subscription is granted just after connect
                }
            }
            link.close("offline".getBytes(StandardCharsets.UTF_8), Duration.ofSeconds(10));
        } finally {
            long stopStart = System.nanoTime();
            broker.stop(Duration.ofSeconds(30));
            System.out.println("broker stopped in " + TimeUnit.NANOSECONDS.toMillis(System.nanoTime() - stopStart)
                    + " ms");
        }
        System.out.println("ping".equals(got) ? "round trip ok" : "round trip failed: got " + got);
        return "ping".equals(got);
    }
}
