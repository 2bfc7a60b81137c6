package org.cryowarden.daemon.broker;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.StringReader;
import java.net.URL;
import javax.xml.XMLConstants;
import javax.xml.parsers.DocumentBuilderFactory;
import javax.xml.transform.stream.StreamSource;
import javax.xml.validation.SchemaFactory;
import javax.xml.xpath.XPathFactory;
import org.junit.jupiter.api.Test;
import org.w3c.dom.Document;
import org.xml.sax.InputSource;

class BrokerConfigXmlTest {

    private static final String XML = BrokerConfigXml.render("127.0.0.1", 18830);

    @Test
    void configIsValidAgainstTheSchemaTheBrokerShips() throws Exception {
        // config.xsd inside hivemq-community-edition-embedded 2025.5: a misspelt element would be ignored
        // silently by the broker, so validate against its own schema.
        URL xsd = getClass().getClassLoader().getResource("config.xsd");
        assertThat(xsd).as("config.xsd on the classpath").isNotNull();
        SchemaFactory.newInstance(XMLConstants.W3C_XML_SCHEMA_NS_URI).newSchema(xsd).newValidator()
                .validate(new StreamSource(new StringReader(XML)));
    }

    @Test
    void configTurnsUsageStatisticsOffAndKeepsEverythingInMemory() throws Exception {
        assertThat(value("/hivemq/anonymous-usage-statistics/enabled")).isEqualTo("false");
        assertThat(value("/hivemq/persistence/mode")).isEqualTo("in-memory");
    }

    @Test
    void configLetsASlowSubscriberFallFarBehindBeforeMessagesAreDiscarded() throws Exception {
        assertThat(value("/hivemq/mqtt/queued-messages/max-queue-size")).isEqualTo("100000");
    }

    @Test
    void configHasOneListenerOnLoopbackAtTheChosenPort() throws Exception {
        assertThat(value("count(/hivemq/listeners/*)")).isEqualTo("1");
        assertThat(value("/hivemq/listeners/tcp-listener/bind-address")).isEqualTo("127.0.0.1");
        assertThat(value("/hivemq/listeners/tcp-listener/port")).isEqualTo("18830");
    }

    private static String value(String xpath) throws Exception {
        Document document = DocumentBuilderFactory.newInstance().newDocumentBuilder()
                .parse(new InputSource(new StringReader(XML)));
        return XPathFactory.newInstance().newXPath().evaluate(xpath, document).trim();
    }
}
