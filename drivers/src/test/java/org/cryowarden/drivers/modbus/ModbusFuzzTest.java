package org.cryowarden.drivers.modbus;

import static org.assertj.core.api.Assertions.assertThat;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.time.Duration;
import java.util.ArrayDeque;
import java.util.Arrays;
import java.util.List;
import java.util.OptionalInt;
import org.cryowarden.drivers.spi.Transport;

/**
 * Coverage-guided fuzzing of the Modbus RTU codecs with Jazzer: every byte sequence a device or a master can
 * send must be classified (a reply, a fault with a reason, an ignored or refused request), never thrown, and
 * what is accepted must be exactly what the frame says. Under {@code mvn test} the seeds in
 * {@code ModbusFuzzTestInputs/<method>/} are replayed; with {@code JAZZER_FUZZ=1} one method is fuzzed.
 *
 * <p>Input layout, so that seed files stay readable in a hex dump: the first byte picks the request the master
 * sent (or the length rule), the rest is what came over the line.
 */
class ModbusFuzzTest {

    /** The requests a master may be waiting on; the first input byte picks one. */
    private static final List<ModbusRequest> REQUESTS = List.of(
            ModbusRequest.read(7, FunctionCode.READ_HOLDING_REGISTERS, 100, 2),
            ModbusRequest.read(7, FunctionCode.READ_INPUT_REGISTERS, 0, 125),
            ModbusRequest.read(7, FunctionCode.READ_COILS, 0, 11),
            ModbusRequest.read(1, FunctionCode.READ_DISCRETE_INPUTS, 0, 2000),
            ModbusRequest.writeSingleCoil(7, 3, true),
            ModbusRequest.writeSingleRegister(7, 40, 0xBEEF),
            ModbusRequest.writeMultipleCoils(7, 0, new boolean[] {true, false, true}),
            ModbusRequest.writeMultipleRegisters(7, 10, new int[] {1, 2, 3}));

    @FuzzTest(maxDuration = "10s")
    void masterClassifiesAnyReply(byte[] input) {
        if (input.length == 0) {
            return;
        }
        ModbusRequest request = REQUESTS.get((input[0] & 0xFF) % REQUESTS.size());
        byte[] frame = Arrays.copyOfRange(input, 1, input.length);

        int announced = ModbusMasterCodec.replyLength(request, frame, frame.length);
        ModbusReply reply = ModbusMasterCodec.decodeResponse(request, frame, frame.length);

        assertThat(announced == -1 || announced >= 5 && announced <= 5 + 255)
                .as("announced length %d", announced).isTrue();
        assertThat(reply.counterKey()).isNotEmpty();
        if (reply.isOk()) {
            assertThat(reply.reason()).isEmpty();
            assertThat(frame.length).isEqualTo(request.responseLength());
            assertThat(ModbusCrc.isValid(frame, frame.length)).isTrue();
            assertThat(frame[0] & 0xFF).isEqualTo(request.unit());
        } else {
            assertThat(reply.reason()).isNotBlank();
        }
        if (reply instanceof ModbusReply.Values values) {
            int[] decoded = values.values();
            assertThat(decoded).hasSize(request.quantity());
            int max = request.function().readsBits() ? 1 : 0xFFFF;
            assertThat(Arrays.stream(decoded).allMatch(v -> v >= 0 && v <= max)).isTrue();
        }
        if (reply instanceof ModbusReply.ExceptionReply exception) {
            assertThat(frame.length).isEqualTo(5);
            assertThat(exception.name()).isNotBlank();
        }
    }

    @FuzzTest(maxDuration = "10s")
    void slaveClassifiesAnyRequest(byte[] frame) {
        int announced = ModbusSlaveCodec.requestLength(frame, frame.length);
        SlaveRequest parsed = ModbusSlaveCodec.parseRequest(frame, frame.length);

        assertThat(announced).isBetween(-1, 9 + 255);
        if (parsed instanceof SlaveRequest.Accepted accepted) {
            ModbusRequest request = accepted.request();
            byte[] again = request.encode();
            if (request.function() == FunctionCode.WRITE_MULTIPLE_COILS) {
                // Padding bits after the last coil carry no meaning and are sent as 0.
                assertThat(again).hasSameSizeAs(frame);
                assertThat(ModbusSlaveCodec.parseRequest(again, again.length)).isEqualTo(accepted);
            } else {
                assertThat(again).as("an accepted request re-encodes to the frame it came from").isEqualTo(frame);
            }
            // A slave can always answer what it accepted.
            if (request.function().isRead()) {
                ModbusSlaveCodec.encodeReadResponse(request, new int[request.quantity()]);
            } else {
                ModbusSlaveCodec.encodeWriteResponse(request);
            }
        } else if (parsed instanceof SlaveRequest.Refused refused) {
            assertThat(refused.detail()).isNotBlank();
            byte[] answer = ModbusSlaveCodec.encodeException(refused.unit(), refused.functionCode(),
                    refused.exception());
            assertThat(answer).hasSize(5);
        } else {
            assertThat(((SlaveRequest.Ignored) parsed).detail()).isNotBlank();
        }
    }

    /**
     * The first byte picks the length rule (a master waiting for one of {@link #REQUESTS}, or a slave); then
     * records of one length byte and that many bytes arrive in turn, a length of 0 standing for a silent
     * interval. The reader must cut a frame no longer than 257 bytes, never read past a silence, and the codecs
     * must classify what it cut.
     */
    @FuzzTest(maxDuration = "10s")
    void frameReaderCutsAnyByteStream(byte[] input) throws IOException {
        if (input.length == 0) {
            return;
        }
        int choice = (input[0] & 0xFF) % (REQUESTS.size() + 1);
        boolean slave = choice == REQUESTS.size();
        ModbusRequest request = slave ? null : REQUESTS.get(choice);
        RtuFrameReader.LengthRule rule = slave ? ModbusSlaveCodec::requestLength
                : (buffer, length) -> ModbusMasterCodec.replyLength(request, buffer, length);
        ChunkTransport transport = new ChunkTransport(Arrays.copyOfRange(input, 1, input.length));

        RtuFrame frame = new RtuFrameReader(Duration.ofMillis(2)).read(transport, rule, Duration.ofMillis(50));

        assertThat(frame.length()).isLessThanOrEqualTo(ModbusMasterCodec.MAX_FRAME + 1);
        assertThat(frame.bytes()).isEqualTo(Arrays.copyOf(transport.delivered(), frame.length()));
        switch (frame.ending()) {
            case NO_REPLY -> assertThat(frame.length()).isZero();
            case SILENCE -> assertThat(transport.lastReadWasSilent()).isTrue();
            case OVERSIZED -> assertThat(frame.length()).isGreaterThan(ModbusMasterCodec.MAX_FRAME);
            case COMPLETE -> assertThat(frame.length())
                    .isGreaterThanOrEqualTo(rule.frameLength(frame.bytes(), frame.length()));
        }
        if (slave) {
            assertThat(ModbusSlaveCodec.parseRequest(frame.bytes(), frame.length())).isNotNull();
        } else {
            assertThat(ModbusMasterCodec.decodeResponse(request, frame.bytes(), frame.length()).counterKey())
                    .isNotEmpty();
        }
    }

    /** Delivers length-prefixed chunks; a zero length is a read that times out. Real time never passes. */
    private static final class ChunkTransport implements Transport {
        private final ArrayDeque<byte[]> chunks = new ArrayDeque<>();
        private final java.io.ByteArrayOutputStream delivered = new java.io.ByteArrayOutputStream();
        private byte[] current = new byte[0];
        private int position;
        private boolean lastReadWasSilent;

        ChunkTransport(byte[] records) {
            int i = 0;
            while (i < records.length) {
                int length = records[i++] & 0xFF;
                int end = Math.min(records.length, i + length);
                chunks.add(Arrays.copyOfRange(records, i, end));
                i = end;
            }
        }

        byte[] delivered() {
            return delivered.toByteArray();
        }

        boolean lastReadWasSilent() {
            return lastReadWasSilent;
        }

        @Override
        public int read(byte[] buffer, int offset, int length, Duration timeout) {
            assertThat(length).as("the reader always offers room").isPositive();
            while (position == current.length) {
                if (chunks.isEmpty()) {
                    lastReadWasSilent = true;
                    return 0;
                }
                current = chunks.poll();
                position = 0;
                if (current.length == 0) {
                    lastReadWasSilent = true;
                    return 0;
                }
            }
            int count = Math.min(length, current.length - position);
            System.arraycopy(current, position, buffer, offset, count);
            delivered.write(current, position, count);
            position += count;
            lastReadWasSilent = false;
            return count;
        }

        @Override
        public String describe() {
            return "fuzzed chunks";
        }

        @Override
        public void write(byte[] bytes) {
        }

        @Override
        public int drainInput() {
            return 0;
        }

        @Override
        public boolean isOpen() {
            return true;
        }

        @Override
        public void reopen() {
        }

        @Override
        public OptionalInt baudRate() {
            return OptionalInt.of(19200);
        }

        @Override
        public void close() {
        }
    }
}
