package org.cryowarden.rules.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class SuperconductingLevelProbeTest {

    // submerged wire is superconducting, so R falls linearly with the level (common practice)
    private final SuperconductingLevelProbe probe = new SuperconductingLevelProbe(40.0, 0.8, 0.05);

    @Test
    void resistanceFallsLinearlyAsTheLiquidRises() {
        assertThat(probe.submergedFraction(40.0)).isEqualTo(0.0);
        assertThat(probe.submergedFraction(0.0)).isEqualTo(1.0);
        assertThat(probe.submergedFraction(10.0)).isCloseTo(0.75, within(1e-15));
        assertThat(probe.liquidHeightMetres(10.0)).isCloseTo(0.05 + 0.6, within(1e-15));
    }

    @Test
    void levelAndVesselTogetherGiveLitres() {
        VerticalVessel vessel = VerticalVessel.hemisphericalBottom(0.4, 1.0);
        double litres = vessel.volumeCubicMetres(probe.liquidHeightMetres(20.0)) * 1000;
        // 0.45 m of liquid: hemisphere 2/3 pi 0.2^3 plus 0.25 m of cylinder (elementary geometry)
        assertThat(litres).isCloseTo((2.0 / 3 * Math.PI * 0.008 + Math.PI * 0.04 * 0.25) * 1000, within(1e-9));
    }

    @Test
    void resistanceAboveTheFullLengthIsRefused() {
        assertThatThrownBy(() -> probe.submergedFraction(41))
                .isInstanceOf(OutOfRangeException.class)
                .hasMessage("probe resistance 41 ohm is outside 0 ohm to 40 ohm (the full-length resistance)");
    }
}
