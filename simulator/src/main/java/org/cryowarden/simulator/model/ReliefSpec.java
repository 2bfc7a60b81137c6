package org.cryowarden.simulator.model;

import java.util.Objects;

/**
 * A relief device: a relief valve that flows in proportion to the pressure above its set pressure and reseats
 * below it, or a burst disc that ruptures at its set pressure and then stays open down to ambient.
 *
 * @param setPascal   absolute set pressure
 * @param conductance kg/s per Pa above the set pressure (valve) or above ambient (ruptured disc)
 */
public record ReliefSpec(double setPascal, double conductance, Destination destination) {

    public ReliefSpec {
        Objects.requireNonNull(destination, "destination");
    }
}
