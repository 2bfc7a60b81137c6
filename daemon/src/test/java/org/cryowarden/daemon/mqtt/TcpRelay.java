package org.cryowarden.daemon.mqtt;

import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * A TCP relay between a client under test and a real broker, so a test can break connections, refuse them
 * (the broker looks down) or stall the broker's answers, without touching the broker itself.
 * Its threads are named {@value #THREAD_PREFIX}... so thread-leak checks can leave them out.
 */
public final class TcpRelay implements AutoCloseable {

    static final String THREAD_PREFIX = "test-relay-";

    private final ServerSocket server;
    private final int targetPort;
    private final List<Socket> sockets = new CopyOnWriteArrayList<>();
    private final AtomicInteger accepted = new AtomicInteger();
    private volatile boolean accepting = true;
    private volatile boolean stalled;
    private final Thread acceptor;

    public TcpRelay(int targetPort) throws IOException {
        this.targetPort = targetPort;
        this.server = new ServerSocket();
        server.bind(new InetSocketAddress(InetAddress.getLoopbackAddress(), 0));
        acceptor = new Thread(this::acceptLoop, THREAD_PREFIX + "accept");
        acceptor.setDaemon(true);
        acceptor.start();
    }

    public String uri() {
        return "tcp://127.0.0.1:" + server.getLocalPort();
    }

    /** Whether new connections are passed on (true) or closed at once, as if no broker listened. */
    public void accepting(boolean value) {
        accepting = value;
    }

    /** While stalled, nothing from the broker reaches the client (acknowledgements never arrive). */
    void stall(boolean value) {
        stalled = value;
    }

    /** How many connections the relay has seen, passed on or refused. */
    int connectionsSeen() {
        return accepted.get();
    }

    /** Breaks every open connection without an MQTT DISCONNECT, as a pulled cable would. */
    public void breakConnections() {
        for (Socket socket : sockets) {
            closeQuietly(socket);
        }
        sockets.clear();
    }

    @Override
    public void close() {
        closeQuietly(server);
        breakConnections();
    }

    private void acceptLoop() {
        while (!server.isClosed()) {
            try {
                Socket client = server.accept();
                accepted.incrementAndGet();
                if (!accepting) {
                    closeQuietly(client);
                    continue;
                }
                Socket broker = new Socket(InetAddress.getLoopbackAddress(), targetPort);
                client.setTcpNoDelay(true);
                broker.setTcpNoDelay(true);
                sockets.add(client);
                sockets.add(broker);
                pipe(client, broker, false);
                pipe(broker, client, true);
            } catch (IOException e) {
                // server closed or broker unreachable: the client sees a dropped connection
            }
        }
    }

    private void pipe(Socket from, Socket to, boolean fromBroker) {
        Thread thread = new Thread(() -> {
            byte[] buffer = new byte[8192];
            try (InputStream in = from.getInputStream(); OutputStream out = to.getOutputStream()) {
                int n;
                while ((n = in.read(buffer)) >= 0) {
                    if (fromBroker && stalled) {
                        continue;
                    }
                    out.write(buffer, 0, n);
                    out.flush();
                }
            } catch (IOException e) {
                // connection broken
            } finally {
                closeQuietly(from);
                closeQuietly(to);
            }
        }, THREAD_PREFIX + "pipe");
        thread.setDaemon(true);
        thread.start();
    }

    private static void closeQuietly(AutoCloseable closeable) {
        try {
            closeable.close();
        } catch (Exception e) {
            // already closed
        }
    }
}
