package org.cryowarden.simulator.model;

import java.util.Objects;
import org.cryowarden.rules.physics.Ventilation;

/**
 * A perfectly mixed room (the FESHM 4240 assumption; helium in fact rises to the ceiling and nitrogen sinks).
 *
 * @param volumeCubicMetres                free air volume
 * @param ventilation                      how the normal ventilation moves air: a supply fan, an exhaust fan or none
 * @param ventilationCubicMetresPerSecond  the normal ventilation rate (0 with {@link Ventilation#NONE})
 * @param exhaustFanCubicMetresPerSecond   the emergency exhaust fan, added while its output is on
 * @param temperatureKelvin                room temperature, at which released gas is counted
 * @param pressurePascal                   room (barometric) pressure, absolute
 */
public record RoomSpec(String id, double volumeCubicMetres, Ventilation ventilation,
        double ventilationCubicMetresPerSecond, double exhaustFanCubicMetresPerSecond, double temperatureKelvin,
        double pressurePascal) {

    public RoomSpec {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(ventilation, "ventilation");
        if (!(volumeCubicMetres > 0)) {
            throw new IllegalArgumentException("room volume must be positive, got " + volumeCubicMetres);
        }
    }
}
