package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.BooleanSupplier;
import java.util.stream.Stream;
import org.cryowarden.daemon.run.Daemon;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.simulator.emulators.PtyBridge;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The RS-485 rack's USB serial adapter pulled and plugged back in, through the whole daemon: both serial buses
 * reach the emulators over socat pseudo-terminals (symlinks, as udev gives a USB adapter). The rack's socat is
 * killed, so its device node disappears; every channel of that bus reads STALE with a reason that says the port
 * is gone, while the vacuum gauge's bus on its own adapter goes on being read at its rate. The link is then
 * created again at the same path and the rack's channels come back good, the daemon never restarted. A second
 * round powers the whole line down with the simulator's own disconnect switch (the timeline's {@code disconnect}
 * fault: device server and adapter together) and up again.
 */
class SerialAdapterPulledThroughDaemonTest {

    private static final String RACK = "rack-a-rs485";
    /** Every channel on the rack's bus (config-examples/harbour-hall-site.yaml). */
    private static final List<String> RACK_CHANNELS = List.of("o2-magnet-hall-east", "o2-magnet-hall-west",
            "o2-magnet-hall-pit", "bath-pressure-a", "bath-pressure-b", "exhaust-fan-running",
            "dewar-store-maintenance");
    /** The vacuum gauge on bus ovc-gauge-serial, its own adapter, read every 1 s (the site file). */
    private static final String OTHER_BUS = "ovc-pressure";
    /** Simulated seconds the adapter stays out. */
    private static final int OUTAGE_STEPS = 12;

    @TempDir
    Path folder;

    @BeforeAll
    static void mosquittoRuns() throws Exception {
        Night.mosquittoRuns();
    }

    @Test
    void pulledAdapterMakesOnlyItsBusStaleWithThePortGoneAndItRecoversWhenPluggedBackIn() throws Exception {
        try (Night night = Night.start(folder, Night.MOSQUITTO, true)) {
            Daemon daemon = night.daemon;
            PtyBridge adapter = night.simulator.pty(RACK).orElseThrow();
            Path node = adapter.link();
            night.stepUntil(() -> allGood(night, RACK_CHANNELS) && allGood(night, List.of(OTHER_BUS)), 120);

            adapter.setSuspended(true);
            assertThat(Files.exists(node, LinkOption.NOFOLLOW_LINKS)).as("device node " + node).isFalse();
            String gone = "bus '" + RACK + "' down: serial port " + node + " does not exist";
            Outage pulled = outage(night, gone);
            System.out.println("adapter pulled: " + pulled);

            adapter.setSuspended(false);
            awaitNode(node, true);
            night.stepUntil(() -> allGood(night, RACK_CHANNELS), 60, () -> reasons(night));
            assertThat(night.daemon).isSameAs(daemon);

            // The whole line loses power: the simulator's disconnect switch, as a scenario timeline would use it.
            night.simulator.setPortDisconnected(RACK, true);
            assertThat(Files.exists(node, LinkOption.NOFOLLOW_LINKS)).as("device node " + node).isFalse();
            Outage powered = outage(night, gone);
            System.out.println("line powered down: " + powered);
            night.simulator.setPortDisconnected(RACK, false);
            awaitNode(node, true);
            night.stepUntil(() -> allGood(night, RACK_CHANNELS), 60, () -> reasons(night));
        }
    }

    /** What the outage looked like: the rack's last reasons and the other bus's fresh readings. */
    private record Outage(String rackReason, int otherBusFresh) {
    }

    /**
     * Steps through an outage: the rack's channels must all read STALE with {@code gone} within a few steps and
     * stay so; the other bus is read good every step with a new reading each simulated second.
     */
    private static Outage outage(Night night, String gone) throws InterruptedException {
        Set<Instant> fresh = new HashSet<>();
        Instant start = night.simulator.clock().wallNow();
        night.stepUntil(() -> night.daemon.latestReadings().get(RACK_CHANNELS.get(0)).reason().startsWith(gone), 10,
                () -> reasons(night));
        for (int i = 0; i < OUTAGE_STEPS; i++) {
            night.step();
            Reading other = night.daemon.latestReadings().get(OTHER_BUS);
            assertThat(other.quality()).as(OTHER_BUS + " while " + RACK + " is down: " + other.reason())
                    .isEqualTo(Quality.GOOD);
            fresh.add(other.timestamp());
        }
        Map<String, Reading> latest = night.daemon.latestReadings();
        for (String channel : RACK_CHANNELS) {
            Reading reading = latest.get(channel);
            assertThat(reading.quality()).as(channel).isEqualTo(Quality.STALE);
            // The bus says which port is missing and what to check (SerialTransport's message for a missing path).
            assertThat(reading.reason()).as(channel).startsWith(gone)
                    .contains("check the path and that the adapter is plugged in");
        }
        long freshCount = fresh.stream().filter(t -> t.isAfter(start)).count();
        // Read every 1 s: one new reading a simulated second, the outage no exception.
        assertThat(freshCount).as("fresh " + OTHER_BUS + " readings").isEqualTo(OUTAGE_STEPS);
        return new Outage(latest.get(RACK_CHANNELS.get(0)).reason(), (int) freshCount);
    }

    private static void awaitNode(Path node, boolean present) throws InterruptedException {
        long deadline = System.nanoTime() + Duration.ofSeconds(5).toNanos();
        BooleanSupplier there = () -> Files.exists(node, LinkOption.NOFOLLOW_LINKS) == present;
        while (!there.getAsBoolean() && System.nanoTime() < deadline) {
            Thread.sleep(10); // bounded wait for socat to create the link
        }
        assertThat(there.getAsBoolean()).as("device node " + node + (present ? " back" : " gone")).isTrue();
    }

    private static boolean allGood(Night night, List<String> channels) {
        Map<String, Reading> latest = night.daemon.latestReadings();
        return channels.stream().allMatch(c -> latest.containsKey(c) && latest.get(c).quality() == Quality.GOOD);
    }

    private static String reasons(Night night) {
        Map<String, Reading> latest = night.daemon.latestReadings();
        return Stream.concat(RACK_CHANNELS.stream(), Stream.of(OTHER_BUS))
                .map(c -> c + "=" + (latest.containsKey(c) ? latest.get(c).quality() + " " + latest.get(c).reason()
                        : "none"))
                .reduce((a, b) -> a + "; " + b).orElse("");
    }
}
