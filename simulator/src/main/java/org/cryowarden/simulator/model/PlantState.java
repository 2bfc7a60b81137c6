package org.cryowarden.simulator.model;

import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Optional;

/** The true physical state of the whole plant after one step, immutable so other threads may read it. */
public record PlantState(Instant time, Duration elapsed, List<VesselState> vessels, List<RoomState> rooms) {

    public PlantState {
        vessels = List.copyOf(vessels);
        rooms = List.copyOf(rooms);
    }

    public Optional<VesselState> vessel(String id) {
        return vessels.stream().filter(v -> v.id().equals(id)).findFirst();
    }

    public Optional<RoomState> room(String id) {
        return rooms.stream().filter(r -> r.id().equals(id)).findFirst();
    }
}
