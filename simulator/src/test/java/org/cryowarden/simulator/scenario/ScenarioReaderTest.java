package org.cryowarden.simulator.scenario;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.catchThrowableOfType;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.junit.jupiter.api.Test;

class ScenarioReaderTest {

    @Test
    void everyExampleScenarioReads() throws Exception {
        try (Stream<Path> files = Files.list(Path.of("../config-examples"))) {
            List<Path> scenarios = files.filter(p -> p.getFileName().toString().endsWith("-scenario.yaml")).toList();
            assertThat(scenarios).extracting(p -> p.getFileName().toString())
                    .anyMatch(n -> n.contains("quiet")).anyMatch(n -> n.contains("vent-blocked"))
                    .anyMatch(n -> n.contains("quench"));
            for (Path file : scenarios) {
                assertThat(ScenarioReader.read(file).timeline()).as(file.toString()).isNotNull();
            }
        }
    }

    @Test
    void mistypedActionIsReportedWhereItIsWritten() {
        assertThat(problems("""
                scenario: {name: t}
                rooms:
                  - {id: hall, volume: 100 m3}
                timeline:
                  - {at: "00:10", do: quenh, target: magnet-a}
                """)).containsExactly("t.yaml:5:23: do in timeline entry 1 must be one of block-vent, clear-fault, "
                + "clear-vent, coil, fault, fill, heat-load, leak, loss-of-vacuum, quench, stop-fill, stop-leak, "
                + "got 'quenh'; did you mean 'quench'?");
    }

    @Test
    void unknownReferencesSuggestTheClosestName() {
        assertThat(problems("""
                scenario: {name: t}
                rooms:
                  - {id: magnet-hall, volume: 100 m3}
                vessels:
                  - {id: cryostat, room: magnet-hal, fluid: helium, diameter: 0.5 m, straight_height: 1 m,
                     liquid: 100 L, heat_load: 0.1 W}
                timeline:
                  - {at: "00:10", do: block-vent, target: cryostatt}
                """)).containsExactly(
                "t.yaml:5:26: room 'magnet-hal' is not defined; did you mean 'magnet-hall'?",
                // the vessel itself was refused, so there is no vessel to suggest
                "t.yaml:8:43: target 'cryostatt' of timeline entry 1 is not a vessel of this scenario");
    }

    @Test
    void badQuantitiesAndTimesSayWhatIsExpected() {
        assertThat(problems("""
                scenario: {name: t}
                rooms:
                  - {id: hall, volume: 100 kg}
                timeline:
                  - {at: "25 past two", do: fault, target: x, kind: stuk}
                """)).containsExactly(
                "t.yaml:3:24: volume: expected a volume (mL, L, m3), got '100 kg' which is a mass (g, kg)",
                "t.yaml:5:10: at in timeline entry 1 must be a time since the start as HH:MM or HH:MM:SS (e.g. 02:10) "
                        + "or a duration (e.g. 2h10min), got '25 past two'",
                "t.yaml:5:44: target 'x' of timeline entry 1 is not an instrument of this scenario",
                "t.yaml:5:53: kind in timeline entry 1 must be one of stuck, drift, noise, wire-break, silence, "
                        + "garbage, bad-crc, slow, disconnect, got 'stuk'; did you mean 'stuck'?");
    }

    @Test
    void unknownKeyAndMissingKeyAreBothReported() {
        assertThat(problems("""
                scenario: {name: t}
                rooms:
                  - {id: hall, volum: 100 m3}
                """)).containsExactly(
                "t.yaml:3:5: missing key 'volume' in room 'hall'",
                "t.yaml:3:16: unknown key 'volum' in room 'hall'; did you mean 'volume'?");
    }

    @Test
    void badCrcOnATextInstrumentIsRefused() {
        assertThat(problems("""
                scenario: {name: t}
                rooms:
                  - {id: hall, volume: 100 m3}
                vessels:
                  - {id: d, room: hall, fluid: helium, diameter: 0.5 m, straight_height: 1 m, liquid: 100 L,
                     heat_load: 0.1 W}
                sensors:
                  - {id: lv, kind: level, vessel: d, active_length: 0.9 m}
                ports:
                  - id: p
                    instruments:
                      - {id: lm, kind: level-meter, channels: [{channel: 1, sensor: lv}]}
                timeline:
                  - {at: "01:00", do: fault, target: lm, kind: bad-crc}
                """)).containsExactly("t.yaml:14:48: kind bad-crc in timeline entry 1 needs a Modbus instrument; "
                + "'lm' speaks SCPI");
    }

    private static List<String> problems(String yaml) {
        ConfigException e = catchThrowableOfType(ConfigException.class, () -> ScenarioReader.read(yaml, "t.yaml"));
        assertThat(e).as("expected the scenario to be refused").isNotNull();
        return e.problems().stream().map(ConfigProblem::toString).toList();
    }
}
