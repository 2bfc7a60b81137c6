package org.cryowarden.rules.physics;

import java.util.Locale;
import java.util.Optional;

/**
 * The liquids cryowarden does sums for, with their properties at the normal boiling point (101.325 kPa).
 * Sources: helium-4 from V. D. Arp and R. D. McCarty, Thermophysical properties of helium-4 from 0.8 to
 * 1500 K with pressures to 2000 MPa, NIST Technical Note 1334 (1989); nitrogen from R. T. Jacobsen, R. B.
 * Stewart and M. Jahangiri, Thermodynamic properties of nitrogen from the freezing line to 2000 K at pressures
 * to 1000 MPa, J. Phys. Chem. Ref. Data 15 (1986) 735. Values as rounded in cryogen-facility data sheets.
 *
 * <p>Gas at room conditions is treated as an ideal gas of the molar mass below (CODATA/IUPAC atomic weights);
 * between -50 °C and 60 °C and 50 kPa to 200 kPa that is within 0.3 % of the real gas for both fluids and
 * reproduces the tabulated densities at 0 °C and 21 °C to the digits given.
 */
public enum Cryogen {
    HELIUM("helium", 4.222, 125.0, 16.7, 20.75e3, 4.002602e-3),
    NITROGEN("nitrogen", 77.35, 806.0, 4.6, 199e3, 28.0134e-3);

    /** Molar gas constant, J/(mol K) (CODATA 2018, exact). */
    public static final double GAS_CONSTANT = 8.314462618;
    public static final double MIN_GAS_KELVIN = 223.15;
    public static final double MAX_GAS_KELVIN = 333.15;
    public static final double MIN_GAS_PASCAL = 50e3;
    public static final double MAX_GAS_PASCAL = 200e3;

    private final String label;
    private final double normalBoilingPointKelvin;
    private final double liquidDensity;
    private final double saturatedVapourDensity;
    private final double latentHeat;
    private final double molarMass;

    Cryogen(String label, double normalBoilingPointKelvin, double liquidDensity, double saturatedVapourDensity,
            double latentHeat, double molarMass) {
        this.label = label;
        this.normalBoilingPointKelvin = normalBoilingPointKelvin;
        this.liquidDensity = liquidDensity;
        this.saturatedVapourDensity = saturatedVapourDensity;
        this.latentHeat = latentHeat;
        this.molarMass = molarMass;
    }

    /** The lower-case name used in files and on the command line ({@code helium}, {@code nitrogen}). */
    public String label() {
        return label;
    }

    /** Looks a cryogen up by its label, ignoring case. */
    public static Optional<Cryogen> byLabel(String text) {
        String wanted = text.strip().toLowerCase(Locale.ROOT);
        for (Cryogen cryogen : values()) {
            if (cryogen.label.equals(wanted)) {
                return Optional.of(cryogen);
            }
        }
        return Optional.empty();
    }

    public double normalBoilingPointKelvin() {
        return normalBoilingPointKelvin;
    }

    /** Saturated liquid density at the normal boiling point, kg/m3. */
    public double liquidDensityKgPerCubicMetre() {
        return liquidDensity;
    }

    /** Saturated vapour density at the normal boiling point, kg/m3. */
    public double saturatedVapourDensityKgPerCubicMetre() {
        return saturatedVapourDensity;
    }

    /** Latent heat of vaporisation at the normal boiling point, J/kg. */
    public double latentHeatJoulePerKg() {
        return latentHeat;
    }

    /** Molar mass, kg/mol. */
    public double molarMassKgPerMole() {
        return molarMass;
    }

    /**
     * Density of the warm gas at a stated temperature and absolute pressure, ideal gas.
     *
     * @throws OutOfRangeException outside -50 °C to 60 °C or 50 kPa to 200 kPa, where the ideal gas is not
     *                             good to 0.3 %
     */
    public double gasDensityKgPerCubicMetre(double kelvin, double pascal) {
        RangeCheck.finite("gas temperature", kelvin);
        RangeCheck.finite("gas pressure", pascal);
        if (kelvin < MIN_GAS_KELVIN || kelvin > MAX_GAS_KELVIN) {
            throw new OutOfRangeException("gas temperature " + RangeCheck.format(kelvin - 273.15)
                    + " °C is outside the range -50 °C to 60 °C of the room-condition gas properties");
        }
        if (pascal < MIN_GAS_PASCAL || pascal > MAX_GAS_PASCAL) {
            throw new OutOfRangeException("gas pressure " + Pressures.describe(pascal)
                    + " is outside the range 50 kPa to 200 kPa (absolute) of the room-condition gas properties");
        }
        return pascal * molarMass / (GAS_CONSTANT * kelvin);
    }

    @Override
    public String toString() {
        return label;
    }
}
