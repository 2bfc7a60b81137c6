package org.cryowarden.simulator.model;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * The rooms and vessels of a scenario, stepped together: vessels first (their releases are collected by their
 * rooms), then the rooms mix. Outputs are read from {@link Actuators} at the start of every step. Owned by the
 * simulation thread; {@link #snapshot} hands an immutable copy to everyone else.
 */
public final class Plant {

    private final Map<String, Room> rooms = new LinkedHashMap<>();
    private final Map<String, Vessel> vessels = new LinkedHashMap<>();
    private final Actuators actuators;
    private double elapsedSeconds;

    public Plant(List<RoomSpec> roomSpecs, List<VesselSpec> vesselSpecs, Actuators actuators) {
        this.actuators = actuators;
        for (RoomSpec spec : roomSpecs) {
            rooms.put(spec.id(), new Room(spec));
        }
        for (VesselSpec spec : vesselSpecs) {
            Room room = rooms.get(spec.roomId());
            if (room == null) {
                throw new IllegalArgumentException("vessel " + spec.id() + " is in unknown room " + spec.roomId());
            }
            vessels.put(spec.id(), new Vessel(spec, room));
        }
    }

    public Actuators actuators() {
        return actuators;
    }

    public Optional<Room> room(String id) {
        return Optional.ofNullable(rooms.get(id));
    }

    public Optional<Vessel> vessel(String id) {
        return Optional.ofNullable(vessels.get(id));
    }

    public List<Room> rooms() {
        return List.copyOf(rooms.values());
    }

    public List<Vessel> vessels() {
        return List.copyOf(vessels.values());
    }

    /** Seconds since the start of the scenario. */
    public double elapsedSeconds() {
        return elapsedSeconds;
    }

    /** Advances the physics by {@code dt} seconds. */
    public void step(double dt) {
        if (!(dt > 0)) {
            throw new IllegalArgumentException("a step must be positive, got " + dt + " s");
        }
        for (Room room : rooms.values()) {
            room.setExhaustFan(actuators.isOn(Actuators.exhaustFan(room.id()), false));
        }
        for (Vessel vessel : vessels.values()) {
            vessel.setFillValveOpen(actuators.isOn(Actuators.fillValve(vessel.id()), false));
            vessel.setHeaterOn(actuators.isOn(Actuators.heater(vessel.id()), vessel.spec().heaterWatts() > 0));
        }
        elapsedSeconds += dt;
        for (Vessel vessel : vessels.values()) {
            vessel.step(elapsedSeconds, dt);
        }
        for (Room room : rooms.values()) {
            room.step(dt);
        }
    }

    public PlantState snapshot(Instant time) {
        List<VesselState> vesselStates = new ArrayList<>(vessels.size());
        for (Vessel vessel : vessels.values()) {
            vesselStates.add(vessel.snapshot(elapsedSeconds));
        }
        List<RoomState> roomStates = new ArrayList<>(rooms.size());
        for (Room room : rooms.values()) {
            roomStates.add(room.snapshot());
        }
        return new PlantState(time, Duration.ofNanos(Math.round(elapsedSeconds * 1e9)), vesselStates, roomStates);
    }
}
