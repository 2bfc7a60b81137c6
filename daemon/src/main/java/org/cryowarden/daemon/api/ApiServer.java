package org.cryowarden.daemon.api;

import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import com.sun.net.httpserver.HttpExchange;
import com.sun.net.httpserver.HttpServer;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.BindException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.URI;
import java.net.URLDecoder;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.time.Instant;
import java.time.format.DateTimeParseException;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.TimeUnit;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.run.Daemon;
import org.cryowarden.daemon.access.OperatorRoster;
import org.cryowarden.daemon.access.Role;
import org.cryowarden.daemon.run.OperatorCommand;
import org.cryowarden.daemon.run.Payloads;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.engine.InterlockStatus;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The local HTTP API on 127.0.0.1 (the JDK's {@code com.sun.net.httpserver}), JSON through Jackson:
 * <pre>
 * GET  /api/status  /api/channels  /api/alarms  /api/interlocks
 * GET  /api/events?after=SEQ | /api/events?since=2h | since=2025-01-01T00:00:00Z   (at most limit=1000)
 * POST /api/commands/{ack|shelve|unshelve|reset|bypass}   body as on MQTT   (operator's token)
 * POST /api/reload                                                          (supervisor's token)
 * GET  /metrics     Prometheus text format
 * </pre>
 * Writes need {@code Authorization: Bearer TOKEN} with the token of the operator the command names (site file,
 * {@code operators}); a site without operators refuses every write, and journals each refusal.
 */
public final class ApiServer implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(ApiServer.class);
    private static final int MAX_LIMIT = 1000;

    private final HttpServer server;
    private final ExecutorService executor;
    private final Daemon daemon;

    private ApiServer(HttpServer server, ExecutorService executor, Daemon daemon) {
        this.server = server;
        this.executor = executor;
        this.daemon = daemon;
    }

    /** Starts the API when the site enables it (the default); a taken port is an error that names it. */
    public static Optional<ApiServer> startIfEnabled(Daemon daemon) throws IOException {
        if (daemon.settings().apiPort().isEmpty()) {
            return Optional.empty();
        }
        return Optional.of(start(daemon, daemon.settings().apiPort().get()));
    }

    public static ApiServer start(Daemon daemon, int port) throws IOException {
        HttpServer server;
        try {
            server = HttpServer.create(new InetSocketAddress(InetAddress.getLoopbackAddress(), port), 16);
        } catch (BindException e) {
            throw new IOException("the HTTP API port 127.0.0.1:" + port + " is taken by another program; set"
                    + " api: {port: N} in the site file, or stop the other program", e);
        }
        ExecutorService executor = Executors.newFixedThreadPool(2, r -> {
            Thread thread = new Thread(r, "http api");
            thread.setDaemon(true);
            return thread;
        });
        server.setExecutor(executor);
        ApiServer api = new ApiServer(server, executor, daemon);
        server.createContext("/", api::handle);
        server.start();
        LOG.info("HTTP API on http://127.0.0.1:{}/api/ ({}); metrics on /metrics", api.port(),
                daemon.settings().operators().configured() ? "writes need an operator's token"
                        : "every write refused: the site file lists no operators");
        return api;
    }

    public int port() {
        return server.getAddress().getPort();
    }

    @Override
    public void close() {
        server.stop(0);
        executor.shutdownNow();
        try {
            executor.awaitTermination(2, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    private void handle(HttpExchange exchange) throws IOException {
        try {
            route(exchange);
        } catch (RuntimeException | JournalException e) {
            LOG.error("API {} {} failed", exchange.getRequestMethod(), exchange.getRequestURI(), e);
            send(exchange, 500, error("internal failure: " + e.getMessage()));
        } catch (Exception e) {
            send(exchange, 500, error("internal failure: " + e));
        } finally {
            exchange.close();
        }
    }

    private void route(HttpExchange exchange) throws Exception {
        String method = exchange.getRequestMethod();
        String path = exchange.getRequestURI().getPath();
        Map<String, String> query = query(exchange.getRequestURI());
        if (path.equals("/metrics") && method.equals("GET")) {
            byte[] body = daemon.scrape().getBytes(StandardCharsets.UTF_8);
            exchange.getResponseHeaders().set("Content-Type", "text/plain; version=0.0.4; charset=utf-8");
            exchange.sendResponseHeaders(200, body.length);
            try (OutputStream out = exchange.getResponseBody()) {
                out.write(body);
            }
            return;
        }
        if (method.equals("GET")) {
            switch (path) {
                case "/api/status" -> send(exchange, 200, daemon.status());
                case "/api/channels" -> send(exchange, 200, channels());
                case "/api/alarms" -> {
                    ArrayNode alarms = Payloads.JSON.createArrayNode();
                    daemon.alarmDocuments().get(10, TimeUnit.SECONDS).forEach(alarms::add);
                    send(exchange, 200, alarms);
                }
                case "/api/interlocks" -> {
                    ArrayNode interlocks = Payloads.JSON.createArrayNode();
                    for (InterlockStatus status : daemon.interlocks().get(10, TimeUnit.SECONDS)) {
                        interlocks.add(Payloads.interlock(status));
                    }
                    send(exchange, 200, interlocks);
                }
                case "/api/events" -> events(exchange, query);
                default -> send(exchange, 404, error("no such resource: GET " + path));
            }
            return;
        }
        if (!method.equals("POST")) {
            send(exchange, 405, error("method " + method + " is not allowed"));
            return;
        }
        if (!daemon.settings().operators().configured() && refusedForNoOperators(exchange, path)) {
            return;
        }
        Optional<Sender> sender = authorised(exchange);
        if (sender.isEmpty()) {
            return;
        }
        if (path.equals("/api/reload")) {
            OperatorRoster.Operator operator = sender.get().operator();
            if (operator.role() != Role.SUPERVISOR) {
                send(exchange, 403, error("reload needs a supervisor; " + operator.id() + " is not one"));
                return;
            }
            List<String> problems = daemon.reload();
            ObjectNode body = Payloads.reply(problems.isEmpty() ? Optional.empty()
                    : Optional.of("the new configuration has " + problems.size() + " errors; the running one stays"));
            body.set("errors", Payloads.JSON.valueToTree(problems));
            send(exchange, problems.isEmpty() ? 200 : 422, body);
            return;
        }
        if (path.startsWith("/api/commands/")) {
            String verb = path.substring("/api/commands/".length());
            byte[] body = readBody(exchange.getRequestBody());
            OperatorCommand.Parsed parsed = OperatorCommand.parse(verb, body);
            if (parsed.error().isPresent()) {
                LOG.warn("command {} over HTTP refused: {}", verb, parsed.error().get());
                daemon.commandRefused("http", verb, Optional.empty(), parsed.error().get());
                send(exchange, 400, Payloads.reply(parsed.error()));
                return;
            }
            OperatorCommand command = parsed.command().orElseThrow();
            OperatorRoster.Operator operator = sender.get().operator();
            if (!operator.id().equals(command.operator())) {
                String reason = "the command names operator '" + command.operator() + "' but the token is "
                        + operator.id() + "'s";
                LOG.warn("command {} over HTTP refused: {}", verb, reason);
                daemon.commandRefused("http", verb, Optional.of(command), reason);
                send(exchange, 403, Payloads.reply(Optional.of(reason)));
                return;
            }
            Optional<String> refusal = daemon.command(command).get(10, TimeUnit.SECONDS);
            LOG.info("command {} {} by {} over HTTP: {}", verb, command.target(), command.operator(),
                    refusal.map(r -> "refused: " + r).orElse("done"));
            refusal.ifPresent(r -> daemon.commandRefused("http", verb, Optional.of(command), r));
            send(exchange, refusal.isEmpty() ? 200 : 409, Payloads.reply(refusal));
            return;
        }
        send(exchange, 404, error("no such resource: POST " + path));
    }

    /**
     * On a site without operators, answers a command or reload with 403 and journals the refusal (as MQTT does),
     * whatever token came with it; returns false for other paths, which get their 404.
     */
    private boolean refusedForNoOperators(HttpExchange exchange, String path) throws IOException {
        Optional<OperatorCommand> command = Optional.empty();
        String verb;
        if (path.equals("/api/reload")) {
            verb = "reload";
        } else if (path.startsWith("/api/commands/")) {
            verb = path.substring("/api/commands/".length());
            command = OperatorCommand.parse(verb, readBody(exchange.getRequestBody())).command();
        } else {
            return false;
        }
        LOG.warn("command {} over HTTP refused: {}", verb, OperatorRoster.NO_OPERATORS);
        daemon.commandRefused("http", verb, command, OperatorRoster.NO_OPERATORS);
        send(exchange, 403, Payloads.reply(Optional.of(OperatorRoster.NO_OPERATORS)));
        return true;
    }

    /**
     * Who sent the request, or empty after answering 401: the operator whose token it is (compared by hash).
     */
    private Optional<Sender> authorised(HttpExchange exchange) throws IOException {
        String header = Optional.ofNullable(exchange.getRequestHeaders().getFirst("Authorization")).orElse("");
        String presented = header.startsWith("Bearer ") ? header.substring(7).strip() : "";
        Optional<OperatorRoster.Operator> operator = presented.isEmpty() ? Optional.empty()
                : daemon.settings().operators().identify(presented);
        if (operator.isEmpty()) {
            send(exchange, 401, error("missing or unknown token: send Authorization: Bearer TOKEN, the token"
                    + " made for you by `cryowarden token new`"));
            return Optional.empty();
        }
        return Optional.of(new Sender(operator.get()));
    }

    /** The sender of an authorised write: always a named operator. */
    private record Sender(OperatorRoster.Operator operator) {
    }

    private ArrayNode channels() {
        ArrayNode channels = Payloads.JSON.createArrayNode();
        Map<String, Reading> latest = daemon.latestReadings();
        daemon.configuration().site().channels().forEach(c -> channels.add(channel(c.id(), c.description(),
                latest.get(c.id()), c.unit().symbol(), false)));
        daemon.configuration().site().derived().forEach(c -> channels.add(channel(c.id(), c.description(),
                latest.get(c.id()), c.unit().symbol(), true)));
        return channels;
    }

    private static ObjectNode channel(String id, String description, Reading reading, String unit, boolean derived) {
        ObjectNode node = reading == null ? Payloads.object() : Payloads.reading(reading);
        node.put("channel", id);
        node.put("description", description);
        node.put("derived", derived);
        if (reading == null) {
            node.putNull("value");
            node.put("unit", unit);
            node.put("quality", "none");
            node.put("reason", "no reading yet");
        }
        return node;
    }

    private void events(HttpExchange exchange, Map<String, String> query) throws IOException, JournalException {
        int limit = MAX_LIMIT;
        if (query.containsKey("limit")) {
            try {
                limit = Math.max(1, Math.min(MAX_LIMIT, Integer.parseInt(query.get("limit"))));
            } catch (NumberFormatException e) {
                send(exchange, 400, error("limit must be a whole number, got '" + query.get("limit") + "'"));
                return;
            }
        }
        List<JournalEvent> events;
        if (query.containsKey("after")) {
            long after;
            try {
                after = Long.parseLong(query.get("after"));
            } catch (NumberFormatException e) {
                send(exchange, 400, error("after must be a sequence number, got '" + query.get("after") + "'"));
                return;
            }
            events = daemon.eventsAfter(after, limit);
        } else {
            String since = query.getOrDefault("since", "1h");
            Optional<Instant> from = parseSince(since, Instant.now());
            if (from.isEmpty()) {
                send(exchange, 400, error("since must be a duration such as 2h or an instant such as"
                        + " 2025-01-01T00:00:00Z, got '" + since + "'"));
                return;
            }
            events = daemon.eventsSince(from.get(), limit);
        }
        ArrayNode array = Payloads.JSON.createArrayNode();
        for (JournalEvent event : events) {
            ObjectNode node = array.addObject();
            node.put("seq", event.seq());
            node.put("kind", event.kind());
            node.put("time", event.at().toString());
            node.put("subject", event.subject().orElse(null));
            node.put("operator", event.operator().orElse(null));
            node.set("payload", Payloads.JSON.readTree(event.payloadJson()));
        }
        send(exchange, 200, array);
    }

    /** "2h" (before {@code now}) or an ISO-8601 instant. */
    public static Optional<Instant> parseSince(String text, Instant now) {
        try {
            return Optional.of(Instant.parse(text));
        } catch (DateTimeParseException e) {
            try {
                Duration back = DurationSyntax.parse(text);
                return Optional.of(now.minus(back));
            } catch (IllegalArgumentException notDuration) {
                return Optional.empty();
            }
        }
    }

    private static ObjectNode error(String message) {
        return Payloads.reply(Optional.of(message));
    }

    private static void send(HttpExchange exchange, int status, com.fasterxml.jackson.databind.JsonNode body)
            throws IOException {
        byte[] bytes = Payloads.JSON.writeValueAsBytes(body);
        exchange.getResponseHeaders().set("Content-Type", "application/json; charset=utf-8");
        exchange.sendResponseHeaders(status, bytes.length);
        try (OutputStream out = exchange.getResponseBody()) {
            out.write(bytes);
        }
    }

    private static byte[] readBody(InputStream in) throws IOException {
        byte[] bytes = in.readNBytes(OperatorCommand.MAX_BYTES + 1);
        return bytes;
    }

    private static Map<String, String> query(URI uri) {
        Map<String, String> values = new LinkedHashMap<>();
        String raw = uri.getRawQuery();
        if (raw == null) {
            return values;
        }
        for (String pair : raw.split("&")) {
            int eq = pair.indexOf('=');
            String key = URLDecoder.decode(eq < 0 ? pair : pair.substring(0, eq), StandardCharsets.UTF_8);
            String value = eq < 0 ? "" : URLDecoder.decode(pair.substring(eq + 1), StandardCharsets.UTF_8);
            values.put(key, value);
        }
        return values;
    }
}
