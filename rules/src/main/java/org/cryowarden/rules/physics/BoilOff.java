package org.cryowarden.rules.physics;

/**
 * Liquid lost and gas produced by a steady heat load on a bath at its normal boiling point: the heat
 * evaporates {@code Q / L} kilograms per second, which is {@code Q / (L rho_liquid)} of liquid volume and, warmed
 * to room conditions, {@code Q / (L rho_gas)} of gas. The energy balance is common practice; the properties and
 * their sources are those of {@link Cryogen}.
 *
 * <p>The liquid figure is the usual one (1 W boils about 1.39 L/h of helium): it ignores the cold vapour that
 * stays behind to fill the space the liquid left, which in a closed dewar makes the level fall faster by
 * {@code rho_liquid / (rho_liquid - rho_vapour)} (about 15 % for helium, under 1 % for nitrogen).
 */
public final class BoilOff {

    private BoilOff() {
    }

    /**
     * Litres of liquid evaporated per hour.
     *
     * @throws OutOfRangeException for a negative or non-finite heat load
     */
    public static double liquidLitresPerHour(Cryogen cryogen, double heatLoadWatts) {
        RangeCheck.nonNegative("heat load", heatLoadWatts, "W");
        double massPerSecond = heatLoadWatts / cryogen.latentHeatJoulePerKg();
        return massPerSecond / cryogen.liquidDensityKgPerCubicMetre() * 1000 * 3600;
    }

    /**
     * Cubic metres per hour of the evaporated gas at a stated temperature and absolute pressure.
     *
     * @throws OutOfRangeException for a negative heat load or gas conditions outside the ideal-gas range
     */
    public static double gasCubicMetresPerHour(Cryogen cryogen, double heatLoadWatts, double gasKelvin,
            double gasPascal) {
        RangeCheck.nonNegative("heat load", heatLoadWatts, "W");
        double massPerSecond = heatLoadWatts / cryogen.latentHeatJoulePerKg();
        return massPerSecond / cryogen.gasDensityKgPerCubicMetre(gasKelvin, gasPascal) * 3600;
    }
}
