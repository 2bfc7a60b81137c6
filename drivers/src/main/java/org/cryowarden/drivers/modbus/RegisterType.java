package org.cryowarden.drivers.modbus;

import java.util.Locale;
import java.util.Optional;

/**
 * How one value is laid out in 16-bit registers. The 32-bit types take two registers; float32 is an IEEE 754
 * binary32 value (IEEE Std 754-2008, §3.4).
 */
public enum RegisterType {
    UINT16(1), INT16(1), UINT32(2), INT32(2), FLOAT32(2);

    private final int registers;

    RegisterType(int registers) {
        this.registers = registers;
    }

    /** How many consecutive registers a value of this type occupies. */
    public int registers() {
        return registers;
    }

    /** The name used in site files and on the command line: "uint16", "float32". */
    public String configName() {
        return name().toLowerCase(Locale.ROOT);
    }

    public static Optional<RegisterType> fromConfig(String text) {
        for (RegisterType type : values()) {
            if (type.configName().equals(text)) {
                return Optional.of(type);
            }
        }
        return Optional.empty();
    }
}
