package org.cryowarden.daemon.mqtt;

import java.io.IOException;
import java.net.InetAddress;
import java.net.Socket;
import org.junit.jupiter.api.BeforeAll;

/** The link against the Mosquitto broker every development machine and CI runs on 127.0.0.1:1883. */
class MqttLinkOnMosquittoTest extends MqttLinkContract {

    static final int MOSQUITTO_PORT = 1883;

    @BeforeAll
    static void mosquittoIsRunning() {
        try (Socket socket = new Socket(InetAddress.getLoopbackAddress(), MOSQUITTO_PORT)) {
            socket.getPort();
        } catch (IOException e) {
            throw new AssertionError("no MQTT broker on 127.0.0.1:1883; start it with"
                    + " `mosquitto -d -c /etc/mosquitto/mosquitto.conf`", e);
        }
    }

    @Override
    int brokerPort() {
        return MOSQUITTO_PORT;
    }

    @Override
    boolean brokerRunsInThisJvm() {
        return false;
    }
}
