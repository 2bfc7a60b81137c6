package org.cryowarden.daemon.run;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectReader;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.Iterator;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.DurationSyntax;

/**
 * An operator's command from MQTT, the HTTP API or the CLI, checked for form before it reaches the engine (which
 * then checks the target and the state).
 *
 * @param verb     ack, shelve, unshelve, reset, bypass
 * @param target   the alarm or interlock id
 * @param operator who acts
 * @param note     free text for an acknowledgement; empty when none
 * @param duration how long a shelving or bypass lasts
 * @param reason   why it is shelved or bypassed
 */
public record OperatorCommand(String verb, String target, String operator, String note, Optional<Duration> duration,
                              String reason) {

    /** Larger bodies are refused unread. */
    public static final int MAX_BYTES = 4096;

    public static final List<String> VERBS = List.of("ack", "shelve", "unshelve", "reset", "bypass");

    private static final List<String> FIELDS = List.of("target", "operator", "note", "duration", "reason");

    /**
     * Refuses a repeated key and anything after the object: otherwise the last of two {@code "operator"} keys
     * would win unseen by whatever read the first, and a second object could ride along behind the first.
     */
    private static final ObjectReader STRICT = Payloads.JSON.reader()
            .with(JsonParser.Feature.STRICT_DUPLICATE_DETECTION);

    public OperatorCommand {
        Objects.requireNonNull(verb, "verb");
        Objects.requireNonNull(target, "target");
        Objects.requireNonNull(operator, "operator");
        Objects.requireNonNull(note, "note");
        Objects.requireNonNull(duration, "duration");
        Objects.requireNonNull(reason, "reason");
    }

    /**
     * The journal record of this command once the engine accepted it ({@code command.accepted}): every field, and the
     * exact instant, so that a replay can give the same command at the same instant.
     */
    DaemonEvent accepted(java.time.Instant at) {
        com.fasterxml.jackson.databind.node.ObjectNode payload = Payloads.object();
        payload.put("cause", "operator command accepted");
        payload.put("verb", verb);
        payload.put("target", target);
        payload.put("operator", operator);
        payload.put("note", note);
        duration.ifPresent(d -> payload.put("duration", d.toString()));
        payload.put("reason", reason);
        payload.put("instant", at.toString());
        return new DaemonEvent("command.accepted", at, Optional.of(target), Optional.of(operator), payload);
    }

    /** A parsed command or the reason it was refused, word for word what the reply carries. */
    public record Parsed(Optional<OperatorCommand> command, Optional<String> error) {
        static Parsed ok(OperatorCommand command) {
            return new Parsed(Optional.of(command), Optional.empty());
        }

        static Parsed refused(String error) {
            return new Parsed(Optional.empty(), Optional.of(error));
        }
    }

    /** Reads a JSON body {@code {"target": ..., "operator": ..., ...}} for {@code verb}. */
    public static Parsed parse(String verb, byte[] body) {
        if (!VERBS.contains(verb)) {
            return Parsed.refused("unknown command '" + verb + "'; expected one of " + String.join(", ", VERBS));
        }
        if (body.length > MAX_BYTES) {
            return Parsed.refused("command body too large: " + body.length + " bytes, at most " + MAX_BYTES);
        }
        JsonNode node;
        try (JsonParser parser = STRICT.createParser(new String(body, StandardCharsets.UTF_8))) {
            node = STRICT.readTree(parser);
            if (node != null && parser.nextToken() != null) {
                return Parsed.refused("command body goes on after its JSON object (at character "
                        + (parser.currentTokenLocation().getCharOffset() + 1) + "); send one object");
            }
        } catch (JsonProcessingException e) {
            return Parsed.refused("command body is not valid JSON: " + e.getOriginalMessage());
        } catch (java.io.IOException e) {
            return Parsed.refused("command body is not valid JSON: " + e.getMessage());
        }
        if (node == null || !node.isObject()) {
            return Parsed.refused("command body must be a JSON object such as {\"target\": \"o2-low\", \"operator\":"
                    + " \"Ada\"}");
        }
        for (Iterator<String> names = node.fieldNames(); names.hasNext(); ) {
            String name = names.next();
            if (!FIELDS.contains(name)) {
                return Parsed.refused("unknown field '" + name + "'; expected " + String.join(", ", FIELDS));
            }
            if (!node.get(name).isTextual()) {
                return Parsed.refused("field '" + name + "' must be text");
            }
        }
        String target = node.path("target").asText("").strip();
        String operator = node.path("operator").asText("").strip();
        if (target.isEmpty()) {
            return Parsed.refused("missing target: name the alarm or interlock");
        }
        if (operator.isEmpty()) {
            return Parsed.refused("missing operator: say who is acting");
        }
        String note = node.path("note").asText("").strip();
        String reason = node.path("reason").asText("").strip();
        Optional<Duration> duration = Optional.empty();
        if (verb.equals("shelve") || verb.equals("bypass")) {
            String text = node.path("duration").asText("").strip();
            if (text.isEmpty()) {
                return Parsed.refused("missing duration for " + verb + ", e.g. \"1h\"");
            }
            try {
                duration = Optional.of(DurationSyntax.parse(text));
            } catch (IllegalArgumentException e) {
                return Parsed.refused("duration: " + e.getMessage());
            }
            if (duration.get().isZero() || duration.get().isNegative()) {
                return Parsed.refused("duration must be positive, got '" + text + "'");
            }
            if (reason.isEmpty()) {
                return Parsed.refused("missing reason for " + verb + ": say why");
            }
        }
        return Parsed.ok(new OperatorCommand(verb, target, operator, note, duration, reason));
    }
}
