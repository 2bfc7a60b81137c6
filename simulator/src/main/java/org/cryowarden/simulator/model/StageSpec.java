package org.cryowarden.simulator.model;

import java.util.Objects;

/**
 * A warm stage of a cryostat (a radiation shield, a nitrogen-cooled baffle) read by a platinum thermometer: it
 * sits at {@code kelvin} while the insulating vacuum holds and warms towards room temperature with the time
 * constant {@code warmupSeconds} once it is lost.
 */
public record StageSpec(String id, double kelvin, double warmupSeconds) {

    public StageSpec {
        Objects.requireNonNull(id, "id");
    }
}
