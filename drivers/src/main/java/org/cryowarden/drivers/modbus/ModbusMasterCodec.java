package org.cryowarden.drivers.modbus;

/**
 * The master side of Modbus RTU without I/O: how long a reply will be, and what a received frame means for the
 * request that was sent. Checks follow the Modbus over Serial Line Specification V1.02 (§2.5.1, CRC and framing)
 * and the Modbus Application Protocol Specification V1.1b3 (§6 response layouts, §7 exception responses):
 * slave address, function code, byte count, length, CRC and write echo. Every input, however malformed, is
 * classified; nothing here throws on device bytes.
 */
public final class ModbusMasterCodec {

    /** The largest RTU frame the serial line specification allows (V1.02, §2.5.1.1). */
    public static final int MAX_FRAME = 256;

    private ModbusMasterCodec() {
    }

    /**
     * The complete length of the reply frame that starts in {@code buffer}, once enough of it has arrived to
     * tell: 5 for an exception response, the normal length for the request otherwise; -1 when more bytes are
     * needed or the function byte matches neither (the silent interval then ends the frame).
     */
    public static int replyLength(ModbusRequest request, byte[] buffer, int length) {
        if (length < 2) {
            return -1;
        }
        int function = buffer[1] & 0xFF;
        if ((buffer[0] & 0xFF) != request.unit()) {
            return anyReplyLength(function, buffer, length);
        }
        if (function == (request.function().code() | 0x80)) {
            return 5;
        }
        if (function != request.function().code()) {
            return -1;
        }
        if (request.function().isRead()) {
            return length < 3 ? -1 : 5 + (buffer[2] & 0xFF);
        }
        return 8;
    }

    /**
     * The length of a reply from another unit (a neighbour's late reply), from its own function code, so that it
     * can be cut off and the addressed unit's reply behind it still read: exception 5, reads 5 + byte count, single
     * and multiple writes 8 (Application Protocol V1.1b3, §6.1-6.12 and §7); -1 when unknown or not yet known.
     */
    private static int anyReplyLength(int function, byte[] buffer, int length) {
        if ((function & 0x80) != 0) {
            return 5;
        }
        return switch (function) {
            case 0x01, 0x02, 0x03, 0x04 -> length < 3 ? -1 : 5 + (buffer[2] & 0xFF);
            case 0x05, 0x06, 0x0F, 0x10 -> 8;
            default -> -1;
        };
    }

    /** Classifies {@code length} bytes of {@code frame} received in answer to {@code request}. */
    public static ModbusReply decodeResponse(ModbusRequest request, byte[] frame, int length) {
        int unit = request.unit();
        int expected = request.responseLength();
        if (length == 0) {
            return new ModbusReply.Fault(FrameFault.NO_REPLY, "no reply from unit " + unit);
        }
        if (length > MAX_FRAME) {
            return new ModbusReply.Fault(FrameFault.OVERSIZED,
                    "frame of " + length + " bytes is longer than the Modbus limit of " + MAX_FRAME);
        }
        boolean exceptionShape = length >= 2 && (frame[1] & 0xFF) == (request.function().code() | 0x80);
        if (length < 5 || (!exceptionShape && length < expected && !ModbusCrc.isValid(frame, length))) {
            return new ModbusReply.Fault(FrameFault.SHORT_FRAME, "short frame from unit " + unit + ": " + length
                    + " of " + (exceptionShape ? 5 : expected) + " bytes (" + Hex.of(frame, length) + ")");
        }
        if (!ModbusCrc.isValid(frame, length)) {
            int computed = ModbusCrc.compute(frame, 0, length - 2);
            int received = (frame[length - 2] & 0xFF) | (frame[length - 1] & 0xFF) << 8;
            return new ModbusReply.Fault(FrameFault.BAD_CRC, String.format(
                    "bad CRC in reply to %s (frame carries 0x%04X, computed 0x%04X, %d bytes)",
                    request.describe(), received, computed, length));
        }
        int replyUnit = frame[0] & 0xFF;
        if (replyUnit != unit) {
            return new ModbusReply.Fault(FrameFault.WRONG_UNIT,
                    "reply from unit " + replyUnit + " while waiting for unit " + unit);
        }
        int function = frame[1] & 0xFF;
        if (exceptionShape) {
            if (length != 5) {
                return new ModbusReply.Fault(FrameFault.BAD_LENGTH,
                        "exception response of " + length + " bytes from unit " + unit + ", expected 5");
            }
            return new ModbusReply.ExceptionReply(request, frame[2] & 0xFF);
        }
        if (function != request.function().code()) {
            return new ModbusReply.Fault(FrameFault.WRONG_FUNCTION, String.format(
                    "reply with function 0x%02X from unit %d, expected 0x%02X", function, unit,
                    request.function().code()));
        }
        if (request.function().isRead()) {
            int byteCount = frame[2] & 0xFF;
            int expectedCount = expected - 5;
            if (byteCount != expectedCount) {
                return new ModbusReply.Fault(FrameFault.BAD_BYTE_COUNT, "byte count " + byteCount
                        + " in reply from unit " + unit + ", expected " + expectedCount);
            }
            if (length != expected) {
                return new ModbusReply.Fault(FrameFault.BAD_LENGTH,
                        "frame of " + length + " bytes from unit " + unit + ", expected " + expected);
            }
            if (request.function().readsBits()) {
                return new ModbusReply.Values(request, BitPacking.unpack(frame, 3, request.quantity()));
            }
            int[] registers = new int[request.quantity()];
            for (int i = 0; i < registers.length; i++) {
                registers[i] = (frame[3 + 2 * i] & 0xFF) << 8 | (frame[4 + 2 * i] & 0xFF);
            }
            return new ModbusReply.Values(request, registers);
        }
        if (length != expected) {
            return new ModbusReply.Fault(FrameFault.BAD_LENGTH,
                    "frame of " + length + " bytes from unit " + unit + ", expected " + expected);
        }
        byte[] pdu = request.pdu();
        for (int i = 0; i < 5; i++) {
            if (frame[1 + i] != pdu[i]) {
                return new ModbusReply.Fault(FrameFault.ECHO_MISMATCH, "reply to " + request.describe()
                        + " does not echo the request (" + Hex.of(frame, length) + ")");
            }
        }
        return new ModbusReply.WriteConfirmed(request);
    }
}
