package org.cryowarden.daemon.broker;

/**
 * Which TCP port the embedded broker listens on: exactly one port (a taken port is an error), or the first free
 * port from a starting port upward (for {@code demo}, which must start on a machine that already runs a broker).
 *
 * @param port          the port to take, or the first one to try
 * @param searchUpward  whether to try {@code port + 1, port + 2, ...} when {@code port} is taken
 */
public record PortChoice(int port, boolean searchUpward) {

    /** How many ports above the first one a search tries before giving up. */
    static final int SEARCH_SPAN = 100;

    public PortChoice {
        if (port < 1 || port > 65535) {
            throw new IllegalArgumentException("broker port must be between 1 and 65535, got " + port);
        }
    }

    /** Exactly this port; startup fails with a clear error when another program holds it. */
    public static PortChoice exactly(int port) {
        return new PortChoice(port, false);
    }

    /** The first free port from {@code port} upward (at most {@value #SEARCH_SPAN} ports are tried). */
    public static PortChoice firstFreeFrom(int port) {
        return new PortChoice(port, true);
    }

    /** The last port a search tries. */
    int lastCandidate() {
        return searchUpward ? Math.min(65535, port + SEARCH_SPAN - 1) : port;
    }
}
