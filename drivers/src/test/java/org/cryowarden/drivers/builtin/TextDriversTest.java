package org.cryowarden.drivers.builtin;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.List;
import java.util.OptionalInt;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.drivers.testing.ScriptedTransport;
import org.cryowarden.drivers.testing.Sites;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.model.InstrumentDef;
import org.junit.jupiter.api.Test;

class TextDriversTest {

    private final VirtualTimeSource time = new VirtualTimeSource(Instant.parse("2026-03-01T03:00:00Z"));
    private final DriverContext context = Sites.context(time, List.of(
            Sites.channel("stage-temp", Unit.KELVIN, Duration.ofSeconds(1)),
            Sites.channel("o2-lab", Unit.PERCENT_VOLUME, Duration.ofSeconds(1))), List.of(Sites.output("heater")));

    @Test
    void scpiIdentityIsReadAtConnect() throws Exception {
        InstrumentDriver driver = scpi("false");
        ScriptedTransport transport = open(answers("Northwind Cryo, TB-7 ,SN77,1.0"));

        assertThat(driver.connect(transport)).contains("Northwind Cryo,TB-7,SN77,1.0");
        assertThat(text(transport.written().get(0))).isEqualTo("*IDN?\n");
    }

    @Test
    void scpiNotANumberAndOverflowReadBad() throws Exception {
        InstrumentDriver driver = scpi("false");

        // SCPI 1999 Volume 1 §7.2.1: 9.91E37 is not-a-number, 9.9E37 positive overflow.
        Reading nan = driver.poll(List.of("stage-temp"), open(answers("9.91E+37"))).get(0);
        Reading overflow = driver.poll(List.of("stage-temp"), open(answers("+9.9E37"))).get(0);
        Reading words = driver.poll(List.of("stage-temp"), open(answers("OVLD\u0007"))).get(0);

        assertThat(nan.reason()).isEqualTo("instrument reported not-a-number (9.91E37) for 'MEAS:TEMP? A'");
        assertThat(overflow.reason()).isEqualTo("instrument reported positive overflow (9.9E37) for 'MEAS:TEMP? A'");
        assertThat(words.reason()).isEqualTo("reply to 'MEAS:TEMP? A' is not a number: 'OVLD\\x07'");
        assertThat(List.of(nan, overflow, words)).allMatch(r -> r.quality() == Quality.BAD);
    }

    @Test
    void scpiErrorQueueIsDrainedAndAnErrorMakesTheReadingBad() throws Exception {
        InstrumentDriver driver = scpi("true");
        ScriptedTransport transport = open(answers("+4.2E+00", "-221,\"Settings conflict\"", "0,\"No error\""));

        Reading reading = driver.poll(List.of("stage-temp"), transport).get(0);

        assertThat(reading.quality()).isEqualTo(Quality.BAD);
        assertThat(reading.reason()).isEqualTo("instrument error -221,\"Settings conflict\" after 'MEAS:TEMP? A'");
        assertThat(transport.written()).extracting(TextDriversTest::text)
                .containsExactly("MEAS:TEMP? A\n", "SYST:ERR?\n", "SYST:ERR?\n");
        assertThat(driver.counters()).containsEntry("instrument_error", 1L);
    }

    @Test
    void scpiCleanErrorQueueKeepsTheReadingGood() throws Exception {
        Reading reading = scpi("true").poll(List.of("stage-temp"), open(answers("+4.2E+00", "0,\"No error\""))).get(0);

        assertThat(reading.quality()).isEqualTo(Quality.GOOD);
        assertThat(reading.value()).isEqualTo(4.2);
    }

    @Test
    void partialReplyWithoutTerminatorReadsBadAndSilenceReadsStale() throws Exception {
        InstrumentDriver driver = scpi("false");
        ScriptedTransport partial = open(written -> "+4.2".getBytes(StandardCharsets.US_ASCII));

        Reading cut = driver.poll(List.of("stage-temp"), partial).get(0);
        Reading silent = driver.poll(List.of("stage-temp"), open(written -> new byte[0])).get(0);

        assertThat(cut.quality()).isEqualTo(Quality.BAD);
        assertThat(cut.reason()).isEqualTo("partial reply to 'MEAS:TEMP? A' without terminator after 300 ms: '+4.2'");
        assertThat(silent.quality()).isEqualTo(Quality.STALE);
        assertThat(silent.reason()).isEqualTo("no reply to 'MEAS:TEMP? A' within 300 ms");
    }

    @Test
    void scpiOutputCommandCarriesTheValueAndIsReadBack() throws Exception {
        InstrumentDriver driver = scpi("false");
        ScriptedTransport transport = open(answers("+2.5E+01"));

        var result = driver.write("heater", 25, transport);

        assertThat(result.ok()).as(result.reason()).isTrue();
        assertThat(transport.written()).extracting(TextDriversTest::text).containsExactly("HTR 25\n", "HTR?\n");
    }

    @Test
    void lineQueryMatchesThePatternOrSaysWhyNot() throws Exception {
        InstrumentDriver driver = line("query", "64");

        Reading good = driver.poll(List.of("o2-lab"), open(answers("O2 20.9 %"))).get(0);
        Reading other = driver.poll(List.of("o2-lab"), open(answers("SENSOR WARMUP"))).get(0);

        assertThat(good.value()).isEqualTo(20.9);
        assertThat(other.reason()).isEqualTo("line 'SENSOR WARMUP' does not match pattern O2 (?<value>[-0-9.]+) %");
    }

    @Test
    void streamModeTakesTheNewestMatchingLine() throws Exception {
        InstrumentDriver driver = line("stream", "64");
        ScriptedTransport transport = open(written -> new byte[0]);
        driver.connect(transport);
        transport.push("O2 20.9 %\nT 21C\nO2 20.7 %\nO2 2".getBytes(StandardCharsets.US_ASCII));

        Reading reading = driver.poll(List.of("o2-lab"), transport).get(0);

        assertThat(reading.quality()).isEqualTo(Quality.GOOD);
        assertThat(reading.value()).isEqualTo(20.7);
        assertThat(transport.written()).isEmpty();
    }

    @Test
    void streamModeReportsOversizedLinesAndSilence() throws Exception {
        InstrumentDriver driver = line("stream", "16");
        ScriptedTransport transport = open(written -> new byte[0]);
        driver.connect(transport);
        transport.push("O2 20.9 % and a great deal more text\n".getBytes(StandardCharsets.US_ASCII));

        Reading oversized = driver.poll(List.of("o2-lab"), transport).get(0);
        Reading silent = driver.poll(List.of("o2-lab"), transport).get(0);

        assertThat(oversized.reason()).isEqualTo("line longer than 16 bytes (36 dropped)");
        assertThat(silent.quality()).isEqualTo(Quality.STALE);
        assertThat(silent.reason()).isEqualTo("no reply to a line matching O2 (?<value>[-0-9.]+) % within 300 ms");
    }

    @Test
    void lineSettingsProblemsSayWhatToDo() {
        InstrumentDef bad = Sites.instrument("o2", "line", Sites.mapping("mode", "stream"),
                Sites.point("o2-lab", Sites.mapping("query", "READ", "pattern", "O2 ([0-9.]+)")),
                Sites.outputPoint("heater", Sites.mapping()));

        assertThat(new LineDriverFactory().validate(bad, context)).extracting(ConfigProblem::message).containsExactly(
                "query in channel 'o2-lab' of instrument 'o2' is not used in stream mode (the device prints lines by "
                        + "itself); remove it or set mode: query",
                "pattern in channel 'o2-lab' of instrument 'o2' has no named group 'value' (write (?<value>...) "
                        + "around the number)",
                "the line driver reads only; output 'heater' of instrument 'o2' cannot be driven (use modbus-rtu or "
                        + "scpi for outputs)");
    }

    private InstrumentDriver scpi(String errorQueue) {
        InstrumentDef instrument = Sites.instrument("bridge", "scpi", Sites.mapping("timeout", "300ms",
                        "error_queue", errorQueue),
                Sites.point("stage-temp", Sites.mapping("query", "MEAS:TEMP? A")),
                Sites.outputPoint("heater", Sites.mapping("command", "HTR {value}", "readback", "HTR?")));
        ScpiDriverFactory factory = new ScpiDriverFactory();
        assertThat(factory.validate(instrument, context)).isEmpty();
        return factory.create(instrument, context);
    }

    private InstrumentDriver line(String mode, String maxLine) {
        InstrumentDef instrument = Sites.instrument("o2", "line", Sites.mapping("mode", mode, "timeout", "300ms",
                        "max_line", maxLine),
                mode.equals("query")
                        ? Sites.point("o2-lab", Sites.mapping("query", "READ", "pattern", "O2 (?<value>[-0-9.]+) %"))
                        : Sites.point("o2-lab", Sites.mapping("pattern", "O2 (?<value>[-0-9.]+) %")));
        LineDriverFactory factory = new LineDriverFactory();
        assertThat(factory.validate(instrument, context)).isEmpty();
        return factory.create(instrument, context);
    }

    /** A device answering each write with the next of {@code lines}, then silence. */
    private static ScriptedTransport.Responder answers(String... lines) {
        Deque<String> queue = new ArrayDeque<>(List.of(lines));
        return written -> queue.isEmpty() ? new byte[0]
                : (queue.poll() + "\r\n").getBytes(StandardCharsets.ISO_8859_1);
    }

    private static ScriptedTransport open(ScriptedTransport.Responder device) throws Exception {
        ScriptedTransport transport = new ScriptedTransport(device, OptionalInt.empty());
        transport.reopen();
        return transport;
    }

    private static String text(byte[] bytes) {
        return new String(bytes, StandardCharsets.ISO_8859_1);
    }
}
