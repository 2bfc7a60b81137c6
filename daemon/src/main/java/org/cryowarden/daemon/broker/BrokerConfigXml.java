package org.cryowarden.daemon.broker;

/**
 * Writes the broker's {@code config.xml}. The embedded jar bundles a config that listens on 0.0.0.0 and turns
 * anonymous usage statistics on; ours binds one loopback listener, keeps everything in memory, turns the
 * statistics off, and lets a subscriber fall {@value #MAX_QUEUED_PER_CLIENT} messages behind before the broker
 * discards any (its default of 1000 lost messages to a slow subscriber while the outbox replayed a 2000-event
 * backlog in a trial here). Element names follow the {@code config.xsd} shipped in hivemq-community-edition-embedded 2025.5.
 */
final class BrokerConfigXml {

    /** Messages the broker queues per client beyond its in-flight window (in memory). */
    static final int MAX_QUEUED_PER_CLIENT = 100_000;

    private BrokerConfigXml() {
    }

    static String render(String bindAddress, int port) {
        return """
                <?xml version="1.0" encoding="UTF-8"?>
                <!-- Written by cryowarden for its embedded broker; regenerated at every start. -->
                <hivemq>
                    <listeners>
                        <tcp-listener>
                            <port>%d</port>
                            <bind-address>%s</bind-address>
                            <name>cryowarden-loopback</name>
                        </tcp-listener>
                    </listeners>
                    <mqtt>
                        <queued-messages>
                            <max-queue-size>%d</max-queue-size>
                        </queued-messages>
                    </mqtt>
                    <persistence>
                        <mode>in-memory</mode>
                    </persistence>
                    <anonymous-usage-statistics>
                        <enabled>false</enabled>
                    </anonymous-usage-statistics>
                </hivemq>
                """.formatted(port, bindAddress, MAX_QUEUED_PER_CLIENT);
    }
}
