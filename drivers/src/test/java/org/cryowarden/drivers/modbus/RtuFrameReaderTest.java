package org.cryowarden.drivers.modbus;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Deque;
import java.util.List;
import java.util.OptionalInt;
import org.cryowarden.drivers.spi.Transport;
import org.junit.jupiter.api.Test;

/** Frame boundaries from byte arrivals: complete by length, ended by silence, never started, or runaway. */
class RtuFrameReaderTest {

    private static final Duration SILENCE = Duration.ofMillis(20);
    private static final Duration FIRST_BYTE = Duration.ofMillis(500);
    // Modbus Application Protocol V1.1b3 §6.3 example reply, unit 0x11.
    private final ModbusRequest request = ModbusRequest.read(0x11, FunctionCode.READ_HOLDING_REGISTERS, 0x6B, 3);
    private final byte[] reply = ModbusCrc.append(Hex.parse("11 03 06 02 2B 00 00 00 64"));

    @Test
    void frameArrivingInChunksEndsAsSoonAsItsLengthIsComplete() throws Exception {
        Chunks link = new Chunks(part(0, 2), part(2, 7), part(7, 11), Hex.parse("FF"));

        RtuFrame frame = new RtuFrameReader(SILENCE).read(link, rule(), FIRST_BYTE);

        assertThat(frame.ending()).isEqualTo(RtuFrame.Ending.COMPLETE);
        assertThat(frame.bytes()).isEqualTo(reply);
        assertThat(link.timeouts).containsExactly(FIRST_BYTE, SILENCE, SILENCE);
    }

    @Test
    void silenceAfterSomeBytesEndsAShortFrame() throws Exception {
        RtuFrame frame = new RtuFrameReader(SILENCE).read(new Chunks(part(0, 6)), rule(), FIRST_BYTE);

        assertThat(frame.ending()).isEqualTo(RtuFrame.Ending.SILENCE);
        assertThat(ModbusMasterCodec.decodeResponse(request, frame.bytes(), frame.length()).counterKey())
                .isEqualTo("short_frame");
    }

    @Test
    void nothingWithinTheResponseTimeoutIsNoReply() throws Exception {
        RtuFrame frame = new RtuFrameReader(SILENCE).read(new Chunks(), rule(), FIRST_BYTE);

        assertThat(frame.ending()).isEqualTo(RtuFrame.Ending.NO_REPLY);
        assertThat(frame.length()).isZero();
    }

    @Test
    void bytesThatNeverPauseStopPastTheMaximumFrame() throws Exception {
        byte[][] noise = new byte[40][];
        for (int i = 0; i < noise.length; i++) {
            noise[i] = new byte[10];
            Arrays.fill(noise[i], (byte) 0x55);
        }

        RtuFrame frame = new RtuFrameReader(SILENCE).read(new Chunks(noise), rule(), FIRST_BYTE);

        assertThat(frame.ending()).isEqualTo(RtuFrame.Ending.OVERSIZED);
        assertThat(frame.length()).isEqualTo(257);
    }

    @Test
    void slaveRuleFramesARequestByItsByteCount() throws Exception {
        byte[] request = ModbusRequest.writeMultipleRegisters(3, 1, new int[] {10, 258}).encode();
        Chunks link = new Chunks(Arrays.copyOfRange(request, 0, 5), Arrays.copyOfRange(request, 5, request.length));

        RtuFrame frame = new RtuFrameReader(SILENCE).read(link, ModbusSlaveCodec::requestLength, FIRST_BYTE);

        assertThat(frame.ending()).isEqualTo(RtuFrame.Ending.COMPLETE);
        assertThat(frame.bytes()).isEqualTo(request);
    }

    private RtuFrameReader.LengthRule rule() {
        return (buffer, length) -> ModbusMasterCodec.replyLength(request, buffer, length);
    }

    private byte[] part(int from, int to) {
        return Arrays.copyOfRange(reply, from, to);
    }

    /** Delivers one queued chunk per read; an empty queue stands for silence until the timeout. */
    private static final class Chunks implements Transport {
        final Deque<byte[]> chunks;
        final List<Duration> timeouts = new ArrayList<>();

        Chunks(byte[]... chunks) {
            this.chunks = new ArrayDeque<>(List.of(chunks));
        }

        @Override
        public int read(byte[] buffer, int offset, int length, Duration timeout) {
            timeouts.add(timeout);
            byte[] next = chunks.poll();
            if (next == null) {
                return 0;
            }
            int count = Math.min(length, next.length);
            System.arraycopy(next, 0, buffer, offset, count);
            return count;
        }

        @Override
        public String describe() {
            return "chunks";
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
            return OptionalInt.of(9600);
        }

        @Override
        public void close() {
        }
    }
}
