package org.cryowarden.daemon.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.io.PrintWriter;
import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import org.cryowarden.daemon.run.Payloads;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * The commands that talk to a running daemon through its HTTP API: {@code status}, {@code alarms}, {@code events},
 * {@code ack}, {@code shelve}, {@code reset}, {@code reload}. Tables for people, {@code --json} for scripts.
 * Exit codes: 0 done, 2 refused or bad input, 3 no daemon answered.
 */
final class ClientCommands {

    static final int NO_DAEMON = 3;

    private ClientCommands() {
    }

    static List<Object> all() {
        return List.of(new Status(), new Alarms(), new Events(), new Ack(), new Shelve(), new Reset(), new Reload());
    }

    /** Shared run: call, print, map the answer to an exit code. */
    abstract static class ClientCommand implements Callable<Integer> {
        @CommandLine.Spec
        CommandLine.Model.CommandSpec spec;

        @Mixin
        ApiClient client;

        abstract ApiClient.Answer call(ApiClient client) throws IOException, InterruptedException;

        abstract void table(JsonNode body, PrintWriter out);

        @Override
        public Integer call() throws InterruptedException {
            PrintWriter out = spec.commandLine().getOut();
            PrintWriter err = spec.commandLine().getErr();
            ApiClient.Answer answer;
            try {
                answer = call(client);
            } catch (IOException e) {
                err.println(e.getMessage());
                err.flush();
                return NO_DAEMON;
            }
            if (answer.status() >= 300) {
                err.println("refused: " + answer.body().path("error").asText(answer.body().toString()));
                answer.body().path("errors").forEach(e -> err.println(e.asText()));
                err.flush();
                return CheckCommand.INVALID;
            }
            if (client.json) {
                out.println(answer.body().toPrettyString());
            } else {
                table(answer.body(), out);
            }
            out.flush();
            return 0;
        }
    }

    static String command(String target, String operator, String note, String duration, String reason) {
        ObjectNode body = Payloads.object();
        body.put("target", target);
        body.put("operator", operator);
        if (note != null) {
            body.put("note", note);
        }
        if (duration != null) {
            body.put("duration", duration);
        }
        if (reason != null) {
            body.put("reason", reason);
        }
        return Payloads.text(body);
    }

    static void done(JsonNode body, PrintWriter out) {
        out.println(body.path("ok").asBoolean() ? "done" : "refused: " + body.path("error").asText());
    }

    static void rows(PrintWriter out, List<String[]> rows) {
        int columns = rows.get(0).length;
        int[] widths = new int[columns];
        for (String[] row : rows) {
            for (int i = 0; i < columns; i++) {
                widths[i] = Math.max(widths[i], row[i].length());
            }
        }
        for (String[] row : rows) {
            StringBuilder line = new StringBuilder();
            for (int i = 0; i < columns; i++) {
                line.append(i == columns - 1 ? row[i] : String.format("%-" + widths[i] + "s  ", row[i]));
            }
            out.println(line.toString().stripTrailing());
        }
    }

    static String text(JsonNode node, String key) {
        JsonNode value = node.path(key);
        return value.isNull() || value.isMissingNode() ? "-" : value.asText();
    }

    @Command(name = "status", description = "Show the running daemon's status.", mixinStandardHelpOptions = true)
    static final class Status extends ClientCommand {
        @Override
        ApiClient.Answer call(ApiClient client) throws IOException, InterruptedException {
            return client.get("/api/status");
        }

        @Override
        void table(JsonNode body, PrintWriter out) {
            List<String[]> rows = new ArrayList<>();
            for (String key : List.of("site", "version", "started", "broker", "mqtt_connected", "prefix", "journal",
                    "channels", "rules", "readings_processed", "reading_drops", "outbox_depth")) {
                rows.add(new String[] {key, text(body, key)});
            }
            body.path("buses").forEach(b -> rows.add(new String[] {"bus " + b.path("bus").asText(),
                b.path("up").asBoolean() ? "up" : "down"}));
            rows(out, rows);
        }
    }

    @Command(name = "alarms", description = "List the alarms and their states.", mixinStandardHelpOptions = true)
    static final class Alarms extends ClientCommand {
        @Option(names = "--all", description = "include alarms in the normal state")
        boolean all;

        @Override
        ApiClient.Answer call(ApiClient client) throws IOException, InterruptedException {
            return client.get("/api/alarms");
        }

        @Override
        void table(JsonNode body, PrintWriter out) {
            List<String[]> rows = new ArrayList<>();
            rows.add(new String[] {"ALARM", "STATE", "PRIORITY", "VALUE", "SINCE", "ACKNOWLEDGED BY"});
            body.forEach(a -> {
                if (all || !a.path("state").asText().equals("normal")) {
                    rows.add(new String[] {a.path("alarm").asText(), a.path("state").asText(),
                        a.path("priority").asText(), a.path("value").isNumber()
                            ? a.path("value").asDouble() + " " + a.path("unit").asText() : "-",
                        a.path("since").asText(), text(a, "acknowledged_by")});
                }
            });
            if (rows.size() == 1) {
                out.println("no active alarms");
                return;
            }
            rows(out, rows);
        }
    }

    @Command(name = "events", description = "List journaled events.", mixinStandardHelpOptions = true)
    static final class Events extends ClientCommand {
        @Option(names = "--since", paramLabel = "TIME", defaultValue = "1h",
                description = "a duration back from now (2h) or an instant (default ${DEFAULT-VALUE})")
        String since;

        @Option(names = "--after", paramLabel = "SEQ", description = "events after this sequence number instead")
        Long after;

        @Override
        ApiClient.Answer call(ApiClient client) throws IOException, InterruptedException {
            return client.get(after != null ? "/api/events?after=" + after
                    : "/api/events?since=" + URLEncoder.encode(since, StandardCharsets.UTF_8));
        }

        @Override
        void table(JsonNode body, PrintWriter out) {
            List<String[]> rows = new ArrayList<>();
            rows.add(new String[] {"SEQ", "TIME", "KIND", "SUBJECT", "OPERATOR", "CAUSE"});
            body.forEach(e -> rows.add(new String[] {e.path("seq").asText(), e.path("time").asText(),
                e.path("kind").asText(), text(e, "subject"), text(e, "operator"),
                e.path("payload").path("cause").asText("")}));
            rows(out, rows);
        }
    }

    @Command(name = "ack", description = "Acknowledge an alarm.", mixinStandardHelpOptions = true)
    static final class Ack extends ClientCommand {
        @Parameters(paramLabel = "ALARM")
        String alarm;

        @Option(names = "--by", required = true, paramLabel = "NAME", description = "who acknowledges")
        String by;

        @Option(names = "--note", paramLabel = "TEXT")
        String note;

        @Override
        ApiClient.Answer call(ApiClient client) throws IOException, InterruptedException {
            return client.post("/api/commands/ack", command(alarm, by, note, null, null));
        }

        @Override
        void table(JsonNode body, PrintWriter out) {
            done(body, out);
        }
    }

    @Command(name = "shelve", description = "Shelve an alarm for a while.", mixinStandardHelpOptions = true)
    static final class Shelve extends ClientCommand {
        @Parameters(paramLabel = "ALARM")
        String alarm;

        @Option(names = "--for", required = true, paramLabel = "TIME", description = "how long, e.g. 1h")
        String duration;

        @Option(names = "--by", required = true, paramLabel = "NAME")
        String by;

        @Option(names = "--reason", required = true, paramLabel = "TEXT")
        String reason;

        @Override
        ApiClient.Answer call(ApiClient client) throws IOException, InterruptedException {
            return client.post("/api/commands/shelve", command(alarm, by, null, duration, reason));
        }

        @Override
        void table(JsonNode body, PrintWriter out) {
            done(body, out);
        }
    }

    @Command(name = "reset", description = "Reset a tripped interlock whose cause is clear.",
            mixinStandardHelpOptions = true)
    static final class Reset extends ClientCommand {
        @Parameters(paramLabel = "INTERLOCK")
        String interlock;

        @Option(names = "--by", required = true, paramLabel = "NAME")
        String by;

        @Override
        ApiClient.Answer call(ApiClient client) throws IOException, InterruptedException {
            return client.post("/api/commands/reset", command(interlock, by, null, null, null));
        }

        @Override
        void table(JsonNode body, PrintWriter out) {
            done(body, out);
        }
    }

    @Command(name = "reload", description = "Re-read the site and rule files of the running daemon.",
            mixinStandardHelpOptions = true)
    static final class Reload extends ClientCommand {
        @Override
        ApiClient.Answer call(ApiClient client) throws IOException, InterruptedException {
            return client.post("/api/reload", "{}");
        }

        @Override
        void table(JsonNode body, PrintWriter out) {
            out.println("reloaded");
        }
    }
}
