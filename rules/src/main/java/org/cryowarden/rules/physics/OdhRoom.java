package org.cryowarden.rules.physics;

import java.util.List;
import java.util.Objects;

/**
 * A room as its ODH file describes it: volume, normal ventilation and the failure modes with the oxygen
 * minimum each leads to (already computed from its release).
 *
 * @param ventilationCubicMetresPerSecond normal ventilation rate (0 with {@link Ventilation#NONE})
 */
public record OdhRoom(String name, double volumeCubicMetres, Ventilation ventilation,
        double ventilationCubicMetresPerSecond, List<FailureMode> modes) {

    public OdhRoom {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(ventilation, "ventilation");
        modes = List.copyOf(modes);
    }

    public OdhAssessment assess() {
        return OdhAssessment.of(modes);
    }
}
