package org.cryowarden.drivers.modbus;

/**
 * Why a received frame could not be used. Each kind has its own counter key so an operator can tell a noisy
 * line (bad CRC) from a wrong address plan (wrong unit) or a dead device (no reply).
 */
public enum FrameFault {
    NO_REPLY("timeout"),
    SHORT_FRAME("short_frame"),
    BAD_CRC("bad_crc"),
    /**
     * A valid frame from another unit. The master does not fail on it: it discards the frame, most likely a
     * neighbour's late reply, and waits on for its own ({@link ModbusClient}, counted as "foreign_frame").
     */
    WRONG_UNIT("wrong_unit"),
    WRONG_FUNCTION("wrong_function"),
    BAD_BYTE_COUNT("bad_byte_count"),
    BAD_LENGTH("bad_length"),
    ECHO_MISMATCH("echo_mismatch"),
    OVERSIZED("oversized_frame"),
    UNSUPPORTED_FUNCTION("unsupported_function");

    private final String counterKey;

    FrameFault(String counterKey) {
        this.counterKey = counterKey;
    }

    /** The key under which drivers count this fault, e.g. "bad_crc". */
    public String counterKey() {
        return counterKey;
    }
}
