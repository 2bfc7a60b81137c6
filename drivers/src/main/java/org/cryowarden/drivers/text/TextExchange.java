package org.cryowarden.drivers.text;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.drivers.spi.Transport;

/**
 * Line-oriented conversation over a transport for the SCPI and line drivers and {@code probe}: send a message
 * with its terminator, receive one line within a timeout. Keeps the {@link LineAssembler} between calls so that
 * a streaming device's lines are not lost. Poller thread only.
 */
public final class TextExchange {

    private final Transport transport;
    private final Terminator terminator;
    private final LineAssembler assembler;
    private final Deque<LineEvent> pending = new ArrayDeque<>();
    private final byte[] buffer = new byte[512];

    public TextExchange(Transport transport, Terminator terminator, int maxLineBytes) {
        this.transport = Objects.requireNonNull(transport, "transport");
        this.terminator = Objects.requireNonNull(terminator, "terminator");
        this.assembler = new LineAssembler(maxLineBytes);
    }

    /** What one attempt to receive a line gave. */
    public sealed interface Received {
        record Line(String text) implements Received {
        }

        /** Nothing complete within the timeout; {@code partial} is what arrived without a terminator. */
        record Timeout(Optional<String> partial) implements Received {
        }

        record Oversized(int droppedBytes, int limit) implements Received {
        }
    }

    /** Drops everything received so far, buffered lines included. */
    public int discardInput() throws IOException {
        int dropped = transport.drainInput();
        pending.clear();
        assembler.reset();
        return dropped;
    }

    /** Sends {@code message} followed by the terminator. */
    public byte[] send(String message) throws IOException {
        byte[] bytes = (message + terminator.text()).getBytes(StandardCharsets.ISO_8859_1);
        transport.write(bytes);
        return bytes;
    }

    /** The next line, waiting at most {@code timeout} for it (real time, for device bytes only). */
    public Received receive(Duration timeout) throws IOException {
        long deadline = System.nanoTime() + timeout.toNanos();
        while (true) {
            LineEvent event = pending.poll();
            if (event instanceof LineEvent.Line line) {
                return new Received.Line(line.text());
            }
            if (event instanceof LineEvent.Oversized oversized) {
                return new Received.Oversized(oversized.droppedBytes(), oversized.limit());
            }
            long remaining = deadline - System.nanoTime();
            int count = transport.read(buffer, 0, buffer.length, Duration.ofNanos(Math.max(0, remaining)));
            if (count == 0) {
                return new Received.Timeout(assembler.partial());
            }
            pending.addAll(assembler.feed(buffer, 0, count));
        }
    }

    /** A line already received or arriving without waiting; empty when none is complete now. */
    public Optional<Received> receiveNow() throws IOException {
        Received received = receive(Duration.ZERO);
        return received instanceof Received.Timeout ? Optional.empty() : Optional.of(received);
    }
}
