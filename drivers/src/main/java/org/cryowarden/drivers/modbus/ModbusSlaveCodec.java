package org.cryowarden.drivers.modbus;

/**
 * The slave side of Modbus RTU without I/O, for the simulator and test devices: request framing and parsing,
 * and the encoding of normal and exception responses. Layouts from the Modbus Application Protocol
 * Specification V1.1b3, §6.1-§6.6, §6.11, §6.12 and §7; frame checks from Modbus over Serial Line V1.02, §2.5.1.
 */
public final class ModbusSlaveCodec {

    private ModbusSlaveCodec() {
    }

    /**
     * The complete length of the request frame starting in {@code buffer} once enough has arrived to tell:
     * 8 for functions 01-06, 9 plus the byte count for 15 and 16; -1 when more bytes are needed or the function
     * is unknown (the silent interval then ends the frame).
     */
    public static int requestLength(byte[] buffer, int length) {
        if (length < 2) {
            return -1;
        }
        int function = buffer[1] & 0xFF;
        if (function >= 0x01 && function <= 0x06) {
            return 8;
        }
        if (function == 0x0F || function == 0x10) {
            return length < 7 ? -1 : 9 + (buffer[6] & 0xFF);
        }
        return -1;
    }

    /** Classifies a received request frame; never throws on device bytes. */
    public static SlaveRequest parseRequest(byte[] frame, int length) {
        if (length < 4) {
            return new SlaveRequest.Ignored(FrameFault.SHORT_FRAME, "short frame of " + length + " bytes ("
                    + Hex.of(frame, length) + ")");
        }
        if (length > ModbusMasterCodec.MAX_FRAME) {
            return new SlaveRequest.Ignored(FrameFault.OVERSIZED, "frame of " + length + " bytes");
        }
        if (!ModbusCrc.isValid(frame, length)) {
            return new SlaveRequest.Ignored(FrameFault.BAD_CRC, "bad CRC (" + Hex.of(frame, length) + ")");
        }
        int unit = frame[0] & 0xFF;
        int code = frame[1] & 0xFF;
        if (unit > 247) {
            return new SlaveRequest.Ignored(FrameFault.WRONG_UNIT, "reserved address " + unit);
        }
        var function = FunctionCode.of(code);
        if (function.isEmpty()) {
            return new SlaveRequest.Refused(unit, code, ExceptionCode.ILLEGAL_FUNCTION,
                    String.format("function 0x%02X is not supported", code));
        }
        FunctionCode fn = function.get();
        int expected = fn == FunctionCode.WRITE_MULTIPLE_COILS || fn == FunctionCode.WRITE_MULTIPLE_REGISTERS
                ? (length >= 7 ? 9 + (frame[6] & 0xFF) : -1) : 8;
        if (length != expected) {
            return new SlaveRequest.Ignored(FrameFault.BAD_LENGTH, "request of " + length + " bytes for function "
                    + code + ", expected " + (expected < 0 ? "at least 9" : expected));
        }
        if (unit == 0 && fn.isRead()) {
            return new SlaveRequest.Ignored(FrameFault.WRONG_UNIT, "read request broadcast to unit 0");
        }
        int address = u16(frame, 2);
        int field = u16(frame, 4);
        switch (fn) {
            case READ_COILS, READ_DISCRETE_INPUTS, READ_HOLDING_REGISTERS, READ_INPUT_REGISTERS -> {
                if (field < fn.minQuantity() || field > fn.maxQuantity()) {
                    return refuse(unit, code, ExceptionCode.ILLEGAL_DATA_VALUE, "quantity " + field);
                }
                if (address + field > 0x10000) {
                    return refuse(unit, code, ExceptionCode.ILLEGAL_DATA_ADDRESS, "range " + address + "+" + field);
                }
                return new SlaveRequest.Accepted(ModbusRequest.read(unit, fn, address, field));
            }
            case WRITE_SINGLE_COIL -> {
                if (field != 0xFF00 && field != 0x0000) {
                    return refuse(unit, code, ExceptionCode.ILLEGAL_DATA_VALUE, String.format("coil value 0x%04X", field));
                }
                return new SlaveRequest.Accepted(ModbusRequest.writeSingleCoil(unit, address, field == 0xFF00));
            }
            case WRITE_SINGLE_REGISTER -> {
                return new SlaveRequest.Accepted(ModbusRequest.writeSingleRegister(unit, address, field));
            }
            case WRITE_MULTIPLE_COILS, WRITE_MULTIPLE_REGISTERS -> {
                boolean coils = fn == FunctionCode.WRITE_MULTIPLE_COILS;
                int byteCount = frame[6] & 0xFF;
                int expectedCount = coils ? (field + 7) / 8 : 2 * field;
                if (field < fn.minQuantity() || field > fn.maxQuantity() || byteCount != expectedCount) {
                    return refuse(unit, code, ExceptionCode.ILLEGAL_DATA_VALUE,
                            "quantity " + field + " with byte count " + byteCount);
                }
                if (address + field > 0x10000) {
                    return refuse(unit, code, ExceptionCode.ILLEGAL_DATA_ADDRESS, "range " + address + "+" + field);
                }
                if (coils) {
                    int[] bits = BitPacking.unpack(frame, 7, field);
                    return new SlaveRequest.Accepted(new ModbusRequest(unit, fn, address, field, bits));
                }
                int[] registers = new int[field];
                for (int i = 0; i < field; i++) {
                    registers[i] = u16(frame, 7 + 2 * i);
                }
                return new SlaveRequest.Accepted(ModbusRequest.writeMultipleRegisters(unit, address, registers));
            }
        }
        throw new AssertionError("unhandled function " + fn);
    }

    /**
     * The normal response to a read: {@code values} are 0/1 coil states or 0-65535 register values, exactly
     * {@code request.quantity()} of them.
     */
    public static byte[] encodeReadResponse(ModbusRequest request, int[] values) {
        if (!request.function().isRead()) {
            throw new IllegalArgumentException(request.function() + " is not a read");
        }
        if (values.length != request.quantity()) {
            throw new IllegalArgumentException("need " + request.quantity() + " values, got " + values.length);
        }
        ByteWriter out = new ByteWriter().u8(request.unit()).u8(request.function().code());
        if (request.function().readsBits()) {
            byte[] packed = BitPacking.pack(values);
            out.u8(packed.length).bytes(packed);
        } else {
            out.u8(2 * values.length);
            for (int value : values) {
                out.u16(value);
            }
        }
        return ModbusCrc.append(out.toArray());
    }

    /** The normal response to a write: the echo of address and value (05, 06) or address and quantity (15, 16). */
    public static byte[] encodeWriteResponse(ModbusRequest request) {
        if (request.function().isRead()) {
            throw new IllegalArgumentException(request.function() + " is not a write");
        }
        byte[] pdu = request.pdu();
        byte[] body = new byte[6];
        body[0] = (byte) request.unit();
        System.arraycopy(pdu, 0, body, 1, 5);
        return ModbusCrc.append(body);
    }

    /** An exception response: the function code with its high bit set, then the exception code (§7). */
    public static byte[] encodeException(int unit, int functionCode, ExceptionCode exception) {
        return ModbusCrc.append(new byte[] {(byte) unit, (byte) (functionCode | 0x80), (byte) exception.code()});
    }

    private static SlaveRequest refuse(int unit, int code, ExceptionCode exception, String detail) {
        return new SlaveRequest.Refused(unit, code, exception, detail);
    }

    private static int u16(byte[] frame, int offset) {
        return (frame[offset] & 0xFF) << 8 | (frame[offset + 1] & 0xFF);
    }
}
