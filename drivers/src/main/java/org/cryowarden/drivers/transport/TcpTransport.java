package org.cryowarden.drivers.transport;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.InetSocketAddress;
import java.net.Socket;
import java.net.SocketTimeoutException;
import java.time.Duration;
import java.util.Objects;
import java.util.OptionalInt;
import org.cryowarden.drivers.spi.Transport;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * A raw TCP connection to a serial device server: connect timeout, TCP_NODELAY (a request is a few bytes and
 * must leave at once), keep-alive. The poller reads the socket itself, with the socket timeout, so a reply costs
 * no thread of our own and no hand-off between threads. The socket timeout counts whole milliseconds: a shorter
 * or fractional wait is rounded up, never down; a device server's chunking and the network's jitter are far
 * coarser. A closed or reset connection fails the transport; the poller reconnects with backoff.
 */
public final class TcpTransport implements Transport {

    private static final Logger LOG = LoggerFactory.getLogger(TcpTransport.class);
    private static final long NANOS_PER_MILLI = 1_000_000L;

    private final TcpSettings settings;
    private volatile Session session;

    public TcpTransport(TcpSettings settings) {
        this.settings = Objects.requireNonNull(settings, "settings");
    }

    @Override
    public String describe() {
        return "tcp " + settings.host() + ":" + settings.port();
    }

    @Override
    public void write(byte[] bytes) throws IOException {
        Session current = usableSession();
        try {
            current.out.write(bytes);
            current.out.flush();
        } catch (IOException e) {
            throw current.fail(lost(e), e);
        }
    }

    /**
     * Waits in the socket itself. With no time to wait, only the bytes the system already holds are taken
     * ({@code available()}); otherwise the read returns at once when bytes are there and waits the timeout,
     * rounded up to whole milliseconds, when none are.
     */
    @Override
    public int read(byte[] buffer, int offset, int length, Duration timeout) throws IOException {
        Objects.checkFromIndexSize(offset, length, buffer.length);
        Session current = usableSession();
        if (length == 0) {
            return 0;
        }
        long nanos = timeout.toNanos();
        int count;
        try {
            if (nanos <= 0) {
                int ready = current.in.available();
                count = ready > 0 ? current.in.read(buffer, offset, Math.min(length, ready)) : 0;
            } else {
                current.waitAtMost(nanos);
                count = current.in.read(buffer, offset, length);
            }
        } catch (SocketTimeoutException e) {
            return 0; // the socket stays usable after a read timeout (java.net.Socket#setSoTimeout)
        } catch (IOException e) {
            throw current.fail(lost(e), e);
        }
        return received(current, count);
    }

    /** Discards what the system holds for us now, without waiting. */
    @Override
    public int drainInput() throws IOException {
        Session current = usableSession();
        int discarded = 0;
        while (true) {
            int count;
            try {
                int ready = current.in.available();
                if (ready == 0) {
                    return discarded;
                }
                count = current.in.read(current.scratch, 0, Math.min(ready, current.scratch.length));
            } catch (IOException e) {
                throw current.fail(lost(e), e);
            }
            discarded += received(current, count);
        }
    }

    @Override
    public boolean isOpen() {
        Session current = session;
        return current != null && current.failure == null;
    }

    @Override
    public void reopen() throws IOException {
        close();
        Socket socket = new Socket();
        try {
            socket.setTcpNoDelay(true);
            socket.setKeepAlive(true);
            socket.connect(new InetSocketAddress(settings.host(), settings.port()),
                    (int) Math.max(1, settings.connectTimeout().toMillis()));
            session = new Session(socket);
        } catch (SocketTimeoutException e) {
            socket.close();
            throw new IOException("no connection to " + address() + " within "
                    + settings.connectTimeout().toMillis() + " ms; check the device server's address and power", e);
        } catch (IOException e) {
            socket.close();
            throw new IOException("cannot connect to " + address() + ": " + e.getMessage(), e);
        }
        LOG.info("connected {}", describe());
    }

    @Override
    public OptionalInt baudRate() {
        return OptionalInt.empty();
    }

    /**
     * Safe from any thread: closing the socket makes a read blocked in it on the poller's thread end at once with
     * an exception (java.net.Socket#close), which that read reports as this close.
     */
    @Override
    public void close() {
        Session current = session;
        session = null;
        if (current == null) {
            return;
        }
        current.fail("connection to " + address() + " was closed", null);
        try {
            current.socket.close();
        } catch (IOException e) {
            LOG.debug("closing {}: {}", describe(), e.toString());
        }
    }

    private Session usableSession() throws IOException {
        Session current = session;
        if (current == null) {
            throw new IOException("connection to " + address() + " is not open");
        }
        String failure = current.failure;
        if (failure != null) {
            throw new IOException(failure);
        }
        return current;
    }

    private int received(Session current, int count) throws IOException {
        if (count < 0) {
            throw current.fail("device server " + address() + " closed the connection", null);
        }
        return count;
    }

    private String lost(IOException e) {
        return "connection to " + address() + " lost: " + e.getMessage();
    }

    private String address() {
        return settings.host() + ":" + settings.port();
    }

    /** One connection: its streams and, once it failed or was closed, why (the first reason wins). */
    private static final class Session {

        final Socket socket;
        final InputStream in;
        final OutputStream out;
        /** For {@link #drainInput}; poller thread only. */
        final byte[] scratch = new byte[1024];
        volatile String failure;
        /** The socket timeout last set, to set it only when it changes; poller thread only. */
        private int timeoutMillis;

        Session(Socket socket) throws IOException {
            this.socket = socket;
            this.in = socket.getInputStream();
            this.out = socket.getOutputStream();
        }

        /** Sets the next read's wait: {@code nanos} rounded up to whole milliseconds, at least 1 (0 is forever). */
        void waitAtMost(long nanos) throws IOException {
            long millis = nanos / NANOS_PER_MILLI + (nanos % NANOS_PER_MILLI == 0 ? 0 : 1);
            int wanted = (int) Math.min(Integer.MAX_VALUE, Math.max(1, millis));
            if (wanted != timeoutMillis) {
                socket.setSoTimeout(wanted);
                timeoutMillis = wanted;
            }
        }

        synchronized IOException fail(String reason, IOException cause) {
            if (failure == null) {
                failure = reason;
            }
            return new IOException(failure, cause);
        }
    }
}
