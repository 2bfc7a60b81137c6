package org.cryowarden.simulator.sensors;

import java.util.Random;
import org.cryowarden.rules.Unit;

/**
 * A sensor that reads the true state with its own behaviour (lag, noise, geometry). Sampled once per step on
 * the simulation thread; its value and raw signal then travel to the instruments in a {@link SensorSnapshot}.
 */
public abstract class Sensor {

    private final String id;
    private final Unit unit;
    protected final Random noise;
    protected double value = Double.NaN;
    protected double raw = Double.NaN;

    protected Sensor(String id, Unit unit, long seed) {
        this.id = id;
        this.unit = unit;
        // One stream per sensor, so adding a sensor does not change the noise of the others.
        this.noise = new Random(seed ^ (id.hashCode() * 0x9E3779B97F4A7C15L));
    }

    public String id() {
        return id;
    }

    /** The unit of {@link #value()}. */
    public Unit unit() {
        return unit;
    }

    /** Reads the plant after a step of {@code dt} seconds ending {@code now} seconds after the start. */
    public abstract void sample(double now, double dt);

    /** The reading in {@link #unit()}. */
    public double value() {
        return value;
    }

    /** The raw signal where the sensor has one (a resistance in ohm), NaN otherwise. */
    public double raw() {
        return raw;
    }

    protected double gaussian(double sigma) {
        return sigma > 0 ? sigma * noise.nextGaussian() : 0;
    }
}
