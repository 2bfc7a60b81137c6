package org.cryowarden.simulator;

import org.cryowarden.simulator.model.PlantState;
import org.cryowarden.simulator.sensors.SensorSnapshot;

/** Told after every step, on the simulation thread; must be quick (a trace writer, a progress line). */
@FunctionalInterface
public interface StepListener {
    void afterStep(PlantState state, SensorSnapshot sensors);
}
