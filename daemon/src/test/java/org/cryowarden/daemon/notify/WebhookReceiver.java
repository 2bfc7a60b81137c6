package org.cryowarden.daemon.notify;

import com.sun.net.httpserver.HttpServer;
import java.io.IOException;
import java.net.InetSocketAddress;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicBoolean;

/** A local HTTP receiver for webhook tests: records every POST it accepts; answers 503 while {@link #down}. */
public final class WebhookReceiver implements AutoCloseable {

    public record Call(String id, String signature, byte[] body) {
        public String text() {
            return new String(body, java.nio.charset.StandardCharsets.UTF_8);
        }
    }

    public final AtomicBoolean down = new AtomicBoolean();
    private final HttpServer server;
    private final List<Call> calls = new ArrayList<>();
    private int refused;

    public WebhookReceiver() throws IOException {
        server = HttpServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        server.createContext("/hook", exchange -> {
            byte[] body = exchange.getRequestBody().readAllBytes();
            synchronized (this) {
                if (down.get()) {
                    refused++;
                } else {
                    calls.add(new Call(exchange.getRequestHeaders().getFirst("X-Cryowarden-Notice"),
                            exchange.getRequestHeaders().getFirst("X-Cryowarden-Signature"), body));
                }
            }
            exchange.sendResponseHeaders(down.get() ? 503 : 204, -1);
            exchange.close();
        });
        server.start();
    }

    public String url() {
        return "http://127.0.0.1:" + server.getAddress().getPort() + "/hook";
    }

    public synchronized List<Call> calls() {
        return List.copyOf(calls);
    }

    public synchronized int refused() {
        return refused;
    }

    @Override
    public void close() {
        server.stop(0);
    }
}
