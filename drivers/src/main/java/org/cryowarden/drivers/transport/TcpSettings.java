package org.cryowarden.drivers.transport;

import java.time.Duration;
import java.util.Objects;

/** A raw TCP connection to a serial device server (one TCP port per serial line). */
public record TcpSettings(String host, int port, Duration connectTimeout) {

    public TcpSettings {
        Objects.requireNonNull(host, "host");
        Objects.requireNonNull(connectTimeout, "connectTimeout");
        if (port < 1 || port > 65535) {
            throw new IllegalArgumentException("TCP port must be 1-65535, got " + port);
        }
    }
}
