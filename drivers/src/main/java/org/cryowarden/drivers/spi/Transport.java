package org.cryowarden.drivers.spi;

import java.io.IOException;
import java.time.Duration;
import java.util.OptionalInt;

/**
 * A byte link to the devices on one bus: a serial port or a TCP connection to a serial device server. Owned by
 * the bus poller, which opens it, reopens it after a failure and closes it at shutdown; drivers only exchange
 * bytes through it, on the poller's thread. Every method that talks to the link throws {@link IOException} when
 * the link itself is gone, never because of what a device sent.
 */
public interface Transport extends AutoCloseable {

    /** For logs and reasons: "serial /dev/ttyUSB0 9600 8N1", "tcp 10.0.4.17:4001". */
    String describe();

    /** Sends all bytes (returns once they are handed to the operating system). */
    void write(byte[] bytes) throws IOException;

    /**
     * Waits at most {@code timeout} for bytes and copies those available, up to {@code length}, into
     * {@code buffer}; returns how many (0 when the timeout passed with none). Returns as soon as at least one
     * byte is there, so protocol code can measure the gaps between arrivals itself. Bytes already received are
     * returned at once, even with a zero timeout. A serial link honours the timeout to well under a millisecond,
     * unlike the 100 ms steps of some serial libraries; TCP rounds it up to the next whole millisecond, the
     * resolution of the socket timeout, since a device server's chunking and the network's jitter are far coarser
     * and a wait must never end early.
     */
    int read(byte[] buffer, int offset, int length, Duration timeout) throws IOException;

    /**
     * Discards everything received and not yet read (a late reply to an earlier request, line noise) and returns
     * how many bytes that was.
     */
    int drainInput() throws IOException;

    /** True while the link is believed usable. */
    boolean isOpen();

    /**
     * Closes the link if needed and opens it again; called by the poller only, with backoff between attempts.
     *
     * @throws IOException with an operator-readable message when it cannot be opened ("permission denied ...")
     */
    void reopen() throws IOException;

    /** The line speed of a serial link (Modbus RTU timing depends on it); empty for TCP. */
    OptionalInt baudRate();

    /** Closes the link; never blocks for long even if the device hangs. Idempotent. */
    @Override
    void close();
}
