package org.cryowarden.rules.physics;

import java.util.List;

/**
 * The oxygen-deficiency-hazard estimate of a room: the fatality rate phi = sum over failure modes of
 * P_i F_i per hour, and the ODH class it falls in. Source: Fermilab ES&H Manual (FESHM) chapter 4240, Oxygen
 * Deficiency Hazards. An estimate for the safety officer's review; it never replaces fixed oxygen monitors,
 * ventilation interlocks or local codes.
 */
public record OdhAssessment(List<FailureMode> modes, double fatalityRatePerHour, OdhClass odhClass) {

    public OdhAssessment {
        modes = List.copyOf(modes);
    }

    public static OdhAssessment of(List<FailureMode> modes) {
        double phi = 0;
        for (FailureMode mode : modes) {
            phi += mode.fatalityRatePerHour();
        }
        return new OdhAssessment(modes, phi, OdhClass.of(phi));
    }
}
