package org.cryowarden.simulator.scenario;

import static org.assertj.core.api.Assertions.assertThat;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.nio.charset.StandardCharsets;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;

/**
 * Coverage-guided fuzzing with Jazzer of the scenario reader over arbitrary text: a scenario is read or
 * refused with a {@link ConfigException} whose every problem names the file and says what is wrong; no other
 * exception and no hang (a fuzzing run gives each input 10 s: -timeout=10).
 */
class ScenarioFuzzTest {

    @FuzzTest(maxDuration = "10s")
    void readerReadsOrRefusesAnyText(byte[] input) {
        String text = new String(input, StandardCharsets.UTF_8);
        try {
            Scenario scenario = ScenarioReader.read(text, "fuzz-scenario.yaml");
            assertThat(scenario).isNotNull();
        } catch (ConfigException refused) {
            assertThat(refused.problems()).isNotEmpty();
            for (ConfigProblem problem : refused.problems()) {
                assertThat(problem.position().file()).isEqualTo("fuzz-scenario.yaml");
                assertThat(problem.message()).isNotBlank();
            }
        }
    }
}
