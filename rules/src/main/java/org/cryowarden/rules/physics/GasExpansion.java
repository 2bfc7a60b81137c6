package org.cryowarden.rules.physics;

/**
 * How much gas a volume of boiling liquid becomes when it warms to room conditions: the liquid's mass
 * ({@code V rho_liquid} at the normal boiling point) divided by the gas density at the stated temperature and
 * pressure. The mass balance is common practice; the properties and their sources are those of
 * {@link Cryogen}. The often quoted 1:757 (helium) and 1:694 (nitrogen) are 70 °F (21.1 °C) figures.
 */
public final class GasExpansion {

    private GasExpansion() {
    }

    /**
     * Cubic metres of gas from {@code liquidCubicMetres} of liquid.
     *
     * @throws OutOfRangeException for a negative volume or gas conditions outside the ideal-gas range
     */
    public static double gasCubicMetres(Cryogen cryogen, double liquidCubicMetres, double gasKelvin,
            double gasPascal) {
        RangeCheck.nonNegative("liquid volume", liquidCubicMetres, "m3");
        return liquidCubicMetres * ratio(cryogen, gasKelvin, gasPascal);
    }

    /** Gas volume per unit liquid volume at the stated conditions (about 700 for helium at 0 °C). */
    public static double ratio(Cryogen cryogen, double gasKelvin, double gasPascal) {
        return cryogen.liquidDensityKgPerCubicMetre() / cryogen.gasDensityKgPerCubicMetre(gasKelvin, gasPascal);
    }
}
