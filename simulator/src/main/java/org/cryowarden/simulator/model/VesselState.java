package org.cryowarden.simulator.model;

import java.util.Map;
import org.cryowarden.rules.physics.Cryogen;

/**
 * The true state of a vessel after a step, and its mass ledger: {@code initialKg + filledKg = massKg +
 * toRecoveryKg + toRoomKg} holds to rounding at every step.
 *
 * @param pressurePascal    absolute bath pressure
 * @param bathKelvin        saturation temperature at that pressure (held at the curve's edge when outside it)
 * @param reliefLifts       how many times the relief valve has opened so far
 */
public record VesselState(String id, Cryogen fluid, double liquidLitres, double liquidHeightMetres,
        double fillFraction, double pressurePascal, double bathKelvin, boolean saturationInRange, double heatLoadWatts,
        boolean ventBlocked, boolean reliefOpen, int reliefLifts, boolean burstDiscOpen, double vacuumMillibar,
        boolean vacuumLost, Map<String, Double> magnetKelvin, Map<String, Double> stageKelvin, double massKg,
        double initialKg, double filledKg, double toRecoveryKg, double toRoomKg) {

    public VesselState {
        magnetKelvin = Map.copyOf(magnetKelvin);
        stageKelvin = Map.copyOf(stageKelvin);
    }
}
