package org.cryowarden.rules;

/**
 * Whether a pressure is measured against vacuum or against the ambient air. Stated by the unit, never
 * guessed: {@code bar(g)} is gauge, {@code bar(a)} and a bare {@code bar} are absolute.
 */
public enum PressureReference {
    ABSOLUTE,
    GAUGE,
    /** Not a pressure. */
    NOT_A_PRESSURE
}
