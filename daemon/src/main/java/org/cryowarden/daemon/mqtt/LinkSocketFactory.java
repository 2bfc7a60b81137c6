package org.cryowarden.daemon.mqtt;

import java.io.FilterInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.Socket;
import java.time.Duration;
import javax.net.SocketFactory;

/**
 * The sockets Paho connects with. Two duties:
 *
 * <ul>
 *   <li>TCP_NODELAY on: Paho does not set it, so small MQTT packets wait for Nagle's algorithm and the peer's
 *       delayed ACK (a trial against the embedded broker crawled at about 80 messages per second without it).</li>
 *   <li>An end of stream or read error that comes within {@link #EARLY_CLOSE_HOLD} of the socket's creation is
 *       held back until that much time has passed. Paho 1.2.5's connect thread polls every 100 ms for its
 *       receiver (and then its callback thread) to be running and never gives up (paho.mqtt.java #850): when a
 *       broker drops the connection at once (starting up, refusing a client, a proxy with no backend) they
 *       have already stopped by the first poll and the connect thread spins forever, so each such attempt
 *       would leak one of the link's Paho threads. Holding the early close keeps them running past the polls.</li>
 * </ul>
 *
 * Paho calls {@link #createSocket()} and connects the socket itself.
 */
final class LinkSocketFactory extends SocketFactory {

    /**
     * Paho starts its receiver, sender and callback one after another, each with such a poll: hold long enough
     * for all three, with room for a busy machine.
     */
    static final Duration EARLY_CLOSE_HOLD = Duration.ofSeconds(1);

    @Override
    public Socket createSocket() throws IOException {
        return configure(new HoldingSocket());
    }

    @Override
    public Socket createSocket(String host, int port) throws IOException {
        return connect(configure(new HoldingSocket()), new InetSocketAddress(host, port));
    }

    @Override
    public Socket createSocket(String host, int port, InetAddress localHost, int localPort) throws IOException {
        Socket socket = configure(new HoldingSocket());
        socket.bind(new InetSocketAddress(localHost, localPort));
        return connect(socket, new InetSocketAddress(host, port));
    }

    @Override
    public Socket createSocket(InetAddress host, int port) throws IOException {
        return connect(configure(new HoldingSocket()), new InetSocketAddress(host, port));
    }

    @Override
    public Socket createSocket(InetAddress address, int port, InetAddress localAddress, int localPort) throws IOException {
        Socket socket = configure(new HoldingSocket());
        socket.bind(new InetSocketAddress(localAddress, localPort));
        return connect(socket, new InetSocketAddress(address, port));
    }

    private static Socket configure(Socket socket) throws IOException {
        socket.setTcpNoDelay(true);
        return socket;
    }

    private static Socket connect(Socket socket, InetSocketAddress address) throws IOException {
        socket.connect(address);
        return socket;
    }

    /** A socket whose input stream holds back an early end of stream or read error. */
    private static final class HoldingSocket extends Socket {
        private final long createdNanos = System.nanoTime();

        @Override
        public InputStream getInputStream() throws IOException {
            return new HoldingInputStream(super.getInputStream(), createdNanos);
        }
    }

    private static final class HoldingInputStream extends FilterInputStream {
        private final long createdNanos;

        HoldingInputStream(InputStream in, long createdNanos) {
            super(in);
            this.createdNanos = createdNanos;
        }

        @Override
        public int read() throws IOException {
            try {
                int b = super.read();
                if (b < 0) {
                    holdIfEarly();
                }
                return b;
            } catch (IOException e) {
                holdIfEarly();
                throw e;
            }
        }

        @Override
        public int read(byte[] buffer, int offset, int length) throws IOException {
            try {
                int n = super.read(buffer, offset, length);
                if (n < 0) {
                    holdIfEarly();
                }
                return n;
            } catch (IOException e) {
                holdIfEarly();
                throw e;
            }
        }

        private void holdIfEarly() {
            long left = EARLY_CLOSE_HOLD.toNanos() - (System.nanoTime() - createdNanos);
            if (left > 0) {
                try {
                    Thread.sleep(left / 1_000_000, (int) (left % 1_000_000));
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                }
            }
        }
    }
}
