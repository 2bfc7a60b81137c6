package org.cryowarden.simulator.sensors;

import org.cryowarden.rules.Unit;
import org.cryowarden.rules.physics.SuperconductingLevelProbe;
import org.cryowarden.simulator.model.Vessel;

/**
 * A level probe in a vessel: it reads the submerged fraction of its active length, in % of that length. For a
 * superconducting wire the raw signal is the resistance of the part above the liquid, {@code R_full (1 - f)},
 * which {@link SuperconductingLevelProbe} turns back into the fraction the instrument displays.
 */
public final class LevelProbe extends Sensor {

    private final Vessel vessel;
    private final SuperconductingLevelProbe probe;
    private final double noisePercent;

    public LevelProbe(String id, Vessel vessel, SuperconductingLevelProbe probe, double noisePercent, long seed) {
        super(id, Unit.PERCENT, seed);
        this.vessel = vessel;
        this.probe = probe;
        this.noisePercent = noisePercent;
    }

    public SuperconductingLevelProbe probe() {
        return probe;
    }

    @Override
    public void sample(double now, double dt) {
        double wetted = (vessel.liquidHeight() - probe.bottomOffsetMetres()) / probe.activeLengthMetres();
        double fraction = Math.max(0, Math.min(1, wetted + gaussian(noisePercent / 100)));
        raw = probe.fullResistanceOhm() * (1 - fraction);
        value = probe.submergedFraction(raw) * 100;
    }
}
