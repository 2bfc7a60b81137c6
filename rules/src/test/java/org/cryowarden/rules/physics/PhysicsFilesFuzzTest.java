package org.cryowarden.rules.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.config.YamlReader;

/**
 * Coverage-guided fuzzing with Jazzer of the physics input files: ODH room files and calibration tables (YAML
 * and CSV). Each is read or refused with a {@link ConfigException} of positioned problems, nothing else; a
 * calibration table that is accepted passes through every one of its points.
 */
class PhysicsFilesFuzzTest {

    @FuzzTest(maxDuration = "10s")
    void roomReaderReadsOrRefusesAnyText(byte[] input) {
        String text = new String(input, StandardCharsets.UTF_8);
        try {
            OdhRoom room = OdhRoomReader.read(YamlReader.read(text, "room.yaml"));
            assertThat(room).isNotNull();
        } catch (ConfigException refused) {
            assertPositioned(refused, "room.yaml");
        }
    }

    @FuzzTest(maxDuration = "10s")
    void calibrationYamlReadsOrRefusesAnyText(byte[] input) {
        String text = new String(input, StandardCharsets.UTF_8);
        try {
            assertPassesThroughItsPoints(CalibrationTableReader.readYaml(YamlReader.read(text, "table.yaml")));
        } catch (ConfigException refused) {
            assertPositioned(refused, "table.yaml");
        }
    }

    /** Byte 0 picks the interpolation, the rest is the CSV text (raw in ohm, value in kelvin). */
    @FuzzTest(maxDuration = "10s")
    void calibrationCsvReadsOrRefusesAnyText(byte[] input) {
        if (input.length == 0) {
            return;
        }
        Interpolation interpolation = Interpolation.values()[(input[0] & 0xFF) % Interpolation.values().length];
        String text = new String(Arrays.copyOfRange(input, 1, input.length), StandardCharsets.UTF_8);
        try {
            assertPassesThroughItsPoints(CalibrationTableReader.readCsv(text, "table.csv", interpolation, Unit.OHM,
                    Unit.KELVIN));
        } catch (ConfigException refused) {
            assertPositioned(refused, "table.csv");
        }
    }

    private static void assertPassesThroughItsPoints(CalibrationTable table) {
        for (CalibrationPoint point : table.points()) {
            assertThat(table.value(point.raw())).as("value at raw %s of %s", point.raw(), table.interpolation())
                    .isCloseTo(point.value(), within(Math.abs(point.value()) * 1e-9 + 1e-12));
        }
    }

    private static void assertPositioned(ConfigException refused, String label) {
        assertThat(refused.problems()).isNotEmpty();
        for (ConfigProblem problem : refused.problems()) {
            assertThat(problem.position().file()).isEqualTo(label);
            assertThat(problem.message()).isNotBlank();
        }
    }
}
