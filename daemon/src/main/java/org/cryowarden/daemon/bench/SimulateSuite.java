package org.cryowarden.daemon.bench;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.simulator.Pace;
import org.cryowarden.simulator.SimulationRun;
import org.cryowarden.simulator.Simulator;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;

/**
 * Simulated seconds per wall second of a 12-hour night (1 s steps, physics and sensors, no ports) with 50 and
 * with 500 sensors: helium dewars each carrying a pressure transducer, a level probe and a vacuum gauge, and two
 * oxygen sensors in the dewar's room. The reference is real time (1 simulated second per second).
 */
final class SimulateSuite {

    static final int[] SENSORS = {50, 500};
    static final Duration NIGHT = Duration.ofHours(12);
    private static final int SENSORS_PER_DEWAR = 5;
    private static final int DEWARS_PER_ROOM = 5;

    BenchResult run(BenchSettings settings) throws Exception {
        Map<String, Double> figures = new LinkedHashMap<>();
        Map<String, Double> reference = new LinkedHashMap<>();
        Map<String, Double> ratio = new LinkedHashMap<>();
        List<String> lines = new ArrayList<>();
        lines.add("simulate: a 12 h night in 1 s steps, physics and sensors only (no emulated ports), as fast as"
                + " the machine steps");
        boolean meets = true;
        Path folder = Files.createTempDirectory("cryowarden-bench-sim-");
        try {
            for (int sensors : SENSORS) {
                Path file = folder.resolve("night-" + sensors + ".yaml");
                Files.writeString(file, scenario(sensors));
                Scenario scenario = ScenarioReader.read(file);
                settings.say("simulate: " + sensors + " sensors"
                        + settings.seconds().map(s -> " for " + s.toSeconds() + " s of wall time").orElse(""));
                double[] run = night(scenario, settings);
                double speed = run[0] / run[1];
                meets &= speed > 1;
                figures.put("simulated_seconds_per_second_" + sensors, speed);
                reference.put("real_time_" + sensors, 1.0);
                ratio.put("speed_up_" + sensors, speed);
                lines.add(String.format(Locale.ROOT, "  %3d sensors: %,.0f simulated s in %.2f s of wall time ="
                        + " %,.0f simulated s per s (a 12 h night in %.1f s)", sensors, run[0], run[1], speed,
                        NIGHT.toSeconds() / speed));
            }
        } finally {
            BenchFiles.deleteTree(folder);
        }
        return new BenchResult("simulate", figures, reference, ratio,
                "faster than real time (issue 9 sets no figure)", meets, lines);
    }

    /** Runs the night (or as much as fits in {@code --seconds}); returns {simulated seconds, wall seconds}. */
    private static double[] night(Scenario scenario, BenchSettings settings) throws InterruptedException {
        VirtualTimeSource clock = new VirtualTimeSource(scenario.start());
        try (Simulator simulator = Simulator.create(scenario, clock, true)) {
            long start = System.nanoTime();
            SimulationRun run = simulator.start(Pace.FAST, NIGHT);
            if (settings.seconds().isPresent()) {
                if (!run.await(settings.seconds().get())) {
                    run.stop();
                }
            } else {
                while (!run.await(Duration.ofSeconds(1))) {
                    // the night takes its time
                }
            }
            double wall = (System.nanoTime() - start) / 1e9;
            if (run.failure() != null) {
                throw new IllegalStateException("the simulation failed", run.failure());
            }
            return new double[] {simulator.elapsed().toNanos() / 1e9, wall};
        }
    }

    static String scenario(int sensors) {
        int dewars = (sensors + SENSORS_PER_DEWAR - 1) / SENSORS_PER_DEWAR;
        int rooms = (dewars + DEWARS_PER_ROOM - 1) / DEWARS_PER_ROOM;
        StringBuilder yaml = new StringBuilder("""
                # Bench night: invented rooms of helium dewars, five sensors per dewar.
                scenario:
                  name: bench night
                  start: 2025-11-13T20:00:00Z
                  duration: 12h
                  step: 1s
                  seed: 12
                rooms:
                """);
        for (int r = 0; r < rooms; r++) {
            yaml.append("  - {id: room-").append(r).append(", volume: 90 m3, ventilation: 3 m3/min, temperature: 18 C}\n");
        }
        yaml.append("vessels:\n");
        for (int d = 0; d < dewars; d++) {
            yaml.append("  - id: dewar-").append(d).append('\n')
                    .append("    room: room-").append(d / DEWARS_PER_ROOM).append('\n')
                    .append("""
                                fluid: helium
                                diameter: 0.6 m
                                straight_height: 0.8 m
                                bottom: torispherical
                                neck_volume: 25 L
                                liquid: 150 L
                                heat_load: 0.08 W
                                vacuum: 2.0e-6 mbar
                                vent: {to: recovery, check_valve: 1 kPa, capacity: 1 m3/h, at: 1 kPa}
                                relief_valve: {set: 30 kPa(g), capacity: 60 m3/h, to: room}
                            """);
        }
        yaml.append("sensors:\n");
        int made = 0;
        for (int d = 0; d < dewars && made < sensors; d++) {
            String room = "room-" + d / DEWARS_PER_ROOM;
            String[] kinds = {
                "{id: p-" + d + ", kind: pressure, vessel: dewar-" + d + ", noise: 0.05 kPa}",
                "{id: level-" + d + ", kind: level, vessel: dewar-" + d + ", active_length: 0.9 m, bottom_offset: 0.03 m}",
                "{id: vac-" + d + ", kind: vacuum, vessel: dewar-" + d + ", noise: 0.05}",
                "{id: o2a-" + d + ", kind: oxygen, room: " + room + ", response_time: 12s, noise: 0.03 %vol}",
                "{id: o2b-" + d + ", kind: oxygen, room: " + room + ", response_time: 15s, noise: 0.03 %vol}",
            };
            for (int k = 0; k < kinds.length && made < sensors; k++, made++) {
                yaml.append("  - ").append(kinds[k]).append('\n');
            }
        }
        return yaml.toString();
    }
}
