package org.cryowarden.drivers.modbus;

import java.util.Locale;
import java.util.Optional;

/**
 * The four Modbus data tables (Modbus Application Protocol Specification V1.1b3, §4.3) and the functions that
 * read and write them.
 */
public enum ModbusTable {
    COIL(FunctionCode.READ_COILS, true),
    DISCRETE(FunctionCode.READ_DISCRETE_INPUTS, false),
    HOLDING(FunctionCode.READ_HOLDING_REGISTERS, true),
    INPUT(FunctionCode.READ_INPUT_REGISTERS, false);

    private final FunctionCode read;
    private final boolean writable;

    ModbusTable(FunctionCode read, boolean writable) {
        this.read = read;
        this.writable = writable;
    }

    public FunctionCode readFunction() {
        return read;
    }

    /** Coils and holding registers can be written; discrete inputs and input registers cannot. */
    public boolean writable() {
        return writable;
    }

    public boolean holdsBits() {
        return this == COIL || this == DISCRETE;
    }

    public String configName() {
        return name().toLowerCase(Locale.ROOT);
    }

    public static Optional<ModbusTable> fromConfig(String text) {
        for (ModbusTable table : values()) {
            if (table.configName().equals(text)) {
                return Optional.of(table);
            }
        }
        return Optional.empty();
    }
}
