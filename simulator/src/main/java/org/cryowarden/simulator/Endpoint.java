package org.cryowarden.simulator;

import java.nio.file.Path;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * Where one emulated line can be reached: a TCP port (like a serial device server) and, when asked for, a
 * pseudo-terminal path (like a USB serial adapter).
 */
public record Endpoint(String portId, String protocol, String host, int tcpPort, Optional<Path> pty,
        List<String> instruments) {

    public Endpoint {
        Objects.requireNonNull(portId, "portId");
        Objects.requireNonNull(pty, "pty");
        instruments = List.copyOf(instruments);
    }

    /** "rack-a-rs485  modbus-rtu  tcp 127.0.0.1:15020  pty /tmp/sim/rack-a-rs485  [aim-1, relay-1]". */
    public String describe() {
        return portId + "  " + protocol + "  tcp " + host + ":" + tcpPort
                + pty.map(p -> "  pty " + p).orElse("") + "  " + instruments;
    }
}
