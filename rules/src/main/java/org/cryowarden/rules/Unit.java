package org.cryowarden.rules;

import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;

/**
 * The closed set of engineering units cryowarden knows, each with its conversion to the SI base of its
 * dimension ({@code si = value * scale + offset}).
 *
 * <p>Pressure units carry their reference: a bare symbol ({@code kPa}, {@code bar}, {@code psi}, {@code torr},
 * {@code atm}) is absolute, a {@code (g)} suffix ({@code bar(g)}, {@code psi(g)}, also written {@code barg},
 * {@code psig}) is gauge. Converting between the two needs the ambient pressure, which callers state.
 */
public enum Unit {
    KELVIN("K", Dimension.TEMPERATURE, 1, 0, List.of("kelvin")),
    MILLIKELVIN("mK", Dimension.TEMPERATURE, 1e-3, 0, List.of()),
    CELSIUS("°C", Dimension.TEMPERATURE, 1, 273.15, List.of("C", "degC", "celsius", "℃")),

    PASCAL("Pa", Dimension.PRESSURE, 1, 0, List.of("Pa(a)")),
    KILOPASCAL("kPa", Dimension.PRESSURE, 1e3, 0, List.of("kPa(a)")),
    MEGAPASCAL("MPa", Dimension.PRESSURE, 1e6, 0, List.of("MPa(a)")),
    MILLIBAR("mbar", Dimension.PRESSURE, 100, 0, List.of("mbar(a)", "hPa")),
    BAR("bar", Dimension.PRESSURE, 1e5, 0, List.of("bar(a)", "bara")),
    PSI("psi", Dimension.PRESSURE, 6894.757293168361, 0, List.of("psi(a)", "psia")),
    TORR("torr", Dimension.PRESSURE, 101325.0 / 760.0, 0, List.of("Torr", "mmHg")),
    ATMOSPHERE("atm", Dimension.PRESSURE, 101325.0, 0, List.of()),
    KILOPASCAL_GAUGE("kPa(g)", Dimension.PRESSURE, 1e3, 0, List.of("kPag")),
    MILLIBAR_GAUGE("mbar(g)", Dimension.PRESSURE, 100, 0, List.of("mbarg")),
    BAR_GAUGE("bar(g)", Dimension.PRESSURE, 1e5, 0, List.of("barg")),
    PSI_GAUGE("psi(g)", Dimension.PRESSURE, 6894.757293168361, 0, List.of("psig")),

    PERCENT("%", Dimension.FRACTION, 1e-2, 0, List.of("percent")),
    PERCENT_VOLUME("%vol", Dimension.GAS_FRACTION, 1e-2, 0, List.of("% vol", "vol%", "%v/v")),
    PPM("ppm", Dimension.GAS_FRACTION, 1e-6, 0, List.of()),

    MILLILITRE("mL", Dimension.VOLUME, 1e-6, 0, List.of("ml")),
    LITRE("L", Dimension.VOLUME, 1e-3, 0, List.of("l", "litre", "liter")),
    CUBIC_METRE("m3", Dimension.VOLUME, 1, 0, List.of("m^3", "m³")),

    MILLIMETRE("mm", Dimension.LENGTH, 1e-3, 0, List.of()),
    CENTIMETRE("cm", Dimension.LENGTH, 1e-2, 0, List.of()),
    METRE("m", Dimension.LENGTH, 1, 0, List.of()),
    INCH("in", Dimension.LENGTH, 0.0254, 0, List.of("inch")),

    OHM("ohm", Dimension.RESISTANCE, 1, 0, List.of("Ω", "Ohm", "ohms")),
    KILOHM("kohm", Dimension.RESISTANCE, 1e3, 0, List.of("kΩ", "kOhm")),

    MILLIVOLT("mV", Dimension.VOLTAGE, 1e-3, 0, List.of()),
    VOLT("V", Dimension.VOLTAGE, 1, 0, List.of()),

    MILLIAMPERE("mA", Dimension.CURRENT, 1e-3, 0, List.of()),
    AMPERE("A", Dimension.CURRENT, 1, 0, List.of()),

    MILLIWATT("mW", Dimension.POWER, 1e-3, 0, List.of()),
    WATT("W", Dimension.POWER, 1, 0, List.of()),
    KILOWATT("kW", Dimension.POWER, 1e3, 0, List.of()),

    JOULE("J", Dimension.ENERGY, 1, 0, List.of()),
    KILOJOULE("kJ", Dimension.ENERGY, 1e3, 0, List.of()),
    MEGAJOULE("MJ", Dimension.ENERGY, 1e6, 0, List.of()),

    LITRE_PER_SECOND("L/s", Dimension.FLOW, 1e-3, 0, List.of("l/s")),
    LITRE_PER_MINUTE("L/min", Dimension.FLOW, 1e-3 / 60, 0, List.of("l/min")),
    LITRE_PER_HOUR("L/h", Dimension.FLOW, 1e-3 / 3600, 0, List.of("l/h")),
    CUBIC_METRE_PER_SECOND("m3/s", Dimension.FLOW, 1, 0, List.of("m^3/s")),
    CUBIC_METRE_PER_MINUTE("m3/min", Dimension.FLOW, 1.0 / 60, 0, List.of("m^3/min")),
    CUBIC_METRE_PER_HOUR("m3/h", Dimension.FLOW, 1.0 / 3600, 0, List.of("m^3/h")),

    GRAM("g", Dimension.MASS, 1e-3, 0, List.of()),
    KILOGRAM("kg", Dimension.MASS, 1, 0, List.of()),

    WATT_PER_SQUARE_METRE("W/m2", Dimension.HEAT_FLUX, 1, 0, List.of("W/m^2", "W/m²")),

    MILLISECOND("ms", Dimension.TIME, 1e-3, 0, List.of()),
    SECOND("s", Dimension.TIME, 1, 0, List.of("sec")),
    MINUTE("min", Dimension.TIME, 60, 0, List.of()),
    HOUR("h", Dimension.TIME, 3600, 0, List.of("hr")),
    DAY("d", Dimension.TIME, 86400, 0, List.of("day")),

    /** A plain number: states, counts, coils. */
    ONE("1", Dimension.NONE, 1, 0, List.of("count", "state"));

    private static final Map<String, Unit> BY_SYMBOL = new HashMap<>();

    static {
        for (Unit unit : values()) {
            BY_SYMBOL.put(unit.symbol, unit);
            for (String alias : unit.aliases) {
                BY_SYMBOL.put(alias, unit);
            }
        }
    }

    private final String symbol;
    private final Dimension dimension;
    private final double scale;
    private final double offset;
    private final List<String> aliases;

    Unit(String symbol, Dimension dimension, double scale, double offset, List<String> aliases) {
        this.symbol = symbol;
        this.dimension = dimension;
        this.scale = scale;
        this.offset = offset;
        this.aliases = aliases;
    }

    /** The symbol as people write it and as cryowarden prints it ({@code kPa}, {@code bar(g)}, {@code %vol}). */
    public String symbol() {
        return symbol;
    }

    public Dimension dimension() {
        return dimension;
    }

    public PressureReference pressureReference() {
        if (dimension != Dimension.PRESSURE) {
            return PressureReference.NOT_A_PRESSURE;
        }
        return symbol.endsWith("(g)") ? PressureReference.GAUGE : PressureReference.ABSOLUTE;
    }

    /** Looks a symbol up exactly (case matters: {@code mK} is not {@code MK}); aliases included. */
    public static Optional<Unit> bySymbol(String text) {
        return Optional.ofNullable(BY_SYMBOL.get(text.strip()));
    }

    /** Every symbol and alias, for "did you mean" suggestions. */
    public static java.util.Set<String> allSymbols() {
        return java.util.Collections.unmodifiableSet(BY_SYMBOL.keySet());
    }

    /** Every symbol then its aliases, unit by unit in declaration order, so that suggestions are deterministic. */
    static List<String> symbolsInOrder() {
        List<String> symbols = new java.util.ArrayList<>();
        for (Unit unit : values()) {
            symbols.add(unit.symbol);
            symbols.addAll(unit.aliases);
        }
        return symbols;
    }

    /** This value in the SI base of the dimension (K, Pa, m3, m3/s, ...). Gauge pressures stay gauge. */
    public double toBase(double value) {
        return value * scale + offset;
    }

    /** The inverse of {@link #toBase(double)}. */
    public double fromBase(double base) {
        return (base - offset) / scale;
    }

    /**
     * Converts a difference (a deadband, a tolerance, a rate numerator) rather than a level: offsets do not
     * apply, so 2 °C of deadband is 2 K.
     */
    public double differenceTo(Unit target, double difference) {
        requireSameDimension(target);
        return difference * scale / target.scale;
    }

    /**
     * Converts a value into {@code target}. A gauge/absolute change adds or subtracts {@code ambientPascal};
     * for any other dimension the ambient pressure is ignored.
     *
     * @throws IllegalArgumentException when the dimensions differ
     */
    public double convert(double value, Unit target, double ambientPascal) {
        requireSameDimension(target);
        if (target == this) {
            // exact: a trip through the SI base would turn 850 °C into 850.0000000000001 °C
            return value;
        }
        double base = toBase(value);
        PressureReference from = pressureReference();
        PressureReference to = target.pressureReference();
        if (from == PressureReference.GAUGE && to == PressureReference.ABSOLUTE) {
            base += ambientPascal;
        } else if (from == PressureReference.ABSOLUTE && to == PressureReference.GAUGE) {
            base -= ambientPascal;
        }
        return target.fromBase(base);
    }

    /** Whether values convert into {@code other} (same dimension). */
    public boolean isCompatibleWith(Unit other) {
        return dimension == other.dimension;
    }

    private void requireSameDimension(Unit target) {
        if (dimension != target.dimension) {
            throw new IllegalArgumentException(
                    "cannot convert " + symbol + " to " + target.symbol + ": " + target.symbol + " is "
                            + target.dimension.expected() + ", " + symbol + " is " + dimension.expected());
        }
    }

    /** Case-insensitive lookup used only for suggestions ("MPA" -> "MPa"). */
    static Optional<Unit> byLooseSymbol(String text) {
        String wanted = text.strip().toLowerCase(Locale.ROOT);
        for (Unit unit : values()) {
            if (unit.symbol.toLowerCase(Locale.ROOT).equals(wanted)) {
                return Optional.of(unit);
            }
            for (String alias : unit.aliases) {
                if (alias.toLowerCase(Locale.ROOT).equals(wanted)) {
                    return Optional.of(unit);
                }
            }
        }
        return Optional.empty();
    }

    @Override
    public String toString() {
        return symbol;
    }
}
