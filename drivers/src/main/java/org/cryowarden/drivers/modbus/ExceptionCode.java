package org.cryowarden.drivers.modbus;

/**
 * Modbus exception codes with the names the Modbus Application Protocol Specification V1.1b3, §7, gives them.
 */
public enum ExceptionCode {
    ILLEGAL_FUNCTION(0x01, "ILLEGAL FUNCTION"),
    ILLEGAL_DATA_ADDRESS(0x02, "ILLEGAL DATA ADDRESS"),
    ILLEGAL_DATA_VALUE(0x03, "ILLEGAL DATA VALUE"),
    SERVER_DEVICE_FAILURE(0x04, "SERVER DEVICE FAILURE"),
    ACKNOWLEDGE(0x05, "ACKNOWLEDGE"),
    SERVER_DEVICE_BUSY(0x06, "SERVER DEVICE BUSY"),
    MEMORY_PARITY_ERROR(0x08, "MEMORY PARITY ERROR"),
    GATEWAY_PATH_UNAVAILABLE(0x0A, "GATEWAY PATH UNAVAILABLE"),
    GATEWAY_TARGET_FAILED_TO_RESPOND(0x0B, "GATEWAY TARGET DEVICE FAILED TO RESPOND");

    private final int code;
    private final String specName;

    ExceptionCode(int code, String specName) {
        this.code = code;
        this.specName = specName;
    }

    public int code() {
        return code;
    }

    /** The name as printed in the specification, e.g. "ILLEGAL DATA ADDRESS". */
    public String specName() {
        return specName;
    }

    /** The name of a raw exception code, or "unknown exception code 0x2A" for codes the specification does not define. */
    public static String describe(int code) {
        for (ExceptionCode known : values()) {
            if (known.code == code) {
                return known.specName;
            }
        }
        return String.format("unknown exception code 0x%02X", code);
    }
}
