package org.cryowarden.rules.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.config.YamlReader;
import org.junit.jupiter.api.Test;

class OdhAssessmentTest {

    @Test
    void fatalityFactorFollowsTheManualsCurveWithItsSteps() {
        // FESHM 4240: F = 1 for C <= 0.088, 10^(6.5 - 76 C) for 0.088 < C < 0.18, 0 for C >= 0.18
        assertThat(FatalityFactor.of(0.05)).isEqualTo(1.0);
        assertThat(FatalityFactor.of(0.088)).isEqualTo(1.0);
        assertThat(FatalityFactor.of(0.0881)).isCloseTo(Math.pow(10, 6.5 - 76 * 0.0881), within(1e-15));
        assertThat(FatalityFactor.of(Math.nextUp(0.088))).isCloseTo(0.649, within(0.001));
        assertThat(FatalityFactor.of(0.15)).isCloseTo(Math.pow(10, -4.9), within(1e-18));
        assertThat(FatalityFactor.of(0.1799)).isCloseTo(6.7e-8, within(0.1e-8));
        assertThat(FatalityFactor.of(0.18)).isEqualTo(0.0);
        assertThat(FatalityFactor.of(0.21)).isEqualTo(0.0);
    }

    @Test
    void odhClassBoundariesBelongToTheHigherClass() {
        // FESHM 4240: class 0 below 1e-7 /h; 1 from 1e-7; 2 from 1e-5; 3 from 1e-3; 4 from 1e-1
        assertThat(OdhClass.of(0)).isEqualTo(OdhClass.CLASS_0);
        assertThat(OdhClass.of(0.99e-7)).isEqualTo(OdhClass.CLASS_0);
        assertThat(OdhClass.of(1e-7)).isEqualTo(OdhClass.CLASS_1);
        assertThat(OdhClass.of(1e-5)).isEqualTo(OdhClass.CLASS_2);
        assertThat(OdhClass.of(1e-3)).isEqualTo(OdhClass.CLASS_3);
        assertThat(OdhClass.of(0.0999)).isEqualTo(OdhClass.CLASS_3);
        assertThat(OdhClass.of(0.1)).isEqualTo(OdhClass.CLASS_4);
        assertThat(OdhClass.of(5)).isEqualTo(OdhClass.CLASS_4);
    }

    @Test
    void fatalityRateIsTheSumOfRateTimesFatalityFactor() {
        // FESHM 4240: phi = sum P_i F_i (rates are the manual's generic ones, unchecked against its current tables)
        OdhAssessment assessment = OdhAssessment.of(List.of(
                new FailureMode("dewar loss of vacuum", 1e-6, 0.05),
                new FailureMode("relief valve opens early", 1e-5, 0.15),
                new FailureMode("line leak", 5e-7, 0.20)));
        assertThat(assessment.fatalityRatePerHour()).isCloseTo(1e-6 + 1e-5 * Math.pow(10, -4.9), within(1e-20));
        assertThat(assessment.odhClass()).isEqualTo(OdhClass.CLASS_1);
    }

    @Test
    void roomFileModesUseTheOxygenDilutionSolutions() throws ConfigException {
        OdhRoom room = OdhRoomReader.read(YamlReader.read(String.join("\n",
                "room:",
                "  name: test bay",
                "  volume: 100 m3",
                "  ventilation: 1 m3/s",
                "  fan: supply",
                "modes:",
                "  - name: leak",
                "    rate_per_h: 1e-6",
                "    release_rate: 0.25 m3/s",
                "  - name: spill",
                "    rate_per_h: 2e-6",
                "    spill: 100 L",
                "    fluid: nitrogen",
                "    fan: none",
                "  - name: given",
                "    rate_per_h: 3e-6",
                "    oxygen: 17 %vol",
                ""), "bay-room.yaml"));
        // FESHM 4240 supply fan steady state 0.21 Q / (Q + R) for an endless release
        assertThat(room.modes().get(0).oxygenMinFraction()).isCloseTo(0.21 / 1.25, within(1e-12));
        double gas = GasExpansion.gasCubicMetres(Cryogen.NITROGEN, 0.1, 293.15, 101_325);
        assertThat(room.modes().get(1).oxygenMinFraction()).isCloseTo(0.21 * Math.exp(-gas / 100), within(1e-12));
        assertThat(room.modes().get(2).oxygenMinFraction()).isCloseTo(0.17, within(1e-12));
        assertThat(room.ventilation()).isEqualTo(Ventilation.SUPPLY);
    }

    @Test
    void roomFileErrorsAreAllReportedWithPositions() {
        String yaml = String.join("\n",
                "room:",
                "  name: bay",
                "  volume: 100 kg",
                "  fan: sideways",
                "modes:",
                "  - name: leak",
                "    rate: 1e-6",
                "    release_rate: 0.25 m3/s",
                "  - name: both",
                "    rate_per_h: 1e-6",
                "    oxygen: 17 %vol",
                "    spill: 10 L",
                "");
        assertThatThrownBy(() -> OdhRoomReader.read(YamlReader.read(yaml, "bay-room.yaml")))
                .isInstanceOf(ConfigException.class)
                .hasMessage(String.join("\n",
                        "bay-room.yaml:3:11: room volume: expected a volume (mL, L, m3), got '100 kg' which is a mass (g, kg)",
                        "bay-room.yaml:4:8: unknown fan 'sideways'; expected supply, exhaust or none",
                        "bay-room.yaml:7:5: unknown key 'rate' in a failure mode (did you mean 'rate_per_h'?); expected one of "
                                + "duration, fan, fluid, name, oxygen, "
                                + "rate_per_h, release_rate, source, spill, ventilation",
                        "bay-room.yaml:6:5: a failure mode needs 'rate_per_h'",
                        "bay-room.yaml:9:5: a failure mode needs exactly one of oxygen, release_rate or spill, got 2"));
    }

    @Test
    void theExampleRoomFileIsClassOne() throws ConfigException {
        OdhRoom room = OdhRoomReader.read(java.nio.file.Path.of("..", "config-examples", "magnet-bay-room.yaml"));
        OdhAssessment assessment = room.assess();
        assertThat(assessment.modes()).hasSize(5);
        assertThat(assessment.odhClass()).isEqualTo(OdhClass.CLASS_1);
    }

    @Test
    void oxygenOutsideZeroToOneIsRefused() {
        assertThatThrownBy(() -> FatalityFactor.of(1.5)).hasMessage("oxygen fraction 1.5 is outside 0 to 1");
    }
}
