package org.cryowarden.rules;

/**
 * What a unit measures. Values convert only within one dimension: a limit in kPa on a channel in mbar is
 * converted, a limit in K on a channel in % is a configuration error.
 */
public enum Dimension {
    TEMPERATURE("a temperature (K, mK, °C)"),
    PRESSURE("a pressure (Pa, kPa, MPa, mbar, bar(a), bar(g), psi, torr, atm)"),
    /** Fill fraction of a vessel or probe, e.g. a level in %. Deliberately not the same as {@link #GAS_FRACTION}. */
    FRACTION("a fraction (%)"),
    /** Gas concentration by volume, e.g. oxygen in %vol. */
    GAS_FRACTION("a gas concentration (%vol, ppm)"),
    VOLUME("a volume (mL, L, m3)"),
    LENGTH("a length (mm, cm, m)"),
    RESISTANCE("a resistance (ohm, kohm)"),
    VOLTAGE("a voltage (mV, V)"),
    CURRENT("a current (mA, A)"),
    POWER("a power (mW, W, kW)"),
    ENERGY("an energy (J, kJ, MJ)"),
    FLOW("a volume flow (L/s, L/min, L/h, m3/s, m3/min, m3/h)"),
    MASS("a mass (g, kg)"),
    HEAT_FLUX("a heat flux (W/m2)"),
    TIME("a duration (ms, s, min, h, d)"),
    /** Counts and states with no unit (a coil, a relay, a count of events). */
    NONE("a plain number (1)");

    private final String expected;

    Dimension(String expected) {
        this.expected = expected;
    }

    /** A phrase for error messages: "expected a pressure (Pa, kPa, ...)". */
    public String expected() {
        return expected;
    }
}
