package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.time.Instant;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.daemon.journal.NewEvent;

/**
 * One entry of the event stream before the journal numbers it: an engine decision mapped to words
 * ({@code alarm.raised}, {@code interlock.tripped}, ...) or something the daemon itself did ({@code config.reloaded},
 * {@code output.disagree}).
 *
 * @param payload the event's fields; the journal adds nothing, the MQTT payload adds {@code seq}, {@code kind} and
 *                {@code time}
 */
public record DaemonEvent(String kind, Instant at, Optional<String> subject, Optional<String> operator,
                          ObjectNode payload) {

    public DaemonEvent {
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(at, "at");
        Objects.requireNonNull(subject, "subject");
        Objects.requireNonNull(operator, "operator");
        Objects.requireNonNull(payload, "payload");
    }

    NewEvent toJournal() {
        return new NewEvent(kind, at, subject, operator, Payloads.text(payload));
    }

    /** The document published on {@code <prefix>/event} once the journal gave it {@code seq}. */
    ObjectNode published(long seq) {
        ObjectNode node = Payloads.object();
        node.put("seq", seq);
        node.put("kind", kind);
        node.put("time", at.toString());
        Payloads.putOptional(node, "subject", subject);
        Payloads.putOptional(node, "operator", operator);
        node.setAll(payload);
        return node;
    }

    /** One log line for the system journal. */
    String logLine(long seq) {
        StringBuilder line = new StringBuilder("event ").append(seq).append(' ').append(kind);
        subject.ifPresent(s -> line.append(' ').append(s));
        operator.ifPresent(o -> line.append(" by ").append(o));
        String text = payload.path("message").asText(payload.path("cause").asText(""));
        if (!text.isEmpty()) {
            line.append(": ").append(text);
        }
        return line.toString();
    }
}
