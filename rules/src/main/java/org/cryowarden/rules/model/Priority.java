package org.cryowarden.rules.model;

/** Alarm priority, most urgent first, so {@code compareTo} orders by urgency. */
public enum Priority {
    CRITICAL,
    HIGH,
    MEDIUM,
    LOW;

    /** The lower-case word used in files, topics and payloads. */
    public String word() {
        return name().toLowerCase(java.util.Locale.ROOT);
    }
}
