package org.cryowarden.daemon.broker;

import java.io.IOException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.util.OptionalInt;

/** Probes which loopback ports are free, so that a taken port is reported before the broker tries it. */
final class LocalPorts {

    private LocalPorts() {
    }

    /** Whether a server socket can be bound on {@code address:port} right now. */
    static boolean isFree(InetAddress address, int port) {
        try (ServerSocket probe = new ServerSocket()) {
            probe.setReuseAddress(true);
            probe.bind(new InetSocketAddress(address, port), 1);
            return true;
        } catch (IOException taken) {
            return false;
        }
    }

    /** The first free port the choice allows, or empty when every candidate is taken. */
    static OptionalInt firstFree(InetAddress address, PortChoice choice) {
        for (int port = choice.port(); port <= choice.lastCandidate(); port++) {
            if (isFree(address, port)) {
                return OptionalInt.of(port);
            }
        }
        return OptionalInt.empty();
    }
}
