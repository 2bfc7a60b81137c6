package org.cryowarden.simulator.model;

import java.util.Objects;

/**
 * A superconducting magnet in a vessel's bath. On a quench its stored energy goes into the bath as heat
 * (all of it: the conservative assumption) spread evenly over {@code quenchSeconds}; the winding warms to
 * {@code peakKelvin} and cools back to the bath with the time constant {@code recoverySeconds}.
 */
public record MagnetSpec(String id, double storedEnergyJoules, double quenchSeconds, double peakKelvin,
        double recoverySeconds) {

    public MagnetSpec {
        Objects.requireNonNull(id, "id");
    }
}
