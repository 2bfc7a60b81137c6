package org.cryowarden.drivers.modbus;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

/**
 * The request/response examples printed in the Modbus Application Protocol Specification V1.1b3, section by
 * section, wrapped in RTU frames for unit 0x11 (the CRC computed by {@link ModbusCrc}, itself checked in
 * {@link ModbusCrcTest}). Each test runs both sides: master encoding and decoding, slave parsing and encoding.
 */
class ModbusSpecificationExamplesTest {

    private static final int UNIT = 0x11;

    @Test
    void readCoilsExampleOfSection61() {
        // V1.1b3 §6.1: request 01 00 13 00 13 (coils 20-38), response 01 03 CD 6B 05.
        ModbusRequest request = ModbusRequest.read(UNIT, FunctionCode.READ_COILS, 0x13, 0x13);
        assertThat(Hex.of(request.pdu())).isEqualTo("01 00 13 00 13");

        ModbusReply reply = decode(request, "01 03 CD 6B 05");

        // CD = 1100 1101: coils 27..20 read 1,1,0,0,1,1,0,1 (LSB is coil 20)
        assertThat(reply).isInstanceOf(ModbusReply.Values.class);
        int[] coils = ((ModbusReply.Values) reply).values();
        assertThat(coils).hasSize(19);
        assertThat(slice(coils, 0, 8)).containsExactly(1, 0, 1, 1, 0, 0, 1, 1);
        assertThat(slice(coils, 8, 8)).containsExactly(1, 1, 0, 1, 0, 1, 1, 0);
        assertThat(slice(coils, 16, 3)).containsExactly(1, 0, 1);
        assertThat(Hex.of(ModbusSlaveCodec.encodeReadResponse(request, coils)))
                .isEqualTo(Hex.of(rtu("01 03 CD 6B 05")));
    }

    @Test
    void readDiscreteInputsExampleOfSection62() {
        // V1.1b3 §6.2: request 02 00 C4 00 16 (inputs 197-218), response 02 03 AC DB 35.
        ModbusRequest request = ModbusRequest.read(UNIT, FunctionCode.READ_DISCRETE_INPUTS, 0xC4, 0x16);
        assertThat(Hex.of(request.pdu())).isEqualTo("02 00 C4 00 16");

        int[] inputs = ((ModbusReply.Values) decode(request, "02 03 AC DB 35")).values();

        assertThat(inputs).hasSize(22);
        assertThat(slice(inputs, 0, 8)).containsExactly(0, 0, 1, 1, 0, 1, 0, 1); // AC
        assertThat(slice(inputs, 16, 6)).containsExactly(1, 0, 1, 0, 1, 1); // 35, two high bits padding
        assertThat(Hex.of(ModbusSlaveCodec.encodeReadResponse(request, inputs))).isEqualTo(Hex.of(rtu("02 03 AC DB 35")));
    }

    @Test
    void readHoldingRegistersExampleOfSection63() {
        // V1.1b3 §6.3: request 03 00 6B 00 03 (registers 108-110), response 03 06 02 2B 00 00 00 64
        // (register 108 = 555, 109 = 0, 110 = 100).
        ModbusRequest request = ModbusRequest.read(UNIT, FunctionCode.READ_HOLDING_REGISTERS, 0x6B, 3);
        assertThat(Hex.of(request.pdu())).isEqualTo("03 00 6B 00 03");

        ModbusReply reply = decode(request, "03 06 02 2B 00 00 00 64");

        assertThat(((ModbusReply.Values) reply).values()).containsExactly(555, 0, 100);
        assertThat(Hex.of(ModbusSlaveCodec.encodeReadResponse(request, new int[] {555, 0, 100})))
                .isEqualTo(Hex.of(rtu("03 06 02 2B 00 00 00 64")));
    }

    @Test
    void readInputRegisterExampleOfSection64() {
        // V1.1b3 §6.4: request 04 00 08 00 01 (register 9), response 04 02 00 0A (value 10).
        ModbusRequest request = ModbusRequest.read(UNIT, FunctionCode.READ_INPUT_REGISTERS, 8, 1);
        assertThat(Hex.of(request.pdu())).isEqualTo("04 00 08 00 01");

        assertThat(((ModbusReply.Values) decode(request, "04 02 00 0A")).values()).containsExactly(10);
    }

    @Test
    void writeSingleCoilExampleOfSection65() {
        // V1.1b3 §6.5: request 05 00 AC FF 00 (coil 173 ON), the response echoes the request.
        ModbusRequest request = ModbusRequest.writeSingleCoil(UNIT, 0xAC, true);
        assertThat(Hex.of(request.pdu())).isEqualTo("05 00 AC FF 00");

        assertThat(decode(request, "05 00 AC FF 00")).isEqualTo(new ModbusReply.WriteConfirmed(request));
        assertThat(ModbusSlaveCodec.parseRequest(request.encode(), 8)).isEqualTo(new SlaveRequest.Accepted(request));
        assertThat(Hex.of(ModbusSlaveCodec.encodeWriteResponse(request))).isEqualTo(Hex.of(rtu("05 00 AC FF 00")));
    }

    @Test
    void writeSingleRegisterExampleOfSection66() {
        // V1.1b3 §6.6: request 06 00 01 00 03 (register 2 = 3), the response echoes the request.
        ModbusRequest request = ModbusRequest.writeSingleRegister(UNIT, 1, 3);
        assertThat(Hex.of(request.pdu())).isEqualTo("06 00 01 00 03");

        assertThat(decode(request, "06 00 01 00 03")).isEqualTo(new ModbusReply.WriteConfirmed(request));
    }

    @Test
    void writeMultipleCoilsExampleOfSection611() {
        // V1.1b3 §6.11: request 0F 00 13 00 0A 02 CD 01 (coils 20-29), response 0F 00 13 00 0A.
        boolean[] states = {true, false, true, true, false, false, true, true, true, false};
        ModbusRequest request = ModbusRequest.writeMultipleCoils(UNIT, 0x13, states);
        assertThat(Hex.of(request.pdu())).isEqualTo("0F 00 13 00 0A 02 CD 01");

        assertThat(decode(request, "0F 00 13 00 0A")).isEqualTo(new ModbusReply.WriteConfirmed(request));
        byte[] frame = request.encode();
        assertThat(ModbusSlaveCodec.requestLength(frame, 7)).isEqualTo(frame.length);
        assertThat(ModbusSlaveCodec.parseRequest(frame, frame.length)).isEqualTo(new SlaveRequest.Accepted(request));
        assertThat(Hex.of(ModbusSlaveCodec.encodeWriteResponse(request))).isEqualTo(Hex.of(rtu("0F 00 13 00 0A")));
    }

    @Test
    void writeMultipleRegistersExampleOfSection612() {
        // V1.1b3 §6.12: request 10 00 01 00 02 04 00 0A 01 02 (registers 2-3 = 000A, 0102), response 10 00 01 00 02.
        ModbusRequest request = ModbusRequest.writeMultipleRegisters(UNIT, 1, new int[] {0x000A, 0x0102});
        assertThat(Hex.of(request.pdu())).isEqualTo("10 00 01 00 02 04 00 0A 01 02");

        assertThat(decode(request, "10 00 01 00 02")).isEqualTo(new ModbusReply.WriteConfirmed(request));
        byte[] frame = request.encode();
        assertThat(ModbusSlaveCodec.parseRequest(frame, frame.length)).isEqualTo(new SlaveRequest.Accepted(request));
    }

    @Test
    void exceptionResponseExampleOfSection7IsDecodedToItsName() {
        // V1.1b3 §7: request 01 04 A1 00 01 (read coil at 04A1) answered by 81 02, ILLEGAL DATA ADDRESS.
        ModbusRequest request = ModbusRequest.read(UNIT, FunctionCode.READ_COILS, 0x04A1, 1);
        assertThat(Hex.of(request.pdu())).isEqualTo("01 04 A1 00 01");

        ModbusReply reply = decode(request, "81 02");

        assertThat(reply).isEqualTo(new ModbusReply.ExceptionReply(request, 2));
        assertThat(reply.reason()).isEqualTo("exception response 0x02 ILLEGAL DATA ADDRESS to read coils 1185 at unit 17");
        assertThat(Hex.of(ModbusSlaveCodec.encodeException(UNIT, 0x01, ExceptionCode.ILLEGAL_DATA_ADDRESS)))
                .isEqualTo(Hex.of(rtu("81 02")));
    }

    @Test
    void everyExceptionCodeOfSection7HasItsSpecificationName() {
        // V1.1b3 §7, table of exception codes.
        assertThat(ExceptionCode.describe(0x01)).isEqualTo("ILLEGAL FUNCTION");
        assertThat(ExceptionCode.describe(0x03)).isEqualTo("ILLEGAL DATA VALUE");
        assertThat(ExceptionCode.describe(0x04)).isEqualTo("SERVER DEVICE FAILURE");
        assertThat(ExceptionCode.describe(0x06)).isEqualTo("SERVER DEVICE BUSY");
        assertThat(ExceptionCode.describe(0x0B)).isEqualTo("GATEWAY TARGET DEVICE FAILED TO RESPOND");
        assertThat(ExceptionCode.describe(0x2A)).isEqualTo("unknown exception code 0x2A");
    }

    @Test
    void silentIntervalIsThreeAndAHalfCharactersUpTo19200BaudAndFixedAbove() {
        // Serial Line V1.02 §2.5.1.1: 11-bit characters; above 19200 baud t3.5 = 1.750 ms and t1.5 = 0.750 ms.
        assertThat(RtuTiming.forBaud(9600).interFrame().toNanos()).isEqualTo(4_010_416L); // 3.5 * 11 / 9600 s = 4.0104 ms
        assertThat(RtuTiming.forBaud(19200).interFrame().toNanos()).isEqualTo(2_005_208L);
        assertThat(RtuTiming.forBaud(38400).interFrame().toNanos()).isEqualTo(1_750_000L);
        assertThat(RtuTiming.forBaud(115200).interCharacter().toNanos()).isEqualTo(750_000L);
    }

    private static ModbusReply decode(ModbusRequest request, String pduHex) {
        byte[] frame = rtu(pduHex);
        assertThat(ModbusMasterCodec.replyLength(request, frame, Math.min(3, frame.length))).isEqualTo(frame.length);
        return ModbusMasterCodec.decodeResponse(request, frame, frame.length);
    }

    private static byte[] rtu(String pduHex) {
        byte[] pdu = Hex.parse(pduHex);
        byte[] body = new byte[pdu.length + 1];
        body[0] = (byte) UNIT;
        System.arraycopy(pdu, 0, body, 1, pdu.length);
        return ModbusCrc.append(body);
    }

    private static int[] slice(int[] values, int from, int count) {
        int[] part = new int[count];
        System.arraycopy(values, from, part, 0, count);
        return part;
    }
}
