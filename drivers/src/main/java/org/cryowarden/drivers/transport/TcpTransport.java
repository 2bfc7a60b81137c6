package org.cryowarden.drivers.transport;

import java.io.IOException;
import java.io.InputStream;
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
 * must leave at once), keep-alive; a reader thread hands bytes to the poller through a {@link ByteInbox}. A
 * closed or reset connection fails the transport; the poller reconnects with backoff.
 */
public final class TcpTransport implements Transport {

    private static final Logger LOG = LoggerFactory.getLogger(TcpTransport.class);

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
        Session current = openSession();
        try {
            current.socket.getOutputStream().write(bytes);
            current.socket.getOutputStream().flush();
        } catch (IOException e) {
            String reason = "connection to " + settings.host() + ":" + settings.port() + " lost: " + e.getMessage();
            current.inbox.fail(reason);
            throw new IOException(reason, e);
        }
    }

    @Override
    public int read(byte[] buffer, int offset, int length, Duration timeout) throws IOException {
        return openSession().inbox.take(buffer, offset, length, timeout);
    }

    @Override
    public int drainInput() throws IOException {
        return openSession().inbox.clear();
    }

    @Override
    public boolean isOpen() {
        Session current = session;
        return current != null && !current.inbox.failed();
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
        } catch (SocketTimeoutException e) {
            socket.close();
            throw new IOException("no connection to " + settings.host() + ":" + settings.port() + " within "
                    + settings.connectTimeout().toMillis() + " ms; check the device server's address and power", e);
        } catch (IOException e) {
            socket.close();
            throw new IOException("cannot connect to " + settings.host() + ":" + settings.port() + ": "
                    + e.getMessage(), e);
        }
        Session opened = new Session(socket, new ByteInbox(8192));
        Thread reader = new Thread(() -> pump(opened), "tcp-reader " + settings.host() + ":" + settings.port());
        reader.setDaemon(true);
        session = opened;
        reader.start();
        LOG.info("connected {}", describe());
    }

    @Override
    public OptionalInt baudRate() {
        return OptionalInt.empty();
    }

    @Override
    public void close() {
        Session current = session;
        session = null;
        if (current == null) {
            return;
        }
        current.inbox.fail("connection to " + settings.host() + ":" + settings.port() + " was closed");
        try {
            current.socket.close();
        } catch (IOException e) {
            LOG.debug("closing {}: {}", describe(), e.toString());
        }
    }

    private Session openSession() throws IOException {
        Session current = session;
        if (current == null) {
            throw new IOException("connection to " + settings.host() + ":" + settings.port() + " is not open");
        }
        return current;
    }

    private void pump(Session owner) {
        byte[] buffer = new byte[1024];
        try {
            InputStream in = owner.socket.getInputStream();
            while (true) {
                int count = in.read(buffer);
                if (count < 0) {
                    owner.inbox.fail("device server " + settings.host() + ":" + settings.port()
                            + " closed the connection");
                    return;
                }
                owner.inbox.put(buffer, 0, count);
            }
        } catch (IOException e) {
            owner.inbox.fail("connection to " + settings.host() + ":" + settings.port() + " lost: " + e.getMessage());
        }
    }

    private record Session(Socket socket, ByteInbox inbox) {
    }
}
