package org.cryowarden.simulator.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.cryowarden.rules.physics.Cryogen;
import org.cryowarden.rules.physics.Ventilation;
import org.junit.jupiter.api.Test;

class RoomOxygenTest {

    private static final double V = 200;        // m3
    private static final double Q = 0.5;        // m3/s fresh air
    private static final double R = 0.05;       // m3/s helium at room conditions

    @Test
    void constantReleaseWithSupplyFanFollowsTheClosedFormExponential() {
        Room room = new Room(new RoomSpec("r", V, Ventilation.SUPPLY, Q, 0, 293.15, 101_325));
        double kgPerSecond = R * Cryogen.HELIUM.gasDensityKgPerCubicMetre(293.15, 101_325);
        for (int t = 1; t <= 7200; t++) {
            room.release(Cryogen.HELIUM, kgPerSecond);
            room.step(1);
            if (t % 300 == 0) {
                // FESHM 4240, supply fan: C(t) = 0.21 [Q + R exp(-(Q+R) t / V)] / (Q + R)
                double expected = 0.21 * (Q + R * Math.exp(-(Q + R) * t / V)) / (Q + R);
                assertThat(room.oxygenFraction()).as("t = %d s", t).isCloseTo(expected, within(1e-12));
            }
        }
        // FESHM 4240 steady state 0.21 Q / (Q + R) = 0.190909... (after 36 time constants V / (Q + R))
        assertThat(room.oxygenFraction()).isCloseTo(0.21 * Q / (Q + R), within(1e-9));
    }

    @Test
    void constantReleaseWithExhaustFanFollowsTheClosedForm() {
        Room room = new Room(new RoomSpec("r", V, Ventilation.EXHAUST, Q, 0, 293.15, 101_325));
        double kgPerSecond = R * Cryogen.HELIUM.gasDensityKgPerCubicMetre(293.15, 101_325);
        for (int t = 1; t <= 400; t++) {
            room.release(Cryogen.HELIUM, kgPerSecond);
            room.step(1);
        }
        // FESHM 4240, exhaust fan with Q > R: C(t) = 0.21 [1 - (R/Q)(1 - exp(-Q t / V))]; one time constant V/Q
        double expected = 0.21 * (1 - R / Q * (1 - Math.exp(-1.0)));
        assertThat(room.oxygenFraction()).isCloseTo(expected, within(1e-12));
    }

    @Test
    void oxygenRecoversAfterTheReleaseEndsAndTheExhaustFanStarts() {
        Room room = new Room(new RoomSpec("r", V, Ventilation.NONE, 0, 1.0, 293.15, 101_325));
        double kg = 20 * Cryogen.HELIUM.gasDensityKgPerCubicMetre(293.15, 101_325);
        room.release(Cryogen.HELIUM, kg);
        room.step(1);
        // no ventilation: the release pushes mixture out, C = 0.21 exp(-R t / V) with R t = 20 m3
        assertThat(room.oxygenFraction()).isCloseTo(0.21 * Math.exp(-20.0 / V), within(1e-12));
        double low = room.oxygenFraction();
        room.setExhaustFan(true);
        for (int t = 1; t <= 200; t++) {
            room.step(1);
        }
        // FESHM 4240 after the release: C = 0.21 - (0.21 - C_e) exp(-Q t / V), Q = 1 m3/s, t = V/Q
        assertThat(room.oxygenFraction()).isCloseTo(0.21 - (0.21 - low) * Math.exp(-1.0), within(1e-12));
    }

    @Test
    void releasedMassIsEitherInTheRoomOrExhausted() {
        Room room = new Room(new RoomSpec("r", 50, Ventilation.SUPPLY, 0.1, 0, 293.15, 101_325));
        double released = 0;
        for (int t = 0; t < 5000; t++) {
            double kg = 0.001 * (1 + Math.sin(t / 100.0));
            room.release(Cryogen.NITROGEN, kg);
            released += kg;
            room.step(1);
        }
        assertThat(room.receivedNitrogenKg()).isCloseTo(released, within(1e-12));
        assertThat(room.nitrogenInRoomKg() + room.exhaustedNitrogenKg()).isCloseTo(released, within(1e-12));
    }
}
