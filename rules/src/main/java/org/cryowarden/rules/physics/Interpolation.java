package org.cryowarden.rules.physics;

import java.util.Locale;
import java.util.Optional;

/** How a calibration table is interpolated between its points. */
public enum Interpolation {
    /** Steffen's monotone cubic on raw and value as given. */
    MONOTONE_CUBIC("monotone-cubic"),
    /** Steffen's monotone cubic on ln(raw) and ln(value), for sensors that are straight on log-log paper. */
    LOG_LOG("log-log");

    private final String label;

    Interpolation(String label) {
        this.label = label;
    }

    public String label() {
        return label;
    }

    public static Optional<Interpolation> byLabel(String text) {
        String wanted = text.strip().toLowerCase(Locale.ROOT);
        for (Interpolation interpolation : values()) {
            if (interpolation.label.equals(wanted)) {
                return Optional.of(interpolation);
            }
        }
        return Optional.empty();
    }

    @Override
    public String toString() {
        return label;
    }
}
