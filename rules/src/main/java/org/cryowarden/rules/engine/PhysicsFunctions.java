package org.cryowarden.rules.engine;

import java.util.List;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.physics.BoilOff;
import org.cryowarden.rules.physics.Cryogen;
import org.cryowarden.rules.physics.Helium4VapourPressure;
import org.cryowarden.rules.physics.NitrogenSaturation;
import org.cryowarden.rules.physics.OxygenPartialPressure;
import org.cryowarden.rules.physics.PlatinumResistanceThermometer;
import org.cryowarden.rules.physics.SuperconductingLevelProbe;
import org.cryowarden.rules.physics.VerticalVessel;

/**
 * The physics conversions a derived channel may name, registered in the same catalogue as {@code min} and
 * {@code mean}. Each is a thin binding of a class in {@code rules.physics}, which names its published source; a
 * value outside an equation's range throws there, and the engine turns that message into the BAD reason.
 */
final class PhysicsFunctions {

    private static final DerivedFunctions.Parameter DIAMETER = new DerivedFunctions.Parameter("diameter", Unit.METRE);
    private static final DerivedFunctions.Parameter STRAIGHT =
            new DerivedFunctions.Parameter("straight_length", Unit.METRE);

    private PhysicsFunctions() {
    }

    static DerivedFunctions register(DerivedFunctions catalogue) {
        return catalogue
                .with(DerivedFunctions.Entry.fixedUnits("he4_saturation_temperature",
                        "helium-4 bath temperature from its vapour pressure (ITS-90)",
                        List.of(Unit.PASCAL), Unit.KELVIN, List.of(),
                        (in, p) -> Helium4VapourPressure.temperature(in[0]).temperatureKelvin()))
                .with(DerivedFunctions.Entry.fixedUnits("n2_saturation_temperature",
                        "nitrogen bath temperature from its vapour pressure (Span et al. 2000)",
                        List.of(Unit.PASCAL), Unit.KELVIN, List.of(), (in, p) -> NitrogenSaturation.temperature(in[0])))
                .with(DerivedFunctions.Entry.fixedUnits("prt_temperature",
                        "temperature of a platinum resistance thermometer (IEC 60751)",
                        List.of(Unit.OHM), Unit.CELSIUS,
                        List.of(new DerivedFunctions.Parameter("r0", Unit.OHM)),
                        (in, p) -> new PlatinumResistanceThermometer(p[0]).temperature(in[0])))
                .with(DerivedFunctions.Entry.fixedUnits("level_probe_height",
                        "liquid height from a superconducting level probe's resistance",
                        List.of(Unit.OHM), Unit.METRE,
                        List.of(new DerivedFunctions.Parameter("full_resistance", Unit.OHM),
                                new DerivedFunctions.Parameter("active_length", Unit.METRE),
                                new DerivedFunctions.Parameter("bottom_offset", Unit.METRE)),
                        (in, p) -> new SuperconductingLevelProbe(p[0], p[1], p[2]).liquidHeightMetres(in[0])))
                .with(DerivedFunctions.Entry.fixedUnits("probe_percent_height",
                        "liquid height from a level reading in % of the probe's active length",
                        List.of(Unit.PERCENT), Unit.METRE,
                        List.of(new DerivedFunctions.Parameter("active_length", Unit.METRE),
                                new DerivedFunctions.Parameter("bottom_offset", Unit.METRE)),
                        PhysicsFunctions::probePercentHeight))
                .with(vessel("litres_flat_bottom", "litres in a vertical cylinder with a flat bottom",
                        List.of(DIAMETER, STRAIGHT), p -> VerticalVessel.flatBottom(p[0], p[1])))
                .with(vessel("litres_hemispherical_bottom", "litres in a vertical cylinder with a hemispherical bottom",
                        List.of(DIAMETER, STRAIGHT), p -> VerticalVessel.hemisphericalBottom(p[0], p[1])))
                .with(vessel("litres_asme_fd_bottom",
                        "litres in a vertical cylinder with an ASME flanged-and-dished bottom",
                        List.of(DIAMETER, STRAIGHT), p -> VerticalVessel.asmeFlangedAndDishedBottom(p[0], p[1])))
                .with(vessel("litres_torispherical_bottom",
                        "litres in a vertical cylinder with a torispherical bottom of stated crown and knuckle radii",
                        List.of(DIAMETER, STRAIGHT, new DerivedFunctions.Parameter("crown_radius", Unit.METRE),
                                new DerivedFunctions.Parameter("knuckle_radius", Unit.METRE)),
                        p -> VerticalVessel.torisphericalBottom(p[0], p[1], p[2], p[3])))
                .with(DerivedFunctions.Entry.fixedUnits("oxygen_partial_pressure",
                        "oxygen partial pressure from its fraction and the barometric pressure",
                        List.of(Unit.PERCENT_VOLUME, Unit.PASCAL), Unit.PASCAL, List.of(),
                        (in, p) -> OxygenPartialPressure.pascal(in[0] / 100.0, in[1])))
                .with(DerivedFunctions.Entry.fixedUnits("boiloff_helium",
                        "liquid helium boiled off per hour by a heat load",
                        List.of(Unit.WATT), Unit.LITRE_PER_HOUR, List.of(),
                        (in, p) -> BoilOff.liquidLitresPerHour(Cryogen.HELIUM, in[0])))
                .with(DerivedFunctions.Entry.fixedUnits("boiloff_nitrogen",
                        "liquid nitrogen boiled off per hour by a heat load",
                        List.of(Unit.WATT), Unit.LITRE_PER_HOUR, List.of(),
                        (in, p) -> BoilOff.liquidLitresPerHour(Cryogen.NITROGEN, in[0])));
    }

    /** Builds the vessel from the parameters on every call: cheap, and it keeps the function stateless. */
    private interface VesselShape {
        VerticalVessel of(double[] parameters);
    }

    private static DerivedFunctions.Entry vessel(String name, String description,
            List<DerivedFunctions.Parameter> parameters, VesselShape shape) {
        return DerivedFunctions.Entry.fixedUnits(name, description, List.of(Unit.METRE), Unit.LITRE, parameters,
                (in, p) -> shape.of(p).volumeCubicMetres(in[0]) * 1000.0);
    }

    private static double probePercentHeight(double[] in, double[] p) {
        if (in[0] < 0 || in[0] > 100) {
            throw new IllegalArgumentException("level " + in[0] + " % is outside the probe's 0 to 100 %");
        }
        return p[1] + in[0] / 100.0 * p[0];
    }
}
