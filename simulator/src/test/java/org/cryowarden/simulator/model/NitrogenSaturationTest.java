package org.cryowarden.simulator.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class NitrogenSaturationTest {

    @Test
    void normalBoilingPointIsSeventySevenPointThreeFiveKelvin() {
        // 77.355 K at 101.325 kPa: Span et al., J. Phys. Chem. Ref. Data 29 (2000) 1361; 77.35 K in
        // Jacobsen et al. (1986)
        assertThat(NitrogenSaturation.temperature(101_325)).isCloseTo(77.355, within(0.005));
    }

    @Test
    void triplePointPressureIsTwelvePointFiveKilopascal() {
        // triple point 63.151 K, 12.52 kPa: Span et al. (2000)
        assertThat(NitrogenSaturation.TRIPLE_PASCAL).isCloseTo(12_520, within(10.0));
    }

    @Test
    void temperatureAndPressureRoundTrip() {
        for (double t = 64; t <= 126; t += 0.5) {
            assertThat(NitrogenSaturation.temperature(NitrogenSaturation.pressure(t))).isCloseTo(t, within(1e-6));
        }
    }

    @Test
    void outsideTheCurveIsRefused() {
        assertThatThrownBy(() -> NitrogenSaturation.pressure(60))
                .hasMessage("nitrogen temperature 60.0 K is outside the saturation curve 63.151 K to 126.192 K");
    }
}
