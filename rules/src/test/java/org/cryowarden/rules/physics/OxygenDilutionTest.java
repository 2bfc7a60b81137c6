package org.cryowarden.rules.physics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;

class OxygenDilutionTest {

    private static final double ROOM = 200;
    private static final double FOREVER = Double.POSITIVE_INFINITY;

    @Test
    void supplyFanSteadyStateIsPointTwoOneQOverQPlusR() {
        // FESHM 4240: supply fan steady state 0.21 Q / (Q + R)
        OxygenDilution room = OxygenDilution.release(ROOM, 0.5, Ventilation.SUPPLY, 2.0, FOREVER);
        assertThat(room.steadyStateFraction()).hasValue(0.21 * 2.0 / 2.5);
        assertThat(room.fractionAt(1e6)).isCloseTo(0.21 * 2.0 / 2.5, within(1e-12));
        assertThat(room.minimumFraction()).isEqualTo(0.21 * 2.0 / 2.5);
        assertThat(room.timeOfMinimumSeconds()).isInfinite();
    }

    @Test
    void supplyFanAtOneTimeConstantHasCoveredOneMinusOneOverEOfTheWay() {
        // FESHM 4240: C(t) = 0.21 [Q + R e^(-(Q+R)t/V)] / (Q+R); at t = V/(Q+R) the exponential is 1/e
        OxygenDilution room = OxygenDilution.release(ROOM, 0.5, Ventilation.SUPPLY, 2.0, FOREVER);
        double tau = ROOM / 2.5;
        assertThat(room.releaseTimeConstantSeconds()).isEqualTo(tau);
        assertThat(room.fractionAt(tau)).isCloseTo(0.21 * (2.0 + 0.5 / Math.E) / 2.5, within(1e-12));
    }

    @Test
    void exhaustFanWithMoreVentilationThanReleaseSettlesAtPointTwoOneTimesOneMinusROverQ() {
        // FESHM 4240: exhaust fan Q > R, steady state 0.21 (1 - R/Q); at t = V/Q the exponential is 1/e
        OxygenDilution room = OxygenDilution.release(ROOM, 0.5, Ventilation.EXHAUST, 2.0, FOREVER);
        assertThat(room.steadyStateFraction()).hasValue(0.21 * (1 - 0.25));
        assertThat(room.fractionAt(ROOM / 2.0)).isCloseTo(0.21 * (1 - 0.25 * (1 - 1 / Math.E)), within(1e-12));
    }

    @Test
    void exhaustFanSmallerThanTheReleaseBehavesLikeNoVentilation() {
        // FESHM 4240: exhaust with Q <= R, or no ventilation: C(t) = 0.21 e^(-R t / V)
        OxygenDilution exhaust = OxygenDilution.release(ROOM, 2.0, Ventilation.EXHAUST, 1.0, FOREVER);
        OxygenDilution none = OxygenDilution.release(ROOM, 2.0, Ventilation.NONE, 0, FOREVER);
        assertThat(exhaust.fractionAt(ROOM / 2.0)).isCloseTo(0.21 / Math.E, within(1e-12));
        assertThat(none.fractionAt(ROOM / 2.0)).isCloseTo(0.21 / Math.E, within(1e-12));
        assertThat(none.steadyStateFraction()).hasValue(0.0);
    }

    @Test
    void afterTheReleaseEndsTheRoomRecoversWithTheVentilationTimeConstant() {
        // FESHM 4240: after the release ends at t_e, C(t) = 0.21 - (0.21 - C_e) e^(-Q (t - t_e) / V)
        OxygenDilution room = OxygenDilution.release(ROOM, 1.0, Ventilation.SUPPLY, 0.5, 300);
        double atEnd = room.fractionAt(300);
        assertThat(room.minimumFraction()).isEqualTo(atEnd);
        assertThat(room.timeOfMinimumSeconds()).isEqualTo(300);
        assertThat(room.fractionAt(300 + ROOM / 0.5)).isCloseTo(0.21 - (0.21 - atEnd) / Math.E, within(1e-12));
        assertThat(room.fractionAt(299.999)).isGreaterThan(atEnd);
        assertThat(room.fractionAt(300.001)).isGreaterThan(atEnd);
    }

    @Test
    void withNoVentilationTheOxygenStaysDownAfterTheRelease() {
        OxygenDilution room = OxygenDilution.release(ROOM, 1.0, Ventilation.NONE, 0, 100);
        assertThat(room.fractionAt(10_000)).isEqualTo(room.fractionAt(100));
    }

    @Test
    void spillingItsOwnVolumeOfGasLeavesOneOverEOfTheOxygen() {
        // limit of the FESHM 4240 no-ventilation solution with R t = V_gas (derived, not quoted)
        OxygenDilution room = OxygenDilution.spill(ROOM, ROOM, Ventilation.EXHAUST, 1.0);
        assertThat(room.fractionAt(0)).isCloseTo(0.21 / Math.E, within(1e-12));
        assertThat(room.minimumFraction()).isCloseTo(0.21 / Math.E, within(1e-12));
        assertThat(room.timeOfMinimumSeconds()).isZero();
        assertThat(room.steadyStateFraction()).isEmpty();
        assertThat(room.fractionAt(ROOM)).isCloseTo(0.21 - (0.21 - 0.21 / Math.E) / Math.E, within(1e-12));
    }

    @Test
    void ventilationWithoutAFanIsRefused() {
        assertThatThrownBy(() -> OxygenDilution.release(ROOM, 1.0, Ventilation.NONE, 0.5, 10))
                .isInstanceOf(OutOfRangeException.class)
                .hasMessage("a ventilation rate of 0.5 m3/s needs a supply or exhaust fan; with no ventilation the rate is 0");
        assertThatThrownBy(() -> OxygenDilution.release(0, 1.0, Ventilation.NONE, 0, 10))
                .hasMessage("room volume must be greater than 0 m3, got 0 m3");
    }

    @Test
    void partialPressureIsFractionTimesBarometricPressure() {
        // Dalton's law (common practice): 20.9 % of 101.325 kPa is 21.18 kPa
        assertThat(OxygenPartialPressure.pascal(0.209, 101_325)).isCloseTo(21_176.9, within(0.1));
        assertThatThrownBy(() -> OxygenPartialPressure.pascal(20.9, 101_325))
                .hasMessage("oxygen fraction 20.9 is outside 0 to 1");
    }
}
