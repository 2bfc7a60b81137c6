package org.cryowarden.simulator.sensors;

import org.cryowarden.rules.Unit;
import org.cryowarden.simulator.model.Vessel;

/**
 * A gauge pressure transducer on a vessel's gas space, in kPa(g) against the room pressure; an instrument carries
 * it as a 4-20 mA loop.
 */
public final class PressureTransducer extends Sensor {

    private final Vessel vessel;
    private final double noiseKilopascal;

    public PressureTransducer(String id, Vessel vessel, double noiseKilopascal, long seed) {
        super(id, Unit.KILOPASCAL_GAUGE, seed);
        this.vessel = vessel;
        this.noiseKilopascal = noiseKilopascal;
    }

    @Override
    public void sample(double now, double dt) {
        double gauge = (vessel.pressurePascal() - vessel.room().spec().pressurePascal()) / 1000;
        value = gauge + gaussian(noiseKilopascal);
    }
}
