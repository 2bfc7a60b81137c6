package org.cryowarden.simulator.sensors;

import org.cryowarden.rules.Unit;
import org.cryowarden.simulator.model.Vessel;

/** A gauge on a vessel's insulating vacuum, in mbar, with relative noise (gauges of this kind are good to tens of %). */
public final class VacuumGauge extends Sensor {

    private final Vessel vessel;
    private final double relativeNoise;

    public VacuumGauge(String id, Vessel vessel, double relativeNoise, long seed) {
        super(id, Unit.MILLIBAR, seed);
        this.vessel = vessel;
        this.relativeNoise = relativeNoise;
    }

    @Override
    public void sample(double now, double dt) {
        value = vessel.vacuumMillibar(now) * Math.max(0.01, 1 + gaussian(relativeNoise));
    }
}
