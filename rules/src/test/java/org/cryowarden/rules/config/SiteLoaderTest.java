package org.cryowarden.rules.config;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.BusDef;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.OutputDef;
import org.cryowarden.rules.model.PointDef;
import org.cryowarden.rules.model.SiteDef;
import org.cryowarden.rules.model.ValueRange;
import org.junit.jupiter.api.Test;

class SiteLoaderTest {

    private static final String SMALL = "src/test/resources/config/small-site.yaml";
    private static final String BROKEN = "src/test/resources/config/broken-site.yaml";

    @Test
    void smallSiteLoadsIntoModelRecords() throws ConfigException {
        SiteDef site = SiteLoader.load(Path.of(SMALL));

        assertThat(site.name()).isEqualTo("Test cellar");
        assertThat(site.ambientPressurePa()).isEqualTo(98_000.0);
        assertThat(site.channels()).extracting(ChannelDef::id)
                .containsExactly("o2-a", "o2-b", "o2-c", "bath-pressure", "cold-plate");
        assertThat(site.channels().get(0)).isEqualTo(new ChannelDef("o2-a", Unit.PERCENT_VOLUME, "Oxygen A",
                Duration.ofSeconds(1), Duration.ofSeconds(5), Optional.of(new ValueRange(0, 25)), at(SMALL, 13, 13)));
        // Defaults: period 1s, stale after three periods, no description, no valid range.
        assertThat(site.channels().get(1)).isEqualTo(new ChannelDef("o2-b", Unit.PERCENT_VOLUME, "",
                Duration.ofSeconds(1), Duration.ofSeconds(3), Optional.empty(), at(SMALL, 20, 13)));
        assertThat(site.channels().get(3).unit()).isEqualTo(Unit.MILLIBAR_GAUGE);
        assertThat(site.outputs()).containsExactly(new OutputDef("fan", "Exhaust fan", 0, at(SMALL, 37, 13)));
        assertThat(site.derived()).containsExactly(new DerivedChannelDef("o2-lowest", "min",
                List.of("o2-a", "o2-b", "o2-c"), Unit.PERCENT_VOLUME, Map.of(), "Lowest oxygen", at(SMALL, 42, 5)));

        BusDef bus = site.buses().get(0);
        assertThat(bus.id()).isEqualTo("bus-1");
        assertThat(bus.transport().kind()).isEqualTo("serial");
        assertThat(bus.transport().settings().keys()).containsExactly("port", "baud");
        InstrumentDef instrument = bus.instruments().get(0);
        assertThat(instrument.driver()).isEqualTo("modbus-rtu");
        assertThat(instrument.settings().keys()).containsExactly("unit", "timeout");
        assertThat(instrument.points()).extracting(PointDef::channel, PointDef::output)
                .containsExactly(
                        org.assertj.core.groups.Tuple.tuple("o2-a", false),
                        org.assertj.core.groups.Tuple.tuple("o2-b", false),
                        org.assertj.core.groups.Tuple.tuple("o2-c", false),
                        org.assertj.core.groups.Tuple.tuple("bath-pressure", false),
                        org.assertj.core.groups.Tuple.tuple("cold-plate", false),
                        org.assertj.core.groups.Tuple.tuple("fan", true));
        // Driver point settings stay positioned nodes for the drivers module.
        PointDef first = instrument.points().get(0);
        assertThat(first.settings().entry("address").orElseThrow().keyPosition()).isEqualTo(at(SMALL, 19, 35));
    }

    @Test
    void brokenSiteReportsEveryErrorInOneRun() {
        assertThat(problems(BROKEN)).containsExactly(
                BROKEN + ":4:21: 'ambient_pressure' in the 'site' section must be an absolute pressure, found the "
                        + "gauge pressure '1 bar(g)'; write e.g. 101.325 kPa",
                BROKEN + ":7:23: unknown transport kind 'serail' in the transport of bus 'bus-1': expected serial or "
                        + "tcp; did you mean 'serial'?",
                BROKEN + ":14:13: unknown key 'stale_afer' in channel 'o2-a': expected one of id, unit, description, "
                        + "period, stale_after, valid_range, point; did you mean 'stale_after'?",
                BROKEN + ":17:19: 'unit' in channel 'o2-b': unknown unit 'kpa', expected a unit such as K, °C, kPa, "
                        + "mbar, bar(g), %, %vol, L, mm, ohm, V, mA or W; did you mean 'kPa'?",
                BROKEN + ":19:13: missing required key 'unit' in channel 'o2-c'",
                BROKEN + ":20:21: 'period' in channel 'o2-c': '5 sec' is not a duration: expected a number and one "
                        + "of ms, s, min, h, d, e.g. 30s, 5min, 2h or 1h30min",
                BROKEN + ":25:26: stale timeout must be longer than the poll period (got 5s < 10s): channel "
                        + "'cold-plate' is polled every 10s",
                BROKEN + ":26:26: 'valid_range' in channel 'cold-plate' must be [low, high] with low < high, found "
                        + "[300, 1]",
                BROKEN + ":28:17: duplicate channel id 'o2-a': already used at " + BROKEN + ":12:17",
                BROKEN + ":33:19: 'channels' in instrument 'module-2' must be a list of channels, found 'o2-a'",
                BROKEN + ":35:31: unknown function 'minimum' in derived channel 'o2-lowest': expected one of "
                        + "min, max, mean, difference, he4_saturation_temperature, n2_saturation_temperature, prt_temperature, level_probe_height, "
                        + "probe_percent_height, litres_flat_bottom, litres_hemispherical_bottom, litres_asme_fd_bottom, "
                        + "litres_torispherical_bottom, oxygen_partial_pressure, boiloff_helium, boiloff_nitrogen",
                BROKEN + ":36:58: unit mismatch: input 'o2-a' is in %vol, a gas concentration (%vol, ppm), but "
                        + "derived channel 'plate-mix' is in K, a temperature (K, mK, °C); function 'mean' needs "
                        + "inputs of the result's kind",
                BROKEN + ":37:50: unknown channel 'o2-bb' in the inputs of derived channel 'o2-mean': no such "
                        + "channel in the site; did you mean 'o2-b'?",
                BROKEN + ":38:51: function 'difference' of derived channel 'o2-spread' takes exactly 2 inputs, "
                        + "found 3");
    }

    @Test
    void duplicateKeyInATransportIsPositionedAtTheSecondKey() {
        String file = "src/test/resources/config/duplicate-key-site.yaml";
        assertThat(problems(file)).containsExactly(
                file + ":5:57: duplicate key 'host': already given at line 5, column 28");
    }

    @Test
    void driverValidatorProblemsAreReportedWithTheSiteProblems() {
        DriverSettingsValidator drivers = site -> List.of(new ConfigProblem(
                site.buses().get(0).instruments().get(0).settings().position(), "driver says no"));
        try {
            SiteLoader.load(Path.of(SMALL), drivers);
        } catch (ConfigException e) {
            assertThat(e.problems()).extracting(ConfigProblem::toString)
                    .containsExactly(SMALL + ":11:19: driver says no");
            return;
        }
        throw new AssertionError("the driver validator's problem was not reported");
    }

    @Test
    void physicsFunctionsOfDerivedChannelsAreCheckedForInputsParametersAndResult() {
        String file = "src/test/resources/config/derived-physics-site.yaml";
        assertThat(problems(file)).containsExactly(
                file + ":23:14: unit mismatch: input 'shield-r' is in ohm, a resistance (ohm, kohm), but function "
                        + "'he4_saturation_temperature' needs a pressure (Pa, kPa, MPa, mbar, bar(a), bar(g), psi, "
                        + "torr, atm) as input 1",
                file + ":25:5: function 'prt_temperature' of derived channel 'shield-temperature' needs the "
                        + "parameter 'r0' (a resistance (ohm, kohm))",
                file + ":33:17: function 'litres_flat_bottom' of derived channel 'dewar-litres-2' needs the parameter "
                        + "'straight_length' (a length (mm, cm, m))",
                file + ":33:28: parameter 'diameter' of derived channel 'dewar-litres-2' must be a length (mm, cm, m), "
                        + "found 5 K",
                file + ":33:33: function 'litres_flat_bottom' of derived channel 'dewar-litres-2' has no parameter "
                        + "'straight_lenght'; did you mean 'straight_length'?",
                file + ":37:11: function 'he4_saturation_temperature' of derived channel 'bath-temperature-2' gives a "
                        + "temperature (K, mK, °C), found unit kPa (a pressure (Pa, kPa, MPa, mbar, bar(a), bar(g), "
                        + "psi, torr, atm))");
    }

    private static List<String> problems(String file) {
        try {
            SiteLoader.load(Path.of(file));
        } catch (ConfigException e) {
            return e.problems().stream().map(ConfigProblem::toString).toList();
        }
        throw new AssertionError(file + " loaded without problems");
    }

    private static SourcePosition at(String file, int line, int column) {
        return new SourcePosition(file, line, column);
    }
}
