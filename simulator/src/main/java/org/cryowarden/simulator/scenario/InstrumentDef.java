package org.cryowarden.simulator.scenario;

import java.util.Objects;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.simulator.emulators.Instrument;
import org.cryowarden.simulator.emulators.Protocol;
import org.cryowarden.simulator.model.Plant;

/** An emulated instrument as the scenario file declares it, on a port; {@link #create} builds it. */
public record InstrumentDef(String id, String kind, Protocol protocol, String portId, SourcePosition position,
        Factory factory) {

    /** Builds the instrument; relay modules act on the plant. */
    @FunctionalInterface
    public interface Factory {
        Instrument create(Plant plant, long seed);
    }

    public InstrumentDef {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(factory, "factory");
    }

    public Instrument create(Plant plant, long seed) {
        return factory.create(plant, seed);
    }
}
