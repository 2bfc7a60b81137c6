package org.cryowarden.simulator.model;

import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

/**
 * The outputs that act on the plant (exhaust fans, fill valves, heaters), each by a key such as
 * {@code exhaust-fan:magnet-hall}. Emulated relay modules set them from their coils on their connection threads;
 * the simulation thread reads them at every step. Thread-safe.
 */
public final class Actuators {

    private final Map<String, Boolean> states = new ConcurrentHashMap<>();

    public static String exhaustFan(String roomId) {
        return "exhaust-fan:" + roomId;
    }

    public static String fillValve(String vesselId) {
        return "fill-valve:" + vesselId;
    }

    public static String heater(String vesselId) {
        return "heater:" + vesselId;
    }

    public void set(String key, boolean on) {
        states.put(key, on);
    }

    /** The state of an output, or {@code otherwise} when nothing has set it. */
    public boolean isOn(String key, boolean otherwise) {
        return states.getOrDefault(key, otherwise);
    }

    public boolean isDefined(String key) {
        return states.containsKey(key);
    }
}
