package org.cryowarden.simulator.model;

import org.cryowarden.rules.physics.Cryogen;
import org.cryowarden.rules.physics.Helium4VapourPressure;

/**
 * The bath temperature of a boiling liquid at its vapour pressure: ITS-90 for helium-4 (through
 * {@link Helium4VapourPressure}), the Span et al. (2000) curve for nitrogen ({@link NitrogenSaturation}).
 * The model clamps the pressure to the range of each curve and says so in {@link #inRange}; a bath outside
 * it (a helium bath above 196 kPa) is held at the edge of the curve instead of extrapolated.
 */
final class Saturation {

    private Saturation() {
    }

    static boolean inRange(Cryogen fluid, double pascal) {
        return pascal >= minPascal(fluid) && pascal <= maxPascal(fluid);
    }

    static double kelvin(Cryogen fluid, double pascal) {
        double clamped = Math.max(minPascal(fluid), Math.min(maxPascal(fluid), pascal));
        return switch (fluid) {
            case HELIUM -> Helium4VapourPressure.temperature(clamped).temperatureKelvin();
            case NITROGEN -> NitrogenSaturation.temperature(clamped);
        };
    }

    private static double minPascal(Cryogen fluid) {
        return fluid == Cryogen.HELIUM ? Helium4VapourPressure.MIN_PASCAL : NitrogenSaturation.TRIPLE_PASCAL;
    }

    private static double maxPascal(Cryogen fluid) {
        return fluid == Cryogen.HELIUM ? Helium4VapourPressure.MAX_PASCAL : NitrogenSaturation.CRITICAL_PASCAL;
    }
}
