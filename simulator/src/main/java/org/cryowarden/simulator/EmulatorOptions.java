package org.cryowarden.simulator;

import java.net.InetAddress;
import java.nio.file.Path;
import java.util.Objects;
import java.util.Optional;

/**
 * How to expose the emulated lines.
 *
 * @param bindAddress  where to listen (127.0.0.1 unless a remote daemon must reach the simulator)
 * @param tcpBasePort  the first TCP port; the scenario's ports take consecutive numbers from it in file order.
 *                     Empty: each port uses the number in the scenario file, 0 there meaning any free port
 * @param ptyDirectory where to create pseudo-terminal links for ports marked {@code pty: true}; empty for none
 */
public record EmulatorOptions(InetAddress bindAddress, Optional<Integer> tcpBasePort, Optional<Path> ptyDirectory) {

    public EmulatorOptions {
        Objects.requireNonNull(bindAddress, "bindAddress");
        Objects.requireNonNull(tcpBasePort, "tcpBasePort");
        Objects.requireNonNull(ptyDirectory, "ptyDirectory");
    }

    /** Loopback, any free ports, no pseudo-terminals: what tests and the in-process demo want. */
    public static EmulatorOptions loopbackAnyPort() {
        return new EmulatorOptions(InetAddress.getLoopbackAddress(), Optional.of(0), Optional.empty());
    }
}
