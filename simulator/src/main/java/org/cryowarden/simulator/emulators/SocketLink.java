package org.cryowarden.simulator.emulators;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.Socket;
import java.net.SocketTimeoutException;
import java.time.Duration;
import java.util.OptionalInt;
import java.util.concurrent.locks.LockSupport;
import org.cryowarden.drivers.spi.Transport;

/**
 * The instrument's end of one TCP connection, as a drivers {@link Transport} so the drivers' RTU frame reader can
 * cut requests out of it. Writes can be paced at a line speed, so a master sees the timing of a real serial line:
 * a character is handed over only once its {@code bits} bits have taken their time at the baud rate, and a frame
 * starts no sooner than the turnaround silence (t3.5 for Modbus RTU) after the last character received or sent,
 * so two replies written back to back are still two frames (Modbus over Serial Line V1.02, §2.5.1.1). Writes come
 * from one thread at a time; reads from another.
 */
final class SocketLink implements Transport {

    private final Socket socket;
    private final InputStream in;
    private final OutputStream out;
    private final long nanosPerByte;
    private final long turnaroundNanos;
    /** When the last character came in, for the turnaround silence; MIN_VALUE before any. */
    private volatile long lastReceived = Long.MIN_VALUE;
    /** When the last character went out, for the silence between frames; MIN_VALUE before any. */
    private long lastSent = Long.MIN_VALUE;

    /**
     * @param turnaround the silence kept after the last received character before replying, when paced (t3.5 for
     *                   Modbus RTU: a slave knows a request has ended only after it; zero for line protocols)
     */
    SocketLink(Socket socket, int baud, int bitsPerByte, boolean pace, Duration turnaround) throws IOException {
        this.socket = socket;
        socket.setTcpNoDelay(true);
        this.in = socket.getInputStream();
        this.out = socket.getOutputStream();
        this.nanosPerByte = pace && baud > 0 ? bitsPerByte * 1_000_000_000L / baud : 0;
        this.turnaroundNanos = nanosPerByte == 0 ? 0 : turnaround.toNanos();
    }

    @Override
    public String describe() {
        return "tcp " + socket.getRemoteSocketAddress();
    }

    @Override
    public synchronized void write(byte[] bytes) throws IOException {
        if (nanosPerByte == 0) {
            out.write(bytes);
            out.flush();
            return;
        }
        long due = System.nanoTime();
        long received = lastReceived;
        if (received != Long.MIN_VALUE && received + turnaroundNanos - due > 0) {
            due = received + turnaroundNanos;
        }
        if (lastSent != Long.MIN_VALUE && lastSent + turnaroundNanos - due > 0) {
            due = lastSent + turnaroundNanos;
        }
        for (byte b : bytes) {
            // A character has arrived only once its last bit is on the line: wait out its time, then hand it over.
            due += nanosPerByte;
            waitUntil(due);
            out.write(b);
            out.flush();
        }
        lastSent = due;
    }

    private static void waitUntil(long due) {
        long wait;
        while ((wait = due - System.nanoTime()) > 0) {
            LockSupport.parkNanos(wait);
        }
    }

    @Override
    public int read(byte[] buffer, int offset, int length, Duration timeout) throws IOException {
        socket.setSoTimeout((int) Math.max(1, Math.min(Integer.MAX_VALUE, timeout.toMillis())));
        try {
            int count = in.read(buffer, offset, length);
            if (count < 0) {
                throw new IOException("peer closed the connection");
            }
            if (count > 0) {
                lastReceived = System.nanoTime();
            }
            return count;
        } catch (SocketTimeoutException e) {
            return 0;
        }
    }

    @Override
    public int drainInput() throws IOException {
        int available = in.available();
        return available > 0 ? (int) in.skip(available) : 0;
    }

    @Override
    public boolean isOpen() {
        return !socket.isClosed();
    }

    @Override
    public void reopen() throws IOException {
        throw new IOException("an instrument does not reopen its connection; the master does");
    }

    @Override
    public OptionalInt baudRate() {
        return OptionalInt.empty();
    }

    @Override
    public void close() {
        try {
            socket.close();
        } catch (IOException e) {
            // closing anyway
        }
    }
}
