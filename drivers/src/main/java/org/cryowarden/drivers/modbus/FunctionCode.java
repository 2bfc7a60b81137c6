package org.cryowarden.drivers.modbus;

import java.util.Optional;

/**
 * The public function codes cryowarden speaks, with the limits on quantity that the Modbus Application Protocol
 * Specification V1.1b3 (§6.1-§6.6, §6.11, §6.12) sets for each.
 */
public enum FunctionCode {
    READ_COILS(0x01, 1, 0x07D0),
    READ_DISCRETE_INPUTS(0x02, 1, 0x07D0),
    READ_HOLDING_REGISTERS(0x03, 1, 0x007D),
    READ_INPUT_REGISTERS(0x04, 1, 0x007D),
    WRITE_SINGLE_COIL(0x05, 1, 1),
    WRITE_SINGLE_REGISTER(0x06, 1, 1),
    WRITE_MULTIPLE_COILS(0x0F, 1, 0x07B0),
    WRITE_MULTIPLE_REGISTERS(0x10, 1, 0x007B);

    private final int code;
    private final int minQuantity;
    private final int maxQuantity;

    FunctionCode(int code, int minQuantity, int maxQuantity) {
        this.code = code;
        this.minQuantity = minQuantity;
        this.maxQuantity = maxQuantity;
    }

    public int code() {
        return code;
    }

    public int minQuantity() {
        return minQuantity;
    }

    public int maxQuantity() {
        return maxQuantity;
    }

    /** True for the two functions that answer with packed bits (coils and discrete inputs). */
    public boolean readsBits() {
        return this == READ_COILS || this == READ_DISCRETE_INPUTS;
    }

    /** True for the two functions that answer with registers. */
    public boolean readsRegisters() {
        return this == READ_HOLDING_REGISTERS || this == READ_INPUT_REGISTERS;
    }

    public boolean isRead() {
        return readsBits() || readsRegisters();
    }

    public static Optional<FunctionCode> of(int code) {
        for (FunctionCode function : values()) {
            if (function.code == code) {
                return Optional.of(function);
            }
        }
        return Optional.empty();
    }
}
