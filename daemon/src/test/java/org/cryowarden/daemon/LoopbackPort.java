package org.cryowarden.daemon;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.InetAddress;
import java.net.ServerSocket;

/** A loopback TCP port that was free a moment ago, for a broker or an API the test starts itself. */
public final class LoopbackPort {

    private LoopbackPort() {
    }

    public static int freePort() {
        try (ServerSocket probe = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            return probe.getLocalPort();
        } catch (IOException e) {
            throw new UncheckedIOException("no free loopback port", e);
        }
    }
}
