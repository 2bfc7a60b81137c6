package org.cryowarden.simulator.scenario;

import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Objects;
import org.cryowarden.simulator.emulators.PortSpec;
import org.cryowarden.simulator.model.RoomSpec;
import org.cryowarden.simulator.model.VesselSpec;

/**
 * A scripted night: the plant (rooms, vessels), its sensors, the emulated instruments on their ports, and the
 * timeline. Read by {@link ScenarioReader}.
 *
 * @param source the file (or label) it was read from, for messages
 * @param start  wall-clock time of the start, UTC
 * @param step   the physics time step
 */
public record Scenario(String name, String source, Instant start, Duration duration, Duration step, long seed,
        List<RoomSpec> rooms, List<VesselSpec> vessels, List<SensorDef> sensors, List<PortSpec> ports,
        List<InstrumentDef> instruments, List<TimelineEvent> timeline) {

    public Scenario {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(start, "start");
        rooms = List.copyOf(rooms);
        vessels = List.copyOf(vessels);
        sensors = List.copyOf(sensors);
        ports = List.copyOf(ports);
        instruments = List.copyOf(instruments);
        timeline = List.copyOf(timeline);
    }
}
