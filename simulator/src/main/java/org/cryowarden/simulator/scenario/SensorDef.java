package org.cryowarden.simulator.scenario;

import java.util.Objects;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.simulator.model.Plant;
import org.cryowarden.simulator.sensors.Sensor;

/** A sensor as the scenario file declares it; {@link #create} builds it on the scenario's plant. */
public record SensorDef(String id, String kind, SourcePosition position, Factory factory) {

    /** Builds the sensor against the plant it reads. */
    @FunctionalInterface
    public interface Factory {
        Sensor create(Plant plant, long seed);
    }

    public SensorDef {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(factory, "factory");
    }

    public Sensor create(Plant plant, long seed) {
        return factory.create(plant, seed);
    }
}
