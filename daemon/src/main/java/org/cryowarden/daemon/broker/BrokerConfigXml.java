package org.cryowarden.daemon.broker;

/**
 * Writes the broker's {@code config.xml}. The embedded jar bundles a config that listens on 0.0.0.0 and turns
 * anonymous usage statistics on; ours binds one loopback listener, keeps everything in memory and turns the
 * statistics off. Element names follow the {@code config.xsd} shipped in hivemq-community-edition-embedded 2025.5.
 */
final class BrokerConfigXml {

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
                    <persistence>
                        <mode>in-memory</mode>
                    </persistence>
                    <anonymous-usage-statistics>
                        <enabled>false</enabled>
                    </anonymous-usage-statistics>
                </hivemq>
                """.formatted(port, bindAddress);
    }
}
