package org.cryowarden.simulator.sensors;

import org.cryowarden.rules.Unit;
import org.cryowarden.simulator.model.Room;

/**
 * An electrochemical oxygen cell: a first-order response to the room's oxygen fraction with a time constant
 * (cells are specified by T90, about 2.3 time constants; common practice) plus white noise, in %vol.
 */
public final class OxygenCell extends Sensor {

    private final Room room;
    private final double timeConstantSeconds;
    private final double noisePercent;
    private double lagged;

    public OxygenCell(String id, Room room, double timeConstantSeconds, double noisePercent, long seed) {
        super(id, Unit.PERCENT_VOLUME, seed);
        this.room = room;
        this.timeConstantSeconds = timeConstantSeconds;
        this.noisePercent = noisePercent;
        this.lagged = room.oxygenFraction() * 100;
    }

    @Override
    public void sample(double now, double dt) {
        double truth = room.oxygenFraction() * 100;
        lagged = timeConstantSeconds > 0 ? lagged + (truth - lagged) * (1 - Math.exp(-dt / timeConstantSeconds)) : truth;
        value = Math.max(0, lagged + gaussian(noisePercent));
    }
}
