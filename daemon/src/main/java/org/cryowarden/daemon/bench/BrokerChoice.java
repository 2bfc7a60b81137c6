package org.cryowarden.daemon.bench;

import java.io.IOException;
import java.net.InetSocketAddress;
import java.net.Socket;
import java.net.URI;
import java.time.Duration;
import java.util.Optional;
import org.cryowarden.daemon.broker.BrokerStartException;
import org.cryowarden.daemon.broker.EmbeddedBroker;
import org.cryowarden.daemon.broker.PortChoice;

/**
 * The broker a suite measures against: the one asked for when it accepts a connection, else the embedded broker
 * on the first free port from 18830 (and the suite says so in its output).
 */
final class BrokerChoice implements AutoCloseable {

    private final String uri;
    private final Optional<EmbeddedBroker> embedded;
    private final String description;

    private BrokerChoice(String uri, Optional<EmbeddedBroker> embedded, String description) {
        this.uri = uri;
        this.embedded = embedded;
        this.description = description;
    }

    static BrokerChoice open(BenchSettings settings) throws BrokerStartException {
        URI asked = URI.create(settings.broker());
        try (Socket socket = new Socket()) {
            socket.connect(new InetSocketAddress(asked.getHost(), asked.getPort()), 1_000);
            return new BrokerChoice(settings.broker(), Optional.empty(), "broker " + settings.broker());
        } catch (IOException e) {
            settings.say("no broker answers at " + settings.broker() + " (" + e.getMessage()
                    + "): starting the embedded broker");
        }
        EmbeddedBroker broker = EmbeddedBroker.start(PortChoice.firstFreeFrom(18830), Duration.ofSeconds(30));
        return new BrokerChoice(broker.serverUri(), Optional.of(broker), "embedded broker " + broker.serverUri()
                + " (no broker answered at " + settings.broker() + "; it runs in this process)");
    }

    String uri() {
        return uri;
    }

    boolean embedded() {
        return embedded.isPresent();
    }

    /** For the output: which broker, and whether it is the fallback. */
    String description() {
        return description;
    }

    @Override
    public void close() {
        embedded.ifPresent(EmbeddedBroker::close);
    }
}
