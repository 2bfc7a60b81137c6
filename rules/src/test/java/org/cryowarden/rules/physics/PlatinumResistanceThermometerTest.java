package org.cryowarden.rules.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class PlatinumResistanceThermometerTest {

    private final PlatinumResistanceThermometer pt100 = PlatinumResistanceThermometer.pt100();

    @Test
    void matchesTheStandardTableForPt100() {
        // IEC 60751:2008 table for R0 = 100 ohm (values given to 0.01 ohm)
        assertThat(pt100.resistance(-200)).isCloseTo(18.52, within(0.005));
        assertThat(pt100.resistance(-100)).isCloseTo(60.26, within(0.005));
        assertThat(pt100.resistance(0)).isCloseTo(100.00, within(0.005));
        assertThat(pt100.resistance(100)).isCloseTo(138.51, within(0.005));
    }

    @Test
    void pt1000IsTenTimesPt100() {
        // IEC 60751: the same ratio R(t)/R0 for every R0
        PlatinumResistanceThermometer pt1000 = PlatinumResistanceThermometer.pt1000();
        assertThat(pt1000.resistance(-100)).isCloseTo(602.6, within(0.05));
        assertThat(pt1000.temperature(1385.1)).isCloseTo(100, within(0.03));
    }

    @Test
    void tableResistancesGiveTheTableTemperatures() {
        // IEC 60751:2008 table for R0 = 100 ohm; 0.01 ohm is about 0.03 K
        assertThat(pt100.temperature(60.26)).isCloseTo(-100, within(0.03));
        assertThat(pt100.temperature(100.00)).isCloseTo(0, within(1e-9));
        assertThat(pt100.temperature(138.51)).isCloseTo(100, within(0.03));
    }

    @Test
    void temperatureToResistanceToTemperatureIsExactToAMillikelvinOverTheWholeRange() {
        for (int step = 0; step <= 105_000; step++) {
            double celsius = -200 + step * 0.01;
            double back = pt100.temperature(pt100.resistance(celsius));
            assertThat(back).as("at %s °C", celsius).isCloseTo(celsius, within(1e-6));
        }
    }

    @Test
    void resistanceToTemperatureToResistanceRoundTripsForAnyR0() {
        PlatinumResistanceThermometer odd = new PlatinumResistanceThermometer(500);
        for (int step = 0; step <= 10_000; step++) {
            double ohm = Math.min(odd.maxOhm(), odd.minOhm() + (odd.maxOhm() - odd.minOhm()) * step / 10_000.0);
            assertThat(odd.resistance(odd.temperature(ohm))).isCloseTo(ohm, within(1e-9));
        }
    }

    @Test
    void bothBranchesMeetAtZeroCelsius() {
        assertThat(pt100.temperature(Math.nextDown(100.0))).isCloseTo(0, within(1e-9));
        assertThat(pt100.temperature(Math.nextUp(100.0))).isCloseTo(0, within(1e-9));
    }

    @Test
    void rangeEndsAreExactAndJustOutsideIsRefused() {
        assertThat(pt100.temperature(pt100.minOhm())).isCloseTo(-200, within(1e-9));
        assertThat(pt100.temperature(pt100.maxOhm())).isCloseTo(850, within(1e-9));
        // 18.52 ohm as printed in the table is R(-200.0002 °C): outside, so refused
        assertThatThrownBy(() -> pt100.temperature(18.52))
                .isInstanceOf(OutOfRangeException.class)
                .hasMessage("resistance 18.52 ohm is outside the IEC 60751 range 18.5201 ohm to 390.4811 ohm "
                        + "(-200 °C to 850 °C) for R0 = 100 ohm");
        // 1123.15 K is 850.0000000000001 °C after conversion: rounding, not a range error
        assertThat(pt100.resistance(1123.15 - 273.15)).isEqualTo(pt100.resistance(850));
        assertThatThrownBy(() -> pt100.resistance(850.001))
                .hasMessage("temperature 850.001 °C is outside the IEC 60751 range -200 °C to 850 °C");
        assertThatThrownBy(() -> new PlatinumResistanceThermometer(0))
                .hasMessage("R0 must be greater than 0 ohm, got 0 ohm");
    }
}
