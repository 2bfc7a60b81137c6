package org.cryowarden.daemon.mqtt;

import static org.cryowarden.daemon.LoopbackPort.freePort;
import java.time.Duration;
import org.cryowarden.daemon.broker.EmbeddedBroker;
import org.cryowarden.daemon.broker.PortChoice;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;

/** The link against our embedded broker on a free port: the setup of a site without a broker of its own. */
class MqttLinkOnEmbeddedBrokerTest extends MqttLinkContract {

    static EmbeddedBroker broker;

    @BeforeAll
    static void startBroker() throws Exception {
        broker = EmbeddedBroker.start(PortChoice.firstFreeFrom(freePort()), Duration.ofSeconds(60));
    }

    @AfterAll
    static void stopBroker() {
        if (broker != null) {
            broker.close();
        }
    }

    @Override
    int brokerPort() {
        return broker.port();
    }

    @Override
    boolean brokerRunsInThisJvm() {
        return true;
    }
}
