package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.util.Arrays;

/**
 * Coverage-guided fuzzing with Jazzer of the operator command parser (what MQTT and the HTTP API hand it): any
 * verb and body is either a command whose fields are all set and trimmed, or a refusal in words; no exception and
 * no hang. The seed corpus holds valid commands of every verb and the tricks a body might try (repeated keys,
 * trailing objects, deep nesting, odd escapes). The first byte picks the verb (its low four bits: 0 to 4 one of
 * {@link OperatorCommand#VERBS}, anything else an unknown verb); the rest is the body.
 */
class OperatorCommandFuzzTest {

    @FuzzTest(maxDuration = "10s")
    void parserAcceptsOrRefusesAnyBody(byte[] input) {
        int pick = input.length == 0 ? 0 : input[0] & 0x0f;
        String verb = pick < OperatorCommand.VERBS.size() ? OperatorCommand.VERBS.get(pick) : "verb-" + pick;
        byte[] body = input.length == 0 ? input : Arrays.copyOfRange(input, 1, input.length);
        OperatorCommand.Parsed parsed = OperatorCommand.parse(verb, body);

        assertThat(parsed.command().isPresent()).isNotEqualTo(parsed.error().isPresent());
        parsed.error().ifPresent(error -> assertThat(error).isNotBlank());
        if (parsed.command().isPresent()) {
            OperatorCommand command = parsed.command().get();
            assertThat(OperatorCommand.VERBS).contains(command.verb());
            assertThat(body.length).isLessThanOrEqualTo(OperatorCommand.MAX_BYTES);
            assertThat(command.target()).isNotBlank().isEqualTo(command.target().strip());
            assertThat(command.operator()).isNotBlank().isEqualTo(command.operator().strip());
            if (command.verb().equals("shelve") || command.verb().equals("bypass")) {
                assertThat(command.duration()).hasValueSatisfying(d -> assertThat(d).isPositive());
                assertThat(command.reason()).isNotBlank();
            }
        }
    }
}
