package org.cryowarden.daemon.demo;

import com.fasterxml.jackson.databind.JsonNode;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.BooleanSupplier;
import org.cryowarden.daemon.run.Payloads;

/** What a dashboard sees of a daemon running as its own process, read from a {@link Subscriber}'s messages. */
final class DashboardView {

    private DashboardView() {
    }

    static Map<String, JsonNode> alarms(Subscriber subscriber, String prefix) {
        Map<String, JsonNode> alarms = new LinkedHashMap<>();
        for (Subscriber.Message message : new ArrayList<>(subscriber.received)) {
            if (message.topic().startsWith(prefix + "/alarm/")) {
                alarms.put(message.topic().substring((prefix + "/alarm/").length()), Subscriber.json(message));
            }
        }
        return alarms;
    }

    static JsonNode state(Subscriber subscriber, String prefix, String topic) {
        List<Subscriber.Message> messages = subscriber.on(prefix + "/" + topic);
        return messages.isEmpty() ? Payloads.object() : Subscriber.json(messages.get(messages.size() - 1));
    }

    static List<String> events(Subscriber subscriber, String prefix) {
        return subscriber.on(prefix + "/event").stream().map(Subscriber::json)
                .map(e -> e.path("kind").asText() + " " + e.path("subject").asText()).toList();
    }


    /** Polls {@code condition} every 20 ms for at most {@code seconds}; shows the process's output on failure. */
    static void await(BooleanSupplier condition, int seconds, JarProcess process) throws Exception {
        long deadline = System.nanoTime() + Duration.ofSeconds(seconds).toNanos();
        while (!condition.getAsBoolean()) {
            if (System.nanoTime() > deadline) {
                throw new AssertionError("condition not met within " + seconds + " s"
                        + (process == null ? "" : "; output:\n" + process.output()));
            }
            Thread.sleep(20);
        }
    }
}
