package org.cryowarden.simulator.model;

/**
 * The true state of a room after a step. Fractions are by volume (0.21 = 21 %vol); masses in kg of gas
 * received from the room's vessels, still in the room, and carried out by the ventilation.
 */
public record RoomState(String id, double oxygenFraction, double heliumFraction, double nitrogenFraction,
        double outflowCubicMetresPerSecond, boolean exhaustFanOn, double receivedHeliumKg, double heliumInRoomKg,
        double exhaustedHeliumKg, double receivedNitrogenKg, double nitrogenInRoomKg, double exhaustedNitrogenKg) {

    public double oxygenPercent() {
        return oxygenFraction * 100;
    }
}
