package org.cryowarden.simulator.model;

import java.util.Objects;

/**
 * The normal vent path of a vessel: a check valve that opens at {@code crackingPascal} above the pressure
 * downstream, then passes gas in proportion to the pressure above cracking.
 *
 * @param conductance kg/s of gas per Pa above the cracking pressure
 */
public record VentSpec(Destination destination, double crackingPascal, double conductance) {

    public VentSpec {
        Objects.requireNonNull(destination, "destination");
    }
}
