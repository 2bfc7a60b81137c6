package org.cryowarden.drivers.builtin;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.OptionalInt;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.drivers.testing.ModbusTestDevice;
import org.cryowarden.drivers.testing.ScriptedTransport;
import org.cryowarden.drivers.testing.Sites;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.model.InstrumentDef;
import org.junit.jupiter.api.Test;

class ModbusRtuDriverTest {

    private final VirtualTimeSource time = new VirtualTimeSource(Instant.parse("2026-03-01T03:00:00Z"));
    private final DriverContext context = Sites.context(time, List.of(
            Sites.channel("o2-east", Unit.PERCENT_VOLUME, Duration.ofSeconds(1)),
            Sites.channel("ln2-level", Unit.PERCENT, Duration.ofSeconds(5))), List.of(Sites.output("exhaust-fan")));
    private final ModbusRtuDriverFactory factory = new ModbusRtuDriverFactory();

    @Test
    void loopCurrentBelowThreePointSixMilliampsReadsBadWireBreak() throws Exception {
        // NAMUR NE 43 (instrunexus.com NE 43 guide: below 3.6 mA is a failure): 2.1 mA on a 4-20 mA loop signals a failure.
        List<Reading> readings = poll(new ModbusTestDevice(4).input(0, 2_100), "o2-east");

        assertThat(readings).singleElement().satisfies(r -> {
            assertThat(r.quality()).isEqualTo(Quality.BAD);
            assertThat(r.reason()).isEqualTo("sensor failure / wire break: loop current 2.10 mA is below 3.6 mA (NAMUR NE 43)");
        });
    }

    @Test
    void loopCurrentInTheMeasuringRangeIsScaledToTheChannelUnit() throws Exception {
        // common practice: 4-20 mA over 0-25 %vol; 20 mA reads 25 %vol, 12 mA 12.5 %vol.
        assertThat(poll(new ModbusTestDevice(4).input(0, 20_000), "o2-east").get(0).value()).isEqualTo(25.0);
        assertThat(poll(new ModbusTestDevice(4).input(0, 12_000), "o2-east").get(0).value()).isEqualTo(12.5);
    }

    @Test
    void exceptionResponseReadsBadWithTheExceptionName() throws Exception {
        List<Reading> readings = poll(new ModbusTestDevice(4), "ln2-level");

        assertThat(readings.get(0).quality()).isEqualTo(Quality.BAD);
        assertThat(readings.get(0).reason()).isEqualTo("exception response 0x02 ILLEGAL DATA ADDRESS to read holding "
                + "registers 300+2 at unit 4");
    }

    @Test
    void busyDeviceIsCountedAsExceptionResponse() throws Exception {
        ModbusTestDevice device = new ModbusTestDevice(4).input(0, 12_000);
        device.behave(ModbusTestDevice.Behaviour.BUSY);
        InstrumentDriver driver = factory.create(instrument(), context);
        ScriptedTransport transport = open(device);

        driver.poll(List.of("o2-east"), transport);

        assertThat(driver.counters()).containsEntry("exception_response", 1L);
    }

    @Test
    void retriesAreSpentOnSilenceButNotOnExceptions() throws Exception {
        ModbusTestDevice device = new ModbusTestDevice(4).input(0, 12_000);
        device.behave(ModbusTestDevice.Behaviour.SILENT);
        InstrumentDriver driver = factory.create(instrument(), context);
        ScriptedTransport transport = open(device);

        Reading reading = driver.poll(List.of("o2-east"), transport).get(0);

        assertThat(reading.quality()).isEqualTo(Quality.STALE);
        assertThat(reading.reason()).isEqualTo("no reply from unit 4 within 100 ms to read input registers 0 at unit 4");
        assertThat(device.requests()).isEqualTo(3); // retries: 2
        device.behave(ModbusTestDevice.Behaviour.BUSY);
        driver.poll(List.of("o2-east"), transport);
        assertThat(device.requests()).isEqualTo(4);
    }

    @Test
    void writeToAHoldingOutputIsReadBack() throws Exception {
        ModbusTestDevice device = new ModbusTestDevice(4);
        InstrumentDriver driver = factory.create(instrument(), context);

        var result = driver.write("exhaust-fan", 75, open(device));

        assertThat(result.ok()).as(result.reason()).isTrue();
        assertThat(result.readback()).hasValue(75.0);
        assertThat(device.holdingValue(40)).isEqualTo(750); // scale 0.1
    }

    @Test
    void settingsProblemsArePositionedAndSayWhatWasExpected() {
        ConfigNode.Mapping settings = Sites.mapping("unit", "300", "timout", "1s");
        ConfigNode.Mapping point = Sites.mapping("table", "holdings", "address", "70000", "word_order", "little");
        InstrumentDef bad = Sites.instrument("gauge", "modbus-rtu", settings, Sites.point("o2-east", point));

        List<ConfigProblem> problems = factory.validate(bad, context);

        assertThat(problems).extracting(ConfigProblem::message).containsExactly(
                "unknown key 'timout' in settings of instrument 'gauge'; did you mean 'timeout'?",
                "unit in settings of instrument 'gauge' must be 1-247, got 300",
                "table in channel 'o2-east' of instrument 'gauge' must be one of coil, discrete, holding, input, "
                        + "got 'holdings'; did you mean 'holding'?",
                "address in channel 'o2-east' of instrument 'gauge' must be 0-65535, got 70000",
                "word_order in channel 'o2-east' of instrument 'gauge' applies to 32-bit types only, not uint16");
        assertThat(problems.get(0).position()).isEqualTo(settings.entries().get(1).keyPosition());
        assertThat(problems.get(1).position()).isEqualTo(settings.entries().get(0).value().position());
    }

    @Test
    void currentLoopNeedsTwoDifferentEnds() {
        InstrumentDef bad = Sites.instrument("gauge", "modbus-rtu", Sites.mapping("unit", "4"),
                Sites.point("o2-east", Sites.mapping("table", "input", "address", "0",
                        "current_loop", Sites.mapping("range", List.of("25")))));

        assertThat(factory.validate(bad, context)).extracting(ConfigProblem::message).containsExactly(
                "range in current_loop of channel 'o2-east' of instrument 'gauge' must be [value at 4 mA, value at "
                        + "20 mA], got 1 values");
    }

    @Test
    void outputOnAReadOnlyTableIsRefused() {
        InstrumentDef bad = Sites.instrument("gauge", "modbus-rtu", Sites.mapping("unit", "4"),
                Sites.outputPoint("exhaust-fan", Sites.mapping("table", "input", "address", "0")));

        assertThat(factory.validate(bad, context)).extracting(ConfigProblem::message).containsExactly(
                "output 'exhaust-fan' of instrument 'gauge' must use table coil or holding; input is read-only");
    }

    @Test
    void unitThatDidNotAnswerIsNotAskedForItsOtherPointsInTheSamePoll() throws Exception {
        // A late reply would come in while the next point is asked, and RTU frames carry no transaction number
        // (Modbus over Serial Line V1.02, §2.4.1): the rest of the poll is not asked and reads STALE.
        ModbusTestDevice device = new ModbusTestDevice(4).input(0, 12_000);
        device.behave(ModbusTestDevice.Behaviour.SILENT);
        InstrumentDriver driver = factory.create(instrument(), context);
        ScriptedTransport transport = open(device);

        List<Reading> readings = driver.poll(List.of("o2-east", "ln2-level"), transport);

        assertThat(readings).extracting(Reading::quality).containsExactly(Quality.STALE, Quality.STALE);
        assertThat(readings.get(1).reason()).isEqualTo("no reply from unit 4 within 100 ms to read input registers 0 "
                + "at unit 4; not asked for read holding registers 300+2 at unit 4 until the next poll");
        assertThat(transport.written()).hasSize(3); // the first point and its 2 retries, nothing for the second
        assertThat(driver.counters()).containsEntry("timeout", 1L).containsEntry("not_asked", 1L);

        device.behave(ModbusTestDevice.Behaviour.ANSWER);
        assertThat(driver.poll(List.of("o2-east", "ln2-level"), transport).get(0).quality()).isEqualTo(Quality.GOOD);
        assertThat(transport.written()).hasSize(5); // both points asked again at the next poll
    }

    @Test
    void neighboursLateReplyAheadOfTheOwnIsCountedAsForeignAndTheReadingIsGood() throws Exception {
        // A neighbour (unit 3) answers late: its valid frame comes in just ahead of unit 4's own reply, in the same
        // chunk. Not unit 4's fault (Modbus over Serial Line V1.02 §2.4.1: only the addressed slave replies).
        ModbusTestDevice device = new ModbusTestDevice(4).input(0, 12_000);
        byte[] late = org.cryowarden.drivers.modbus.ModbusSlaveCodec.encodeReadResponse(
                org.cryowarden.drivers.modbus.ModbusRequest.read(3,
                        org.cryowarden.drivers.modbus.FunctionCode.READ_INPUT_REGISTERS, 0, 1), new int[] {17_440});
        InstrumentDriver driver = factory.create(instrument(), context);
        ScriptedTransport transport = open(request -> {
            byte[] own = device.respond(request);
            byte[] both = java.util.Arrays.copyOf(late, late.length + own.length);
            System.arraycopy(own, 0, both, late.length, own.length);
            return both;
        });

        Reading reading = driver.poll(List.of("o2-east"), transport).get(0);

        // 12 mA on a 4-20 mA loop over 0-25 %vol is 12.5 %vol (linear scaling, common practice)
        assertThat(reading.quality()).as(reading.reason()).isEqualTo(Quality.GOOD);
        assertThat(reading.value()).isEqualTo(12.5);
        assertThat(driver.counters()).containsEntry("foreign_frame", 1L).containsEntry("ok", 1L)
                .doesNotContainKey("wrong_unit");
    }

    private List<Reading> poll(ModbusTestDevice device, String channel) throws Exception {
        InstrumentDriver driver = factory.create(instrument(), context);
        return driver.poll(List.of(channel), open(device));
    }

    private InstrumentDef instrument() {
        InstrumentDef instrument = Sites.instrument("hall-io", "modbus-rtu", Sites.mapping("unit", "4", "timeout", "100ms",
                        "retries", "2"),
                Sites.point("o2-east", Sites.mapping("table", "input", "address", "0", "scale", "0.001",
                        "current_loop", Sites.mapping("range", List.of("0", "25")))),
                Sites.point("ln2-level", Sites.mapping("table", "holding", "address", "300", "type", "float32",
                        "word_order", "little")),
                Sites.outputPoint("exhaust-fan", Sites.mapping("table", "holding", "address", "40", "scale", "0.1")));
        assertThat(factory.validate(instrument, context)).isEmpty();
        return instrument;
    }

    private static ScriptedTransport open(ScriptedTransport.Responder device) throws Exception {
        ScriptedTransport transport = new ScriptedTransport(device, OptionalInt.of(115200));
        transport.reopen();
        return transport;
    }
}
