package org.cryowarden.drivers.modbus;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

/** Each way a reply can be wrong maps to its own fault and an exact reason. */
class ModbusReplyFaultsTest {

    // Modbus Application Protocol V1.1b3 §6.3 example, at unit 0x11: read 3 holding registers from 0x6B.
    private final ModbusRequest request = ModbusRequest.read(0x11, FunctionCode.READ_HOLDING_REGISTERS, 0x6B, 3);
    private final byte[] good = ModbusCrc.append(Hex.parse("11 03 06 02 2B 00 00 00 64"));

    @Test
    void noBytesIsNoReply() {
        assertThat(fault(new byte[0])).isEqualTo(new ModbusReply.Fault(FrameFault.NO_REPLY, "no reply from unit 17"));
    }

    @Test
    void truncatedFrameIsShort() {
        byte[] cut = java.util.Arrays.copyOf(good, 6);
        assertThat(fault(cut)).isEqualTo(new ModbusReply.Fault(FrameFault.SHORT_FRAME,
                "short frame from unit 17: 6 of 11 bytes (11 03 06 02 2B 00)"));
    }

    @Test
    void corruptedByteIsBadCrc() {
        byte[] corrupt = good.clone();
        corrupt[4] ^= 0x01;
        ModbusReply reply = fault(corrupt);
        assertThat(reply).isInstanceOf(ModbusReply.Fault.class);
        assertThat(((ModbusReply.Fault) reply).fault()).isEqualTo(FrameFault.BAD_CRC);
        assertThat(reply.reason()).startsWith("bad CRC in reply to read holding registers 107+3 at unit 17 (frame carries 0x");
    }

    @Test
    void replyFromAnotherUnitIsWrongUnit() {
        assertThat(fault(ModbusCrc.append(Hex.parse("12 03 06 02 2B 00 00 00 64")))).isEqualTo(
                new ModbusReply.Fault(FrameFault.WRONG_UNIT, "reply from unit 18 while waiting for unit 17"));
    }

    @Test
    void replyWithAnotherFunctionIsWrongFunction() {
        assertThat(fault(ModbusCrc.append(Hex.parse("11 04 06 02 2B 00 00 00 64")))).isEqualTo(new ModbusReply.Fault(
                FrameFault.WRONG_FUNCTION, "reply with function 0x04 from unit 17, expected 0x03"));
    }

    @Test
    void wrongByteCountIsReported() {
        assertThat(fault(ModbusCrc.append(Hex.parse("11 03 04 02 2B 00 00")))).isEqualTo(new ModbusReply.Fault(
                FrameFault.BAD_BYTE_COUNT, "byte count 4 in reply from unit 17, expected 6"));
    }

    @Test
    void extraBytesInsideAValidFrameAreBadLength() {
        byte[] longer = ModbusCrc.append(Hex.parse("11 03 06 02 2B 00 00 00 64 AA BB"));
        assertThat(fault(longer)).isEqualTo(new ModbusReply.Fault(FrameFault.BAD_LENGTH,
                "frame of 13 bytes from unit 17, expected 11"));
    }

    @Test
    void writeReplyThatDoesNotEchoIsEchoMismatch() {
        ModbusRequest write = ModbusRequest.writeSingleRegister(0x11, 1, 3);
        byte[] echo = ModbusCrc.append(Hex.parse("11 06 00 01 00 04"));
        ModbusReply reply = ModbusMasterCodec.decodeResponse(write, echo, 8);
        assertThat(reply.counterKey()).isEqualTo("echo_mismatch");
        assertThat(reply.reason()).isEqualTo("reply to write register 1 at unit 17 does not echo the request ("
                + Hex.of(echo) + ")");
    }

    @Test
    void oversizedFrameIsRefused() {
        assertThat(fault(new byte[300]).counterKey()).isEqualTo("oversized_frame");
    }

    @Test
    void exceptionWithAnUnknownCodeKeepsTheCode() {
        ModbusReply reply = fault(ModbusCrc.append(Hex.parse("11 83 2A")));
        assertThat(reply.reason()).isEqualTo(
                "exception response 0x2A unknown exception code 0x2A to read holding registers 107+3 at unit 17");
    }

    private ModbusReply fault(byte[] frame) {
        return ModbusMasterCodec.decodeResponse(request, frame, frame.length);
    }
}
