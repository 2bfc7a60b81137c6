package org.cryowarden.drivers.scpi;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Optional;

/**
 * Coverage-guided fuzzing of the SCPI parsers with Jazzer, over the lines a device or a controller can send
 * (bytes decoded as ISO-8859-1, as the line assembler does; up to 4096 bytes, the largest {@code max_line}).
 * Every parser must answer, never throw, and what it accepts must survive a format/parse round trip.
 */
class ScpiFuzzTest {

    /** The longest line a text instrument accepts ({@code max_line} is at most 4096). */
    private static final int MAX_LINE = 4096;

    @FuzzTest(maxDuration = "10s")
    void responseParsersClassifyAnyLine(byte[] input) {
        String line = line(input);

        ScpiValue value = ScpiNumbers.parse(line);
        if (value instanceof ScpiValue.Number number) {
            assertThat(Double.isFinite(number.value())).isTrue();
            assertThat(Math.abs(number.value())).isLessThan(ScpiNumbers.OVERFLOW);
            // What an instrument would send for this value reads back as the same number (NR3 keeps 7 digits).
            ScpiValue again = ScpiNumbers.parse(ScpiNumbers.formatNr3(number.value()));
            if (again instanceof ScpiValue.Number back) {
                assertThat(back.value()).isCloseTo(number.value(), within(Math.abs(number.value()) * 1e-6 + 1e-300));
            } else {
                // Values within 1e-6 of the reserved codes print as the reserved codes.
                assertThat(Math.abs(number.value())).isGreaterThan(9.8e37);
            }
        } else if (value instanceof ScpiValue.Malformed malformed) {
            assertThat(malformed.text()).isEqualTo(line);
        }

        Optional<ErrorEntry> entry = ErrorEntry.parse(line);
        entry.ifPresent(e -> assertThat(ErrorEntry.parse(e.format())).contains(e));

        Optional<Identity> identity = Identity.parse(line);
        identity.ifPresent(id -> assertThat(Identity.parse(id.format())).contains(id));
    }

    @FuzzTest(maxDuration = "10s")
    void instrumentParsesAnyProgramMessage(byte[] input) {
        String line = line(input);

        Optional<List<ScpiCommand>> commands = ScpiCodec.parseProgramMessage(line);

        commands.ifPresent(list -> {
            for (ScpiCommand command : list) {
                assertThat(command.header()).isNotEmpty().doesNotContain(";").doesNotContainAnyWhitespaces();
                assertThat(command.parameters()).doesNotContainNull();
                // Header matching against the instrument's own command table never throws either.
                command.matches("MEASure:TEMPerature?");
                command.matches("*IDN?");
                command.matches("SYSTem:ERRor");
            }
        });
    }

    private static String line(byte[] input) {
        int length = Math.min(input.length, MAX_LINE);
        return new String(input, 0, length, StandardCharsets.ISO_8859_1);
    }
}
