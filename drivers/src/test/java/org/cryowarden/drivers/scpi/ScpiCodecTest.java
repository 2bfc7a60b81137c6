package org.cryowarden.drivers.scpi;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.util.List;
import org.cryowarden.drivers.text.Terminator;
import org.junit.jupiter.api.Test;

class ScpiCodecTest {

    @Test
    void numericResponseFormatsNr1Nr2Nr3AreParsed() {
        // IEEE 488.2-1992 §8.7.2 (NR1 integer), §8.7.3 (NR2 explicit point), §8.7.4 (NR3 with exponent).
        assertThat(ScpiNumbers.parse("42")).isEqualTo(new ScpiValue.Number(42));
        assertThat(ScpiNumbers.parse("-0.5")).isEqualTo(new ScpiValue.Number(-0.5));
        assertThat(ScpiNumbers.parse("+1.234500E+02")).isEqualTo(new ScpiValue.Number(123.45));
        assertThat(ScpiNumbers.parse(" 7.735E+01 ")).isEqualTo(new ScpiValue.Number(77.35));
    }

    @Test
    void scpiNotANumberAndOverflowValuesAreRecognised() {
        // SCPI 1999 Volume 1 §7.2.1: 9.91E37 is NaN, 9.9E37 is +infinity, -9.9E37 is -infinity.
        assertThat(ScpiNumbers.parse("9.91E37")).isEqualTo(new ScpiValue.NotANumber());
        assertThat(ScpiNumbers.parse("+9.910000E+37")).isEqualTo(new ScpiValue.NotANumber());
        assertThat(ScpiNumbers.parse("9.9E37")).isEqualTo(new ScpiValue.Overflow(true));
        assertThat(ScpiNumbers.parse("-9.9E+37")).isEqualTo(new ScpiValue.Overflow(false));
    }

    @Test
    void textThatIsNotANumberIsMalformed() {
        for (String text : List.of("", "abc", "1.2.3", "NaN", "Infinity", "12 K", "0x1F", "1e", "--1", "1e99999")) {
            assertThat(ScpiNumbers.parse(text)).as(text).isInstanceOfAny(ScpiValue.Malformed.class,
                    ScpiValue.Overflow.class);
        }
        assertThat(ScpiNumbers.parse("1e99999")).isEqualTo(new ScpiValue.Overflow(true));
        assertThat(ScpiNumbers.parse("12 K")).isEqualTo(new ScpiValue.Malformed("12 K"));
    }

    @Test
    void nr3FormattingRoundTripsAndMapsSpecialValues() {
        assertThat(ScpiNumbers.formatNr3(77.35)).isEqualTo("+7.735000E+01");
        assertThat(ScpiNumbers.parse(ScpiNumbers.formatNr3(-0.001234))).isEqualTo(new ScpiValue.Number(-0.001234));
        assertThat(ScpiNumbers.formatNr3(Double.NaN)).isEqualTo("9.91E+37");
        assertThat(ScpiNumbers.parse(ScpiNumbers.formatNr3(Double.POSITIVE_INFINITY))).isEqualTo(new ScpiValue.Overflow(true));
    }

    @Test
    void identityHasFourFields() {
        // IEEE 488.2-1992 §10.14: manufacturer, model, serial number, firmware level (invented instrument).
        assertThat(Identity.parse("Northwind Cryo,LM-42,SN0815,2.1.0\r")).contains(
                new Identity("Northwind Cryo", "LM-42", "SN0815", "2.1.0"));
        assertThat(Identity.parse("Northwind Cryo,LM-42")).isEmpty();
    }

    @Test
    void errorQueueEntriesAreParsedAndNoErrorIsRecognised() {
        // SCPI 1999 Volume 2, SYSTem:ERRor?: <code>,"<text>"; empty queue 0,"No error"; -113 is "Undefined
        // header" (SCPI error list, from memory).
        assertThat(ErrorEntry.parse("0,\"No error\"")).contains(ErrorEntry.NO_ERROR);
        assertThat(ErrorEntry.parse("0,\"No error\"").orElseThrow().isNoError()).isTrue();
        assertThat(ErrorEntry.parse("-113,\"Undefined header\"")).contains(new ErrorEntry(-113, "Undefined header"));
        assertThat(ErrorEntry.parse("-113 Undefined header")).isEmpty();
        assertThat(new ErrorEntry(-222, "Data out of range").format()).isEqualTo("-222,\"Data out of range\"");
    }

    @Test
    void queriesEndWithTheConfiguredTerminator() {
        assertThat(new String(ScpiCodec.encode("*IDN?", Terminator.LF), StandardCharsets.US_ASCII)).isEqualTo("*IDN?\n");
        assertThat(new String(ScpiCodec.encode("MEAS:TEMP? A", Terminator.CRLF), StandardCharsets.US_ASCII))
                .isEqualTo("MEAS:TEMP? A\r\n");
    }

    @Test
    void instrumentSideSplitsProgramMessageUnitsAndParameters() {
        // IEEE 488.2-1992 §7.3: units separated by ';', header and data by white space, data by ','.
        List<ScpiCommand> commands = ScpiCodec.parseProgramMessage("MEAS:TEMP? A;*IDN?;:SOUR:VOLT 1.5,\"a;b\"")
                .orElseThrow();

        assertThat(commands).containsExactly(
                new ScpiCommand("MEAS:TEMP", true, List.of("A")),
                new ScpiCommand("*IDN", true, List.of()),
                new ScpiCommand(":SOUR:VOLT", false, List.of("1.5", "\"a;b\"")));
    }

    @Test
    void malformedProgramMessagesAreRefused() {
        assertThat(ScpiCodec.parseProgramMessage("MEAS:TEMP? \"open")).isEmpty();
        assertThat(ScpiCodec.parseProgramMessage("::?")).isEmpty();
        assertThat(ScpiCodec.parseProgramMessage("1ABC?")).isEmpty();
    }

    @Test
    void headersMatchShortAndLongFormsInAnyCase() {
        // SCPI 1999 Volume 1 §6.2.1: the upper-case part is the short form; either form is accepted.
        ScpiCommand shortForm = new ScpiCommand("meas:temp", true, List.of());
        ScpiCommand longForm = new ScpiCommand("MEASURE:TEMPERATURE", true, List.of());
        ScpiCommand halfway = new ScpiCommand("MEASU:TEMP", true, List.of());

        assertThat(shortForm.matches("MEASure:TEMPerature?")).isTrue();
        assertThat(longForm.matches("MEASure:TEMPerature?")).isTrue();
        assertThat(halfway.matches("MEASure:TEMPerature?")).isFalse();
        assertThat(new ScpiCommand("*idn", true, List.of()).matches("*IDN?")).isTrue();
    }
}
