package org.cryowarden.drivers.modbus;

import java.io.IOException;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.OptionalInt;
import java.util.function.Function;
import org.cryowarden.drivers.spi.Transport;

/**
 * A serial line with a clock of its own, for master tests that depend on when bytes arrive: frames are put on the
 * line at given times, a read waits (on this clock, not in real time) up to its timeout for the next one, and a
 * write takes the request's character time at the baud rate (11 bits a character, Modbus over Serial Line V1.02
 * §2.5.1). Each frame arrives in one chunk, as a USB adapter hands over what came within its latency timer.
 */
final class SimulatedLine implements Transport, LineClock {

    private record Arrival(long at, byte[] bytes) {
    }

    private final int baud;
    private final long nanosPerCharacter;
    private final List<Arrival> arrivals = new ArrayList<>();
    private final List<byte[]> written = new ArrayList<>();
    private Function<byte[], List<Reply>> device = request -> List.of();
    private long now;

    /** What a device puts on the line after a request: {@code bytes}, starting {@code after} its end. */
    record Reply(Duration after, byte[] bytes) {
    }

    SimulatedLine(int baud) {
        this.baud = baud;
        this.nanosPerCharacter = 11 * 1_000_000_000L / baud;
    }

    /** Who answers each request, and when. */
    SimulatedLine answering(Function<byte[], List<Reply>> replies) {
        this.device = replies;
        return this;
    }

    /** Bytes that arrive {@code after} from now whatever is sent: stale input, a late reply. */
    void arriving(Duration after, byte[] bytes) {
        arrivals.add(new Arrival(now + after.toNanos() + bytes.length * nanosPerCharacter, bytes.clone()));
    }

    /** The line idles for {@code duration}. */
    void idle(Duration duration) {
        now += duration.toNanos();
    }

    /** The time one character takes on this line. */
    long nanosPerCharacter() {
        return nanosPerCharacter;
    }

    List<byte[]> written() {
        return List.copyOf(written);
    }

    @Override
    public long nanos() {
        return now;
    }

    @Override
    public void waitUntil(long due) {
        now = Math.max(now, due);
    }

    @Override
    public String describe() {
        return "simulated line";
    }

    @Override
    public void write(byte[] bytes) {
        written.add(bytes.clone());
        now += bytes.length * nanosPerCharacter;
        for (Reply reply : device.apply(bytes.clone())) {
            arriving(reply.after(), reply.bytes());
        }
    }

    @Override
    public int read(byte[] buffer, int offset, int length, Duration timeout) {
        Arrival next = null;
        for (Arrival arrival : arrivals) {
            if (next == null || arrival.at() < next.at()) {
                next = arrival;
            }
        }
        if (next == null || next.at() > now + timeout.toNanos()) {
            now += timeout.toNanos();
            return 0;
        }
        now = Math.max(now, next.at());
        arrivals.remove(next);
        int count = Math.min(length, next.bytes().length);
        System.arraycopy(next.bytes(), 0, buffer, offset, count);
        return count;
    }

    @Override
    public int drainInput() {
        int count = 0;
        for (Arrival arrival : List.copyOf(arrivals)) {
            if (arrival.at() <= now) {
                count += arrival.bytes().length;
                arrivals.remove(arrival);
            }
        }
        return count;
    }

    @Override
    public boolean isOpen() {
        return true;
    }

    @Override
    public void reopen() throws IOException {
    }

    @Override
    public OptionalInt baudRate() {
        return OptionalInt.of(baud);
    }

    @Override
    public void close() {
    }
}
