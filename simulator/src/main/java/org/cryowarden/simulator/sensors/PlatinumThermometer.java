package org.cryowarden.simulator.sensors;

import org.cryowarden.rules.Unit;
import org.cryowarden.rules.physics.PlatinumResistanceThermometer;
import org.cryowarden.simulator.model.Vessel;

/**
 * A platinum resistance thermometer on a warm stage of a cryostat: the stage temperature becomes a resistance by
 * IEC 60751 ({@link PlatinumResistanceThermometer}), noise is added to the resistance, and the value is the
 * temperature back from that resistance, in K. Limited to the standard's range (-200 °C to 850 °C).
 */
public final class PlatinumThermometer extends Sensor {

    private final Vessel vessel;
    private final String stageId;
    private final PlatinumResistanceThermometer prt;
    private final double noiseOhm;

    public PlatinumThermometer(String id, Vessel vessel, String stageId, PlatinumResistanceThermometer prt,
            double noiseOhm, long seed) {
        super(id, Unit.KELVIN, seed);
        this.vessel = vessel;
        this.stageId = stageId;
        this.prt = prt;
        this.noiseOhm = noiseOhm;
    }

    @Override
    public void sample(double now, double dt) {
        double celsius = vessel.stageKelvin(stageId) - 273.15;
        double clamped = Math.max(PlatinumResistanceThermometer.MIN_CELSIUS,
                Math.min(PlatinumResistanceThermometer.MAX_CELSIUS, celsius));
        raw = Math.max(prt.minOhm(), Math.min(prt.maxOhm(), prt.resistance(clamped) + gaussian(noiseOhm)));
        value = prt.temperature(raw) + 273.15;
    }
}
