package org.cryowarden.simulator.scenario;

import java.io.IOException;
import java.util.Optional;
import org.cryowarden.simulator.emulators.Instrument;
import org.cryowarden.simulator.model.Plant;

/** What timeline effects act on: the plant, the instruments and their ports. */
public interface ScenarioContext {

    Plant plant();

    /** Seconds since the start of the scenario. */
    double now();

    Optional<Instrument> instrument(String id);

    /** Takes the port an instrument sits on down, or brings it back. */
    void setPortDisconnected(String instrumentId, boolean down) throws IOException;
}
