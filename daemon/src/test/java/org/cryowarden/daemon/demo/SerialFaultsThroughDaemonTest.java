package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.EnumSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalInt;
import java.util.Set;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.simulator.emulators.Fault;
import org.cryowarden.simulator.emulators.FaultKind;
import org.cryowarden.simulator.emulators.Instrument;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Serial faults through the whole daemon, the RS-485 bus on a socat pseudo-terminal: the analog input module
 * answers garbage, then answers later than its 300 ms timeout. Meanwhile the relay module on the same bus keeps
 * being polled at its own rate and read good all through: garbage costs no line time, and after the master gives
 * up on the slow module the relay answers on time; the module's late reply is discarded by the master, as stale
 * input before its next request or as a frame from another unit (Modbus over Serial Line V1.02, §2.4.1). The module's oxygen channels go BAD or STALE
 * with a reason that says what the bus saw, and come back good once the module behaves.
 *
 * <p>The daemon runs on a virtual clock, but a late reply takes real time. Between two steps the test waits
 * (bounded) until the emulated line has been quiet for {@link #LINE_SETTLES}, so each late reply is out before the
 * next poll, as in the real second between two polls of a module 400 ms late.
 */
class SerialFaultsThroughDaemonTest {

    private static final List<String> MODULE = List.of("o2-magnet-hall-east", "o2-magnet-hall-west",
            "o2-magnet-hall-pit");
    /** On relay-1, the same bus, read every 2 s (config-examples/harbour-hall-site.yaml). */
    private static final String NEIGHBOUR = "exhaust-fan-running";
    /** Real time for the last reply to cross socat and the serial reader: the master's own frame silence, 20 ms. */
    static final Duration LINE_SETTLES = Duration.ofMillis(20);
    /** Later than the module's 300 ms timeout (config-examples/harbour-hall-site.yaml), shorter than a 1 s poll. */
    private static final Duration LATE = Duration.ofMillis(400);
    /** Simulated seconds of each fault: a short stand-in for an hour of garbage. */
    private static final int FAULT_STEPS = Boolean.getBoolean("cryowarden.long") ? 3600 : 30;

    @TempDir
    Path folder;

    @BeforeAll
    static void mosquittoRuns() throws Exception {
        Night.mosquittoRuns();
    }

    @Test
    void garbageAndSlowRepliesFromOneDeviceSpoilOnlyItsChannelsWithTheReasonAndTheyRecover() throws Exception {
        try (Night night = Night.start(folder, Night.MOSQUITTO, true)) {
            Instrument aim = night.simulator.instrument("aim-1").orElseThrow();
            night.stepUntil(() -> allGood(night, MODULE) && allGood(night, List.of(NEIGHBOUR)), 120);
            Map<FaultKind, String> reasons = new LinkedHashMap<>();
            Map<FaultKind, String> neighbourFigures = new LinkedHashMap<>();
            for (FaultKind kind : List.of(FaultKind.GARBAGE, FaultKind.SLOW)) {
                aim.startFault(new Fault(kind, 0, LATE, OptionalInt.empty(),
                        night.simulator.elapsed().toSeconds()));
                Instant faultStart = night.simulator.clock().wallNow();
                Set<Instant> goodStamps = new java.util.HashSet<>();
                int goodSteps = 0;
                for (int i = 0; i < FAULT_STEPS; i++) {
                    night.step();
                    lineSettles(night, "rack-a-rs485");
                    Reading neighbour = night.daemon.latestReadings().get(NEIGHBOUR);
                    if (neighbour.quality() == Quality.GOOD) {
                        goodSteps++;
                        goodStamps.add(neighbour.timestamp());
                    } else {
                        // The neighbour is still asked; what fails is said plainly.
                        assertThat(neighbour.reason()).contains("unit 7");
                    }
                }
                long fresh = goodStamps.stream().filter(t -> t.isAfter(faultStart)).count();
                neighbourFigures.put(kind, goodSteps + " of " + FAULT_STEPS + " steps good, " + fresh + " fresh good readings");
                // Neither garbage nor late replies hold the line: the neighbour is read good all through, every 2 s.
                assertThat(goodSteps).as("%s during %s", NEIGHBOUR, kind).isEqualTo(FAULT_STEPS);
                assertThat(fresh).as("fresh good %s readings during %s", NEIGHBOUR, kind)
                        .isGreaterThanOrEqualTo(FAULT_STEPS / 2 - 2);
                for (String channel : MODULE) {
                    Reading reading = night.daemon.latestReadings().get(channel);
                    assertThat(reading.quality()).as(channel + " during " + kind)
                            .isIn(EnumSet.of(Quality.BAD, Quality.STALE));
                    assertThat(reading.reason()).as(channel).containsAnyOf("aim-1", "unit 3");
                    reasons.put(kind, reading.quality() + ": " + reading.reason());
                }
                aim.clearFault(Optional.of(kind));
                night.stepUntil(() -> allGood(night, MODULE) && allGood(night, List.of(NEIGHBOUR)), 60);
            }
            System.out.println("serial faults through the daemon: module " + reasons + "; " + NEIGHBOUR + " "
                    + neighbourFigures);
            assertThat(reasons.get(FaultKind.GARBAGE)).isNotEqualTo(reasons.get(FaultKind.SLOW));
            assertThat(reasons.get(FaultKind.SLOW)).contains("no reply from unit 3 within 300 ms");
        }
    }

    /** Waits (at most 3 s of real time) until the port's line has been quiet for {@link #LINE_SETTLES}. */
    static void lineSettles(Night night, String port) throws InterruptedException {
        org.cryowarden.simulator.emulators.PortServer line = night.simulator.port(port).orElseThrow();
        long deadline = System.nanoTime() + Duration.ofSeconds(3).toNanos();
        while (line.quietFor().compareTo(LINE_SETTLES) < 0 && System.nanoTime() < deadline) {
            Thread.sleep(2); // bounded wait for a real effect: the late reply on the emulated line
        }
        assertThat(line.quietFor()).as("line " + port + " quiet").isGreaterThanOrEqualTo(LINE_SETTLES);
    }

    private static boolean allGood(Night night, List<String> channels) {
        Map<String, Reading> latest = night.daemon.latestReadings();
        return channels.stream().allMatch(c -> latest.containsKey(c) && latest.get(c).quality() == Quality.GOOD);
    }
}
