package org.cryowarden.rules.config;

import java.util.Optional;
import java.util.regex.Pattern;
import org.cryowarden.rules.Unit;

/** Unit symbols as written in configuration files, with "did you mean" for misspellings. */
final class Units {

    private static final Pattern BARE_NUMBER = Pattern.compile("\\s*[-+]?(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][-+]?\\d+)?\\s*");

    private Units() {
    }

    static Optional<Unit> parse(ConfigNode.Scalar scalar, String where, Problems problems) {
        Optional<Unit> unit = Unit.bySymbol(scalar.text());
        if (unit.isEmpty()) {
            String text = scalar.text().strip();
            String loose = null;
            for (String symbol : Unit.allSymbols()) {
                if (symbol.equalsIgnoreCase(text)) {
                    loose = symbol;
                }
            }
            String suggestion = loose != null ? "; did you mean '" + Unit.bySymbol(loose).orElseThrow().symbol() + "'?"
                    : Suggestions.didYouMean(text, Unit.allSymbols());
            problems.add(scalar.position(), where + ": unknown unit '" + text
                    + "', expected a unit such as K, °C, kPa, mbar, bar(g), %, %vol, L, mm, ohm, V, mA or W"
                    + suggestion);
        }
        return unit;
    }

    static boolean isBareNumber(String text) {
        return BARE_NUMBER.matcher(text).matches();
    }

    /** A number as people write it: 25 rather than 25.0. */
    static String number(double value) {
        if (value == Math.rint(value) && Math.abs(value) < 1e15) {
            return Long.toString((long) value);
        }
        return Double.toString(value);
    }
}
