package org.cryowarden.drivers.modbus;

import java.util.Objects;

/**
 * The bytes of one received RTU frame and what ended it.
 *
 * @param bytes  what arrived, possibly nothing
 * @param ending why reception stopped
 */
public record RtuFrame(byte[] bytes, Ending ending) {

    public RtuFrame {
        bytes = bytes.clone();
        Objects.requireNonNull(ending, "ending");
    }

    @Override
    public byte[] bytes() {
        return bytes.clone();
    }

    public int length() {
        return bytes.length;
    }

    public enum Ending {
        /** As many bytes as the frame's own header announced. */
        COMPLETE,
        /** A silent interval after some bytes: the frame ended, perhaps short. */
        SILENCE,
        /** Nothing arrived within the response timeout. */
        NO_REPLY,
        /** More than 256 bytes without a frame end. */
        OVERSIZED
    }
}
