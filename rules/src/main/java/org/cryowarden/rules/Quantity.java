package org.cryowarden.rules;

import java.util.Objects;
import java.util.Optional;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * A number with its unit, as written in site files, rule sets and on the command line: {@code 101.325kPa},
 * {@code 760 torr}, {@code 1.2 bar(g)}, {@code -196C}, {@code 2 m3/min}, {@code 30s}.
 */
public record Quantity(double value, Unit unit) {

    /** Standard atmosphere, the ambient pressure assumed for gauge conversions unless a site states its own. */
    public static final double STANDARD_ATMOSPHERE_PA = 101_325.0;

    // The mantissa is possessive: with backtracking, a long run of digits before a line break took cubic time.
    private static final Pattern FORM = Pattern.compile(
            "\\s*([-+]?(?:\\d++(?:\\.\\d*+)?+|\\.\\d++)(?:[eE][-+]?\\d+)?)\\s*(\\S(?:.*\\S)?)?\\s*");

    public Quantity {
        Objects.requireNonNull(unit, "unit");
    }

    public static Quantity of(double value, Unit unit) {
        return new Quantity(value, unit);
    }

    /**
     * Parses a quantity of any known unit.
     *
     * @throws IllegalArgumentException with a message that says what was found and what is expected
     */
    public static Quantity parse(String text) {
        Objects.requireNonNull(text, "text");
        // a typographic minus (U+2212) is what word processors put in front of "196 °C"
        Matcher matcher = FORM.matcher(text.replace('\u2212', '-'));
        if (!matcher.matches()) {
            throw new IllegalArgumentException(
                    "'" + text + "' is not a quantity: expected a number followed by a unit, e.g. 101.325kPa or 4.2 K");
        }
        double number = Double.parseDouble(matcher.group(1));
        if (!Double.isFinite(number)) {
            throw new IllegalArgumentException("'" + text.strip() + "' is too large a number");
        }
        String symbol = matcher.group(2);
        if (symbol == null) {
            throw new IllegalArgumentException("'" + text.strip() + "' has no unit: write the unit after the number, e.g. "
                    + text.strip() + " kPa");
        }
        Optional<Unit> unit = Unit.bySymbol(symbol);
        if (unit.isEmpty()) {
            throw new IllegalArgumentException("unknown unit '" + symbol + "' in '" + text.strip() + "'" + suggestion(symbol));
        }
        return new Quantity(number, unit.get());
    }

    /**
     * Parses a quantity that must be of one dimension.
     *
     * @throws IllegalArgumentException when it does not parse or is of another dimension
     */
    public static Quantity parse(String text, Dimension expected) {
        Quantity quantity = parse(text);
        if (quantity.unit.dimension() != expected) {
            throw new IllegalArgumentException("expected " + expected.expected() + ", got '" + text.strip() + "' which is "
                    + quantity.unit.dimension().expected());
        }
        return quantity;
    }

    /** This quantity in another unit of the same dimension, converting gauge pressures at standard atmosphere. */
    public double in(Unit target) {
        return unit.convert(value, target, STANDARD_ATMOSPHERE_PA);
    }

    /** This quantity in another unit, converting gauge pressures against the stated ambient pressure in Pa. */
    public double in(Unit target, double ambientPascal) {
        return unit.convert(value, target, ambientPascal);
    }

    /** The value in the SI base of its dimension; gauge pressures become absolute at the stated ambient. */
    public double toAbsoluteBase(double ambientPascal) {
        double base = unit.toBase(value);
        return unit.pressureReference() == PressureReference.GAUGE ? base + ambientPascal : base;
    }

    /** The value in the SI base (K, Pa absolute at standard atmosphere, m3, W, m3/s, s, ...). */
    public double toBase() {
        return toAbsoluteBase(STANDARD_ATMOSPHERE_PA);
    }

    private static String suggestion(String symbol) {
        Optional<Unit> loose = Unit.byLooseSymbol(symbol);
        if (loose.isPresent()) {
            return ": did you mean '" + loose.get().symbol() + "'?";
        }
        return NameMatch.closest(symbol, Unit.symbolsInOrder()).map(best -> ": did you mean '" + best + "'?").orElse("");
    }

    @Override
    public String toString() {
        String number = value == Math.rint(value) && Math.abs(value) < 1e15
                ? Long.toString((long) value)
                : Double.toString(value);
        return number + " " + unit.symbol();
    }
}
