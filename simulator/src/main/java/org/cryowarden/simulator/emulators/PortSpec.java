package org.cryowarden.simulator.emulators;

import java.util.List;
import java.util.Objects;

/**
 * One line the emulated instruments sit on, as the site sees it: a bus of one protocol reached over TCP (like a
 * serial device server) and/or a pseudo-terminal (like a USB serial adapter).
 *
 * @param tcpPort     the TCP port to listen on; 0 picks a free one
 * @param pty         whether to offer a pseudo-terminal too (when the run is given a pty directory)
 * @param baud        the line speed whose byte timing {@code pace} imitates
 * @param bitsPerByte start, data, parity and stop bits of one character (10 for 8N1, 11 for 8E1)
 * @param pace        whether replies are sent at the line speed rather than at once
 */
public record PortSpec(String id, int tcpPort, boolean pty, int baud, int bitsPerByte, boolean pace,
        List<String> instrumentIds) {

    public PortSpec {
        Objects.requireNonNull(id, "id");
        instrumentIds = List.copyOf(instrumentIds);
    }
}
