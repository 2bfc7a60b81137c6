package org.cryowarden.drivers.testing;

import java.io.IOException;
import java.time.Duration;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import java.util.OptionalInt;
import org.cryowarden.drivers.spi.Transport;

/**
 * An in-memory transport for driver tests: every write goes to a {@link Responder}, whose answer becomes
 * readable at once. A read that finds nothing returns 0 immediately, standing for "the timeout passed", so tests
 * need no real time. It can be made to fail like an unplugged adapter and to refuse reopening.
 */
public final class ScriptedTransport implements Transport {

    /** The device: given the bytes of one write, the bytes it answers (empty for silence). */
    @FunctionalInterface
    public interface Responder {
        byte[] respond(byte[] written);
    }

    private final ArrayDeque<Byte> input = new ArrayDeque<>();
    private final List<byte[]> written = new ArrayList<>();
    private final OptionalInt baud;
    private Responder responder;
    private boolean open;
    private String failure;
    private String refuseReopen;
    private int reopens;

    public ScriptedTransport(Responder responder, OptionalInt baud) {
        this.responder = responder;
        this.baud = baud;
    }

    /** A serial-like transport at 9600 baud. */
    public static ScriptedTransport serial(Responder responder) {
        return new ScriptedTransport(responder, OptionalInt.of(9600));
    }

    public synchronized void respondWith(Responder next) {
        this.responder = next;
    }

    /** Bytes the device sends by itself (a streaming device, a late reply). */
    public synchronized void push(byte[] bytes) {
        for (byte b : bytes) {
            input.add(b);
        }
    }

    /** From now on every operation fails as if the adapter was unplugged. */
    public synchronized void unplug(String reason) {
        failure = reason;
        open = false;
    }

    /** Reopen attempts fail with {@code reason} until {@link #allowReopen()}. */
    public synchronized void refuseReopen(String reason) {
        refuseReopen = reason;
    }

    public synchronized void allowReopen() {
        refuseReopen = null;
    }

    public synchronized int reopens() {
        return reopens;
    }

    public synchronized List<byte[]> written() {
        return List.copyOf(written);
    }

    @Override
    public String describe() {
        return "scripted";
    }

    @Override
    public synchronized void write(byte[] bytes) throws IOException {
        check();
        written.add(bytes.clone());
        byte[] answer = responder.respond(bytes.clone());
        if (answer != null) {
            push(answer);
        }
    }

    @Override
    public synchronized int read(byte[] buffer, int offset, int length, Duration timeout) throws IOException {
        if (input.isEmpty()) {
            check();
            return 0;
        }
        int count = 0;
        while (count < length && !input.isEmpty()) {
            buffer[offset + count++] = input.poll();
        }
        return count;
    }

    @Override
    public synchronized int drainInput() throws IOException {
        check();
        int size = input.size();
        input.clear();
        return size;
    }

    @Override
    public synchronized boolean isOpen() {
        return open && failure == null;
    }

    @Override
    public synchronized void reopen() throws IOException {
        reopens++;
        if (refuseReopen != null) {
            throw new IOException(refuseReopen);
        }
        failure = null;
        open = true;
        input.clear();
    }

    @Override
    public OptionalInt baudRate() {
        return baud;
    }

    @Override
    public synchronized void close() {
        open = false;
    }

    private void check() throws IOException {
        if (failure != null) {
            throw new IOException(failure);
        }
        if (!open) {
            throw new IOException("scripted transport is not open");
        }
    }
}
