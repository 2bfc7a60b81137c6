package org.cryowarden.drivers.modbus;

import java.util.Optional;

/**
 * Which register of a 32-bit value comes first. The Modbus specification orders bytes within a register (high
 * byte first) but not registers within a value; devices differ, so the site file says.
 */
public enum WordOrder {
    /** The high 16 bits are in the lower register address (the usual choice). */
    BIG,
    /** The low 16 bits are in the lower register address ("word swapped"). */
    LITTLE;

    public String configName() {
        return this == BIG ? "big" : "little";
    }

    public static Optional<WordOrder> fromConfig(String text) {
        return switch (text) {
            case "big" -> Optional.of(BIG);
            case "little" -> Optional.of(LITTLE);
            default -> Optional.empty();
        };
    }
}
