package org.cryowarden.daemon.bench;

import java.io.IOException;
import java.time.Duration;
import java.util.OptionalInt;
import java.util.concurrent.locks.LockSupport;
import org.cryowarden.drivers.spi.Transport;

/**
 * The master's side of a simulated serial line: requests leave one character per character time ({@code bits}
 * bits at {@code baud}), as the simulator's emulators pace their replies, so a TCP link carries the timing of the
 * line in both directions.
 */
final class PacedTransport implements Transport {

    private final Transport inner;
    private final int baud;
    private final long nanosPerCharacter;

    PacedTransport(Transport inner, int baud, int bitsPerCharacter) {
        this.inner = inner;
        this.baud = baud;
        this.nanosPerCharacter = bitsPerCharacter * 1_000_000_000L / baud;
    }

    @Override
    public String describe() {
        return inner.describe() + " paced at " + baud + " baud";
    }

    @Override
    public void write(byte[] bytes) throws IOException {
        long due = System.nanoTime();
        for (byte b : bytes) {
            // A character has arrived only once its last bit is on the line: wait out its time, then hand it over.
            due += nanosPerCharacter;
            long wait;
            while ((wait = due - System.nanoTime()) > 0) {
                LockSupport.parkNanos(wait);
            }
            inner.write(new byte[] {b});
        }
    }

    @Override
    public int read(byte[] buffer, int offset, int length, Duration timeout) throws IOException {
        return inner.read(buffer, offset, length, timeout);
    }

    @Override
    public int drainInput() throws IOException {
        return inner.drainInput();
    }

    @Override
    public boolean isOpen() {
        return inner.isOpen();
    }

    @Override
    public void reopen() throws IOException {
        inner.reopen();
    }

    @Override
    public OptionalInt baudRate() {
        return OptionalInt.of(baud);
    }

    @Override
    public void close() {
        inner.close();
    }
}
