package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.Optional;
import org.junit.jupiter.api.Test;

/** The command bodies from MQTT and HTTP: what is accepted, and the exact reply to everything refused. */
class OperatorCommandTest {

    @Test
    void acknowledgementWithNoteIsAccepted() {
        OperatorCommand.Parsed parsed = parse("ack",
                "{\"target\": \"o2-low\", \"operator\": \" Ada \", \"note\": \"fan running\"}");

        assertThat(parsed.error()).isEmpty();
        assertThat(parsed.command()).contains(new OperatorCommand("ack", "o2-low", "Ada", "fan running",
                Optional.empty(), ""));
    }

    @Test
    void shelveAndBypassCarryTheirDurationAndReason() {
        assertThat(parse("shelve", "{\"target\": \"o2-east-stale\", \"operator\": \"Grace\", \"duration\": \"1h30min\","
                + " \"reason\": \"sensor swap\"}").command()).contains(new OperatorCommand("shelve", "o2-east-stale",
                "Grace", "", Optional.of(Duration.ofMinutes(90)), "sensor swap"));
        assertThat(parse("bypass", "{\"target\": \"ventilation\", \"operator\": \"Grace\", \"duration\": \"2h\","
                + " \"reason\": \"fan service\"}").command().orElseThrow().duration()).contains(Duration.ofHours(2));
    }

    @Test
    void malformedJsonIsRefusedWithTheParserMessage() {
        assertThat(refusal("ack", "{\"target\": \"o2-low\""))
                .startsWith("command body is not valid JSON: Unexpected end-of-input");
        assertThat(refusal("ack", "")).isEqualTo("command body must be a JSON object such as {\"target\": \"o2-low\","
                + " \"operator\": \"Ada\"}");
        assertThat(refusal("ack", "[\"o2-low\"]")).isEqualTo("command body must be a JSON object such as"
                + " {\"target\": \"o2-low\", \"operator\": \"Ada\"}");
    }

    @Test
    void unknownFieldAndNonTextFieldAreRefused() {
        assertThat(refusal("ack", "{\"target\": \"o2-low\", \"operator\": \"Ada\", \"force\": \"yes\"}"))
                .isEqualTo("unknown field 'force'; expected target, operator, note, duration, reason");
        assertThat(refusal("ack", "{\"target\": \"o2-low\", \"operator\": 7}"))
                .isEqualTo("field 'operator' must be text");
    }

    @Test
    void missingOperatorOrTargetIsRefused() {
        assertThat(refusal("ack", "{\"target\": \"o2-low\"}")).isEqualTo("missing operator: say who is acting");
        assertThat(refusal("ack", "{\"target\": \"o2-low\", \"operator\": \"   \"}"))
                .isEqualTo("missing operator: say who is acting");
        assertThat(refusal("reset", "{\"operator\": \"Ada\"}"))
                .isEqualTo("missing target: name the alarm or interlock");
    }

    @Test
    void shelveWithoutDurationOrReasonOrWithABadDurationIsRefused() {
        assertThat(refusal("shelve", "{\"target\": \"o2-low\", \"operator\": \"Ada\", \"reason\": \"swap\"}"))
                .isEqualTo("missing duration for shelve, e.g. \"1h\"");
        assertThat(refusal("bypass", "{\"target\": \"ventilation\", \"operator\": \"Ada\", \"duration\": \"1h\"}"))
                .isEqualTo("missing reason for bypass: say why");
        assertThat(refusal("shelve", "{\"target\": \"o2-low\", \"operator\": \"Ada\", \"duration\": \"0s\","
                + " \"reason\": \"swap\"}")).isEqualTo("duration must be positive, got '0s'");
        assertThat(refusal("shelve", "{\"target\": \"o2-low\", \"operator\": \"Ada\", \"duration\": \"soon\","
                + " \"reason\": \"swap\"}")).startsWith("duration: ");
    }

    @Test
    void oversizedBodyIsRefusedUnread() {
        String note = "x".repeat(OperatorCommand.MAX_BYTES);
        String body = "{\"target\": \"o2-low\", \"operator\": \"Ada\", \"note\": \"" + note + "\"}";

        assertThat(refusal("ack", body)).isEqualTo("command body too large: " + body.length()
                + " bytes, at most 4096");
    }

    @Test
    void unknownVerbIsRefused() {
        assertThat(refusal("silence", "{\"target\": \"o2-low\", \"operator\": \"Ada\"}"))
                .isEqualTo("unknown command 'silence'; expected one of ack, shelve, unshelve, reset, bypass");
    }

    @Test
    void repeatedKeyIsRefusedSoThatASecondOperatorCannotRideAlong() {
        // RFC 8259 section 4: names within an object SHOULD be unique; with repeats, parsers disagree on which wins.
        assertThat(refusal("ack", "{\"target\": \"o2-low\", \"operator\": \"Ada\", \"operator\": \"Eve\"}"))
                .isEqualTo("command body is not valid JSON: Duplicate field 'operator'");
        assertThat(refusal("reset", "{\"target\": \"o2-low\", \"target\": \"ventilation\", \"operator\": \"Ada\"}"))
                .isEqualTo("command body is not valid JSON: Duplicate field 'target'");
    }

    @Test
    void secondObjectAfterTheFirstIsRefused() {
        assertThat(refusal("ack", "{\"target\": \"o2-low\", \"operator\": \"Ada\"} {\"target\": \"x\"}"))
                .isEqualTo("command body goes on after its JSON object (at character 41); send one object");
        assertThat(parse("ack", "{\"target\": \"o2-low\", \"operator\": \"Ada\"}\n").error()).isEmpty();
    }

    // ---- helpers ----

    private static OperatorCommand.Parsed parse(String verb, String body) {
        return OperatorCommand.parse(verb, body.getBytes(StandardCharsets.UTF_8));
    }

    private static String refusal(String verb, String body) {
        OperatorCommand.Parsed parsed = parse(verb, body);
        assertThat(parsed.command()).isEmpty();
        return parsed.error().orElseThrow();
    }
}
