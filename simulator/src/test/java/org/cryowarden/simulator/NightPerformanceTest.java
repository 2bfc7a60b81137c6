package org.cryowarden.simulator;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;
import org.junit.jupiter.api.Test;

class NightPerformanceTest {

    @Test
    void twelveHourNightWithFiftySensorsAtOneHertzRunsFastInSeconds() throws Exception {
        Scenario scenario = ScenarioReader.read(fiftySensorNight(), "<fifty-sensors>");
        assertThat(scenario.sensors()).hasSize(50);
        try (Simulator sim = Simulator.create(scenario, new VirtualTimeSource(scenario.start()), true)) {
            long start = System.nanoTime();
            SimulationRun run = sim.start(Pace.FAST, Duration.ofHours(12));
            assertThat(run.await(Duration.ofSeconds(60))).isTrue();
            double seconds = (System.nanoTime() - start) / 1e9;
            System.out.printf("simulated 12 h, 50 sensors at 1 Hz (%d steps) in %.2f s%n", sim.steps(), seconds);
            assertThat(run.failure()).isNull();
            assertThat(sim.steps()).isEqualTo(43_200);
            // the goal is under 5 s; the bound here is generous for a shared, loaded test machine
            assertThat(seconds).isLessThan(15);
        }
    }

    private static String fiftySensorNight() {
        StringBuilder yaml = new StringBuilder("""
                scenario: {name: fifty sensors, duration: 12h, step: 1s, seed: 3}
                rooms:
                  - {id: hall, volume: 300 m3, ventilation: 3 m3/min, exhaust_fan: 30 m3/min}
                vessels:
                """);
        for (int v = 0; v < 5; v++) {
            yaml.append("  - {id: dewar-").append(v).append(", room: hall, fluid: ")
                    .append(v == 4 ? "nitrogen" : "helium")
                    .append(", diameter: 0.6 m, straight_height: 0.8 m, liquid: 150 L, heat_load: 0.2 W,")
                    .append(" relief_valve: {set: 30 kPa(g), capacity: 60 m3/h},")
                    .append(" magnets: [{id: magnet-").append(v).append(", stored_energy: 50 kJ}],")
                    .append(" stages: [{id: shield, temperature: 80 K}]}\n");
        }
        yaml.append("sensors:\n");
        for (int i = 0; i < 50; i++) {
            int v = i % 5;
            String vessel = "dewar-" + v;
            yaml.append("  - {id: s").append(i).append(", ").append(switch (i % 5) {
                case 0 -> "kind: oxygen, room: hall";
                case 1 -> "kind: pressure, vessel: " + vessel;
                case 2 -> "kind: level, vessel: " + vessel + ", active_length: 0.8 m";
                case 3 -> "kind: calibrated, vessel: " + vessel + ", magnet: magnet-" + v
                        + ", calibration: demo-ceramic-b";
                default -> "kind: prt, vessel: " + vessel + ", stage: shield";
            }).append("}\n");
        }
        yaml.append("timeline:\n  - {at: \"03:00\", do: quench, target: magnet-1}\n"
                + "  - {at: \"05:00\", do: block-vent, target: dewar-2}\n");
        return yaml.toString();
    }
}
