package org.cryowarden.simulator;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import java.time.Duration;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.physics.Cryogen;
import org.cryowarden.simulator.model.Room;
import org.cryowarden.simulator.model.RoomState;
import org.cryowarden.simulator.model.Vessel;
import org.cryowarden.simulator.model.VesselState;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;
import org.junit.jupiter.api.Test;

class QuenchScenarioTest {

    private static final Path QUENCH = Path.of("../config-examples/harbour-hall-quench-scenario.yaml");

    @Test
    void heliumIsConservedOverAWholeQuench() throws Exception {
        Scenario scenario = ScenarioReader.read(QUENCH);
        try (Simulator sim = Simulator.create(scenario, new VirtualTimeSource(scenario.start()), true)) {
            Vessel cryostat = sim.plant().vessel("magnet-cryostat").orElseThrow();
            Room hall = sim.plant().room("magnet-hall").orElseThrow();
            sim.advance(scenario.duration());
            // What left the cryostat went to the recovery line or into the room (common practice: a mass balance)
            double left = cryostat.initialKg() + cryostat.filledKg() - cryostat.massKg();
            assertThat(cryostat.toRecoveryKg() + cryostat.toRoomKg()).isCloseTo(left, within(1e-9));
            // ... and what entered the room is in it or was carried out by the ventilation
            double heliumIntoHall = sim.plant().vessels().stream().filter(v -> v.room() == hall
                    && v.spec().fluid() == Cryogen.HELIUM).mapToDouble(Vessel::toRoomKg).sum();
            assertThat(hall.receivedHeliumKg()).isCloseTo(heliumIntoHall, within(1e-12));
            assertThat(hall.heliumInRoomKg() + hall.exhaustedHeliumKg()).isCloseTo(heliumIntoHall, within(1e-9));
            // the stored energy boiled E / L of liquid: 150 kJ / 20.75 kJ/kg = 7.23 kg (Arp & McCarty, NIST TN 1334)
            VesselState state = sim.state().vessel("magnet-cryostat").orElseThrow();
            double boiledKg = (180 - state.liquidLitres()) / 1000 * 125;
            assertThat(boiledKg).isCloseTo(150e3 / 20.75e3 + 0.15 * 7200 / 20.75e3, within(0.01));
        }
    }

    @Test
    void quenchTakesTheSmallRoomBelowEighteenPercentAndTheExhaustFanRecoversIt() throws Exception {
        Scenario scenario = ScenarioReader.read(QUENCH);
        try (Simulator sim = Simulator.create(scenario, new VirtualTimeSource(scenario.start()), true)) {
            sim.advance(Duration.ofMinutes(20));
            assertThat(sim.state().room("magnet-hall").orElseThrow().oxygenPercent()).isCloseTo(21.0, within(0.01));
            sim.advance(Duration.ofMinutes(2));
            RoomState afterQuench = sim.state().room("magnet-hall").orElseThrow();
            // 18 %vol: the common evacuation set point
            assertThat(afterQuench.oxygenPercent()).isLessThan(18.0);
            assertThat(sim.state().vessel("magnet-cryostat").orElseThrow().reliefLifts()).isEqualTo(1);
            assertThat(sim.sensors().value("o2-east")).isLessThan(18.0);
            sim.advance(Duration.ofMinutes(10));
            RoomState recovered = sim.state().room("magnet-hall").orElseThrow();
            assertThat(recovered.exhaustFanOn()).isTrue();
            // 19.5 %vol: OSHA 29 CFR 1910.146 oxygen-deficient limit
            assertThat(recovered.oxygenPercent()).isGreaterThan(19.5);
            assertThat(sim.eventLog()).containsExactly("00:20:00 quench magnet-a", "00:22:00 coil relay-1");
        }
    }

    @Test
    void underADaemonTheStandaloneFanEntryIsSkipped() throws Exception {
        Scenario scenario = ScenarioReader.read(QUENCH);
        try (Simulator sim = Simulator.create(scenario, new VirtualTimeSource(scenario.start()), false)) {
            sim.advance(Duration.ofMinutes(32));
            assertThat(sim.state().room("magnet-hall").orElseThrow().exhaustFanOn()).isFalse();
            assertThat(sim.state().room("magnet-hall").orElseThrow().oxygenPercent()).isLessThan(19.5);
            assertThat(sim.eventLog()).containsExactly("00:20:00 quench magnet-a",
                    "00:22:00 coil relay-1 (skipped: standalone only)");
        }
    }

    @Test
    void sharedClockAdvancesByTheScenarioStep() throws Exception {
        Scenario scenario = ScenarioReader.read(QUENCH);
        VirtualTimeSource clock = new VirtualTimeSource(scenario.start());
        try (Simulator sim = Simulator.create(scenario, clock, true)) {
            sim.advance(Duration.ofMinutes(5));
            assertThat(clock.wallNow()).isEqualTo(scenario.start().plus(Duration.ofMinutes(5)));
            assertThat(clock.monotonicNanos()).isEqualTo(Duration.ofMinutes(5).toNanos());
            assertThat(sim.steps()).isEqualTo(300);
        }
    }
}
