package org.cryowarden.simulator.sensors;

import java.time.Instant;
import java.util.Map;
import java.util.OptionalInt;

/**
 * Every sensor's value and raw signal after one step, immutable: the simulation thread publishes one per step and
 * the emulators' connection threads read the latest.
 */
public final class SensorSnapshot {

    private final Instant time;
    private final double elapsedSeconds;
    private final Map<String, Integer> index;
    private final double[] values;
    private final double[] raws;

    SensorSnapshot(Instant time, double elapsedSeconds, Map<String, Integer> index, double[] values, double[] raws) {
        this.time = time;
        this.elapsedSeconds = elapsedSeconds;
        this.index = index;
        this.values = values;
        this.raws = raws;
    }

    public Instant time() {
        return time;
    }

    public double elapsedSeconds() {
        return elapsedSeconds;
    }

    public OptionalInt indexOf(String sensorId) {
        Integer i = index.get(sensorId);
        return i == null ? OptionalInt.empty() : OptionalInt.of(i);
    }

    public double value(int index) {
        return values[index];
    }

    public double raw(int index) {
        return raws[index];
    }

    public double value(String sensorId) {
        return values[required(sensorId)];
    }

    public double raw(String sensorId) {
        return raws[required(sensorId)];
    }

    public int size() {
        return values.length;
    }

    private int required(String sensorId) {
        Integer i = index.get(sensorId);
        if (i == null) {
            throw new IllegalArgumentException("no sensor " + sensorId);
        }
        return i;
    }
}
