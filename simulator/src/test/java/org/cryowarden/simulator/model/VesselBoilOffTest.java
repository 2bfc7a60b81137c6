package org.cryowarden.simulator.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.physics.Cryogen;
import org.cryowarden.rules.physics.Ventilation;
import org.cryowarden.rules.physics.VerticalVessel;
import org.junit.jupiter.api.Test;

class VesselBoilOffTest {

    @Test
    void oneWattBoilsAboutOnePointThreeNineLitresOfHeliumPerHour() {
        Plant plant = plantWith(Cryogen.HELIUM, 1.0);
        double before = litres(plant);
        stepFor(plant, 3600);
        // 1 W -> 1.39 L/h of liquid helium: Arp & McCarty, NIST TN 1334 (L = 20.75 kJ/kg, rho = 125 kg/m3)
        assertThat(before - litres(plant)).isCloseTo(1.39, within(0.005));
    }

    @Test
    void oneWattBoilsAboutTwentyTwoMillilitresOfNitrogenPerHour() {
        Plant plant = plantWith(Cryogen.NITROGEN, 1.0);
        double before = litres(plant);
        stepFor(plant, 3600);
        // 1 W -> about 22 mL/h of liquid nitrogen: Jacobsen et al., J. Phys. Chem. Ref. Data 15 (1986)
        // (L = 199 kJ/kg, rho = 806 kg/m3)
        assertThat((before - litres(plant)) * 1000).isCloseTo(22.4, within(0.2));
    }

    @Test
    void bathOfHeliumAtOneAtmosphereSitsAtTheNormalBoilingPoint() {
        Plant plant = plantWith(Cryogen.HELIUM, 0.5);
        Vessel vessel = plant.vessel("dewar").orElseThrow();
        // ITS-90 (Preston-Thomas, Metrologia 27 (1990)): 101.325 kPa -> 4.2221 K; the vent adds ~1 kPa
        assertThat(Saturation.kelvin(Cryogen.HELIUM, 101_325)).isCloseTo(4.2221, within(0.0001));
        assertThat(vessel.bathKelvin()).isBetween(4.222, 4.25);
    }

    @Test
    void blockedVentRaisesPressureUntilTheReliefLifts() {
        Plant plant = plantWith(Cryogen.HELIUM, 2.0);
        Vessel vessel = plant.vessel("dewar").orElseThrow();
        vessel.setVentBlocked(true);
        double reliefSet = 101_325 + 30_000;
        int step = 0;
        while (!vessel.reliefOpen() && step < 24 * 3600) {
            plant.step(1);
            step++;
        }
        assertThat(vessel.reliefOpen()).isTrue();
        assertThat(vessel.reliefLifts()).isEqualTo(1);
        // the relief holds the bath just above its set pressure (proportional lift)
        stepFor(plant, 3600);
        assertThat(vessel.pressurePascal()).isBetween(reliefSet, reliefSet + 2000);
        assertThat(vessel.toRoomKg()).isPositive();
    }

    static Plant plantWith(Cryogen fluid, double watts) {
        RoomSpec room = new RoomSpec("room", 100, Ventilation.SUPPLY, 0.05, 0.5, 293.15, 101_325);
        double gas = fluid.gasDensityKgPerCubicMetre(293.15, 101_325);
        VesselSpec vessel = new VesselSpec("dewar", "room", fluid, VerticalVessel.flatBottom(0.6, 1.0), 0.6, 0.03,
                0.2, watts, 0, new VentSpec(Destination.RECOVERY, 1000, 2.0 / 3600 * gas / 1000),
                Optional.of(new ReliefSpec(101_325 + 30_000, 60.0 / 3600 * gas / 3000, Destination.ROOM)),
                Optional.empty(), List.of(), List.of(), 1e-6, 101_325 + 1000);
        return new Plant(List.of(room), List.of(vessel), new Actuators());
    }

    static double litres(Plant plant) {
        return plant.vessel("dewar").orElseThrow().liquidCubicMetres() * 1000;
    }

    static void stepFor(Plant plant, int seconds) {
        for (int i = 0; i < seconds; i++) {
            plant.step(1);
        }
    }
}
