package org.cryowarden.simulator.model;

import org.cryowarden.rules.physics.Cryogen;
import org.cryowarden.rules.physics.OxygenDilution;
import org.cryowarden.rules.physics.Ventilation;

/**
 * A perfectly mixed room receiving gas released from its vessels. Released gas is counted at room temperature
 * and pressure (ideal gas, {@link Cryogen#gasDensityKgPerCubicMetre}); the room stays at its pressure, so what
 * comes in pushes the same volume of mixture out. With supply Q_s, exhaust Q_x and release R the mixture leaves
 * at {@code O = max(Q_s + R, Q_x)} (fresh air leaks in to make up an exhaust). Each released species then obeys
 * {@code dn/dt = r - O n / V}, solved exactly over a step with the rates held constant, which reproduces the
 * FESHM 4240 perfect-mixing solutions (Fermilab ES&amp;H Manual chapter 4240) for supply, exhaust and no
 * ventilation. Oxygen is the air left: {@code C = 0.21 (V - n_He - n_N2) / V}.
 *
 * <p>Mass is kept exactly: whatever was released is either in the room or counted as exhausted. Owned by the
 * simulation thread.
 */
public final class Room {

    private final RoomSpec spec;
    private final double heliumDensity;
    private final double nitrogenDensity;
    private double heliumCubicMetres;
    private double nitrogenCubicMetres;
    private double pendingHeliumKg;
    private double pendingNitrogenKg;
    private boolean exhaustFanOn;
    private double outflowCubicMetresPerSecond;
    private double receivedHeliumKg;
    private double receivedNitrogenKg;
    private double exhaustedHeliumKg;
    private double exhaustedNitrogenKg;

    public Room(RoomSpec spec) {
        this.spec = spec;
        this.heliumDensity = Cryogen.HELIUM.gasDensityKgPerCubicMetre(spec.temperatureKelvin(), spec.pressurePascal());
        this.nitrogenDensity = Cryogen.NITROGEN.gasDensityKgPerCubicMetre(spec.temperatureKelvin(),
                spec.pressurePascal());
        this.outflowCubicMetresPerSecond = spec.ventilationCubicMetresPerSecond();
    }

    public RoomSpec spec() {
        return spec;
    }

    public String id() {
        return spec.id();
    }

    /** Adds gas released during the step now being computed; it enters the room in {@link #step}. */
    public void release(Cryogen fluid, double kilograms) {
        if (kilograms < 0) {
            throw new IllegalArgumentException("a release cannot be negative: " + kilograms);
        }
        if (fluid == Cryogen.HELIUM) {
            pendingHeliumKg += kilograms;
        } else {
            pendingNitrogenKg += kilograms;
        }
    }

    public void setExhaustFan(boolean on) {
        this.exhaustFanOn = on;
    }

    public boolean exhaustFanOn() {
        return exhaustFanOn;
    }

    /** Mixes the step's releases in over {@code dt} seconds at constant rates. */
    public void step(double dt) {
        double supply = spec.ventilation() == Ventilation.SUPPLY ? spec.ventilationCubicMetresPerSecond() : 0;
        double exhaust = spec.ventilation() == Ventilation.EXHAUST ? spec.ventilationCubicMetresPerSecond() : 0;
        if (exhaustFanOn) {
            exhaust += spec.exhaustFanCubicMetresPerSecond();
        }
        double heliumRate = pendingHeliumKg / heliumDensity / dt;
        double nitrogenRate = pendingNitrogenKg / nitrogenDensity / dt;
        double outflow = Math.max(supply + heliumRate + nitrogenRate, exhaust);
        outflowCubicMetresPerSecond = outflow;
        double decay = outflow > 0 ? Math.exp(-outflow * dt / spec.volumeCubicMetres()) : 1;

        double heliumBefore = heliumCubicMetres;
        double nitrogenBefore = nitrogenCubicMetres;
        heliumCubicMetres = mix(heliumCubicMetres, heliumRate, outflow, decay, dt);
        nitrogenCubicMetres = mix(nitrogenCubicMetres, nitrogenRate, outflow, decay, dt);

        receivedHeliumKg += pendingHeliumKg;
        receivedNitrogenKg += pendingNitrogenKg;
        exhaustedHeliumKg += pendingHeliumKg - (heliumCubicMetres - heliumBefore) * heliumDensity;
        exhaustedNitrogenKg += pendingNitrogenKg - (nitrogenCubicMetres - nitrogenBefore) * nitrogenDensity;
        pendingHeliumKg = 0;
        pendingNitrogenKg = 0;
    }

    private double mix(double amount, double rate, double outflow, double decay, double dt) {
        if (outflow <= 0) {
            return amount + rate * dt;
        }
        double equilibrium = rate * spec.volumeCubicMetres() / outflow;
        return equilibrium + (amount - equilibrium) * decay;
    }

    /** Oxygen by volume, 0.21 in fresh air (the FESHM 4240 figure). */
    public double oxygenFraction() {
        return OxygenDilution.AIR_OXYGEN_FRACTION * airFraction();
    }

    private double airFraction() {
        return Math.max(0, (spec.volumeCubicMetres() - heliumCubicMetres - nitrogenCubicMetres)
                / spec.volumeCubicMetres());
    }

    public double heliumFraction() {
        return heliumCubicMetres / spec.volumeCubicMetres();
    }

    public double nitrogenReleasedFraction() {
        return nitrogenCubicMetres / spec.volumeCubicMetres();
    }

    /** The rate at which mixture left the room during the last step, m3/s. */
    public double outflowCubicMetresPerSecond() {
        return outflowCubicMetresPerSecond;
    }

    public double heliumInRoomKg() {
        return heliumCubicMetres * heliumDensity;
    }

    public double nitrogenInRoomKg() {
        return nitrogenCubicMetres * nitrogenDensity;
    }

    public double receivedHeliumKg() {
        return receivedHeliumKg;
    }

    public double receivedNitrogenKg() {
        return receivedNitrogenKg;
    }

    public double exhaustedHeliumKg() {
        return exhaustedHeliumKg;
    }

    public double exhaustedNitrogenKg() {
        return exhaustedNitrogenKg;
    }

    RoomState snapshot() {
        return new RoomState(spec.id(), oxygenFraction(), heliumFraction(), nitrogenReleasedFraction(),
                outflowCubicMetresPerSecond, exhaustFanOn, receivedHeliumKg, heliumInRoomKg(), exhaustedHeliumKg,
                receivedNitrogenKg, nitrogenInRoomKg(), exhaustedNitrogenKg);
    }
}
