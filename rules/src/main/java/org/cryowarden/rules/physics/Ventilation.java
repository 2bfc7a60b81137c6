package org.cryowarden.rules.physics;

import java.util.Locale;
import java.util.Optional;

/**
 * How a room is ventilated during a release, which decides the FESHM 4240 solution that applies: a supply fan
 * blows fresh air in (the mixture leaves at Q + R), an exhaust fan draws the mixture out at Q (fresh air leaks
 * in at Q - R while Q > R), or there is none (the release pushes the mixture out at R).
 */
public enum Ventilation {
    SUPPLY("supply"),
    EXHAUST("exhaust"),
    NONE("none");

    private final String label;

    Ventilation(String label) {
        this.label = label;
    }

    public String label() {
        return label;
    }

    public static Optional<Ventilation> byLabel(String text) {
        String wanted = text.strip().toLowerCase(Locale.ROOT);
        for (Ventilation ventilation : values()) {
            if (ventilation.label.equals(wanted)) {
                return Optional.of(ventilation);
            }
        }
        return Optional.empty();
    }

    @Override
    public String toString() {
        return label;
    }
}
