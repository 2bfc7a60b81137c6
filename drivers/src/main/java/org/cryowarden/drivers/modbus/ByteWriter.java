package org.cryowarden.drivers.modbus;

import java.io.ByteArrayOutputStream;

/** Big-endian PDU building: Modbus sends 16-bit fields high byte first (Application Protocol V1.1b3, §4.2). */
final class ByteWriter {

    private final ByteArrayOutputStream out = new ByteArrayOutputStream(16);

    ByteWriter u8(int value) {
        out.write(value & 0xFF);
        return this;
    }

    ByteWriter u16(int value) {
        out.write((value >>> 8) & 0xFF);
        out.write(value & 0xFF);
        return this;
    }

    ByteWriter bytes(byte[] bytes) {
        out.write(bytes, 0, bytes.length);
        return this;
    }

    byte[] toArray() {
        return out.toByteArray();
    }
}
