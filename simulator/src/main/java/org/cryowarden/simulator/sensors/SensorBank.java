package org.cryowarden.simulator.sensors;

import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/** All sensors of a scenario, sampled together after each step of the plant. Simulation thread only. */
public final class SensorBank {

    private final List<Sensor> sensors;
    private final Map<String, Integer> index = new LinkedHashMap<>();

    public SensorBank(List<Sensor> sensors) {
        this.sensors = List.copyOf(sensors);
        for (int i = 0; i < this.sensors.size(); i++) {
            if (index.put(this.sensors.get(i).id(), i) != null) {
                throw new IllegalArgumentException("two sensors named " + this.sensors.get(i).id());
            }
        }
    }

    public List<Sensor> sensors() {
        return sensors;
    }

    public Optional<Sensor> sensor(String id) {
        Integer i = index.get(id);
        return i == null ? Optional.empty() : Optional.of(sensors.get(i));
    }

    /** Samples every sensor and returns their readings. */
    public SensorSnapshot sample(Instant time, double now, double dt) {
        double[] values = new double[sensors.size()];
        double[] raws = new double[sensors.size()];
        for (int i = 0; i < values.length; i++) {
            Sensor sensor = sensors.get(i);
            sensor.sample(now, dt);
            values[i] = sensor.value();
            raws[i] = sensor.raw();
        }
        return new SensorSnapshot(time, now, index, values, raws);
    }
}
