package org.cryowarden.drivers.modbus;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * A late reply from another unit on a shared line (a slow neighbour answering after the master gave up on it) is
 * not the answer to the current request: the master discards it and keeps waiting for its own reply until its
 * own response timeout, and it drops bytes left waiting before a request. Line: 9600 baud, 11-bit characters,
 * t3.5 = 4.01 ms (Modbus over Serial Line V1.02, §2.5.1.1); the response time-out starts at the end of the
 * request (same, §2.4.1). The time of each arrival is on the line's own clock, so no test waits in real time.
 */
class ModbusClientLateReplyTest {

    private static final Duration TIMEOUT = Duration.ofMillis(300);
    /** Unit 7, function 02, discrete input 0: Application Protocol V1.1b3 §6.2 request layout. */
    private static final ModbusRequest READ_FAN = ModbusRequest.read(7, FunctionCode.READ_DISCRETE_INPUTS, 0, 1);
    /** Unit 7's answer: one byte, input 0 on (§6.2 response layout), CRC appended per Serial Line §6.2.2. */
    private static final byte[] FAN_ON = ModbusCrc.append(Hex.parse("07 02 01 01"));
    /**
     * Unit 3's reply to a read of input register 0 (function 04, 0x4420): the bytes worked out by hand from the
     * Application Protocol §6.4 layout and the Serial Line CRC, as in the emulator's test.
     */
    private static final byte[] LATE_FROM_UNIT_3 = Hex.parse("03 04 02 44 20 F2 28");

    private final SimulatedLine line = new SimulatedLine(9600);
    private final ModbusClient master = new ModbusClient(line, RtuTiming.forBaud(9600).interFrame(),
            Duration.ofMillis(20), line);

    @Test
    void lateReplyFromAnotherUnitIsDiscardedAndTheOwnReplyIsTaken() throws Exception {
        line.answering(request -> List.of(new SimulatedLine.Reply(Duration.ofMillis(50), LATE_FROM_UNIT_3),
                new SimulatedLine.Reply(Duration.ofMillis(120), FAN_ON)));

        ModbusClient.Exchange exchange = master.transact(READ_FAN, TIMEOUT, 0);

        assertThat(exchange.reply()).isInstanceOfSatisfying(ModbusReply.Values.class,
                values -> assertThat(values.values()).containsExactly(1));
        assertThat(exchange.attempts()).hasSize(1);
        assertThat(exchange.last().foreignUnits()).containsExactly(3);
        assertThat(exchange.last().received().bytes()).isEqualTo(FAN_ON);
    }

    @Test
    void ownReplyMustStillStartWithinTheTimeoutCountedFromTheRequestNotFromTheDiscardedFrame() throws Exception {
        line.answering(request -> List.of(new SimulatedLine.Reply(Duration.ofMillis(100), LATE_FROM_UNIT_3),
                new SimulatedLine.Reply(Duration.ofMillis(350), FAN_ON)));

        ModbusClient.Exchange exchange = master.transact(READ_FAN, TIMEOUT, 0);

        assertThat(exchange.reply()).isEqualTo(new ModbusReply.Fault(FrameFault.NO_REPLY, "no reply from unit 7 within "
                + "300 ms to read discrete inputs 0 at unit 7 (discarded meanwhile 1 frame from unit 3)"));
        // The master gave up 300 ms after the last of its 8 request characters, not 300 ms after unit 3's frame.
        assertThat(line.nanos()).isEqualTo(8 * line.nanosPerCharacter() + TIMEOUT.toNanos());
    }

    @Test
    void foreignFrameAndOwnReplyInOneChunkAreCutApartByTheForeignFramesOwnLength() throws Exception {
        byte[] both = new byte[LATE_FROM_UNIT_3.length + FAN_ON.length];
        System.arraycopy(LATE_FROM_UNIT_3, 0, both, 0, LATE_FROM_UNIT_3.length);
        System.arraycopy(FAN_ON, 0, both, LATE_FROM_UNIT_3.length, FAN_ON.length);
        line.answering(request -> List.of(new SimulatedLine.Reply(Duration.ofMillis(30), both)));

        ModbusClient.Exchange exchange = master.transact(READ_FAN, TIMEOUT, 0);

        assertThat(exchange.reply().isOk()).as(exchange.reply().reason()).isTrue();
        assertThat(exchange.last().foreignUnits()).containsExactly(3);
    }

    @Test
    void ownReplyBehindADiscardedFrameIsTakenEvenWhenTheChunkEndsRightAtTheTimeout() throws Exception {
        byte[] both = new byte[LATE_FROM_UNIT_3.length + FAN_ON.length];
        System.arraycopy(LATE_FROM_UNIT_3, 0, both, 0, LATE_FROM_UNIT_3.length);
        System.arraycopy(FAN_ON, 0, both, LATE_FROM_UNIT_3.length, FAN_ON.length);
        // The chunk's last character lands exactly 300 ms after the request: unit 7's reply started in time.
        Duration after = TIMEOUT.minusNanos(both.length * line.nanosPerCharacter());
        line.answering(request -> List.of(new SimulatedLine.Reply(after, both)));

        ModbusClient.Exchange exchange = master.transact(READ_FAN, TIMEOUT, 0);

        assertThat(exchange.reply().isOk()).as(exchange.reply().reason()).isTrue();
        assertThat(exchange.last().foreignUnits()).containsExactly(3);
    }

    @Test
    void repliesFromSeveralOtherUnitsAreAllDiscardedAndNamedWhenTheOwnNeverComes() throws Exception {
        byte[] exceptionFromUnit9 = ModbusSlaveCodec.encodeException(9, 0x03, ExceptionCode.SERVER_DEVICE_BUSY);
        line.answering(request -> List.of(new SimulatedLine.Reply(Duration.ofMillis(40), LATE_FROM_UNIT_3),
                new SimulatedLine.Reply(Duration.ofMillis(90), exceptionFromUnit9),
                new SimulatedLine.Reply(Duration.ofMillis(140), LATE_FROM_UNIT_3)));

        ModbusClient.Exchange exchange = master.transact(READ_FAN, TIMEOUT, 0);

        assertThat(exchange.last().foreignUnits()).containsExactly(3, 9, 3);
        assertThat(exchange.reply().counterKey()).isEqualTo("timeout");
        assertThat(exchange.reply().reason()).endsWith("(discarded meanwhile 3 frames from unit 3, 9)");
    }

    @Test
    void staleBytesWaitingBeforeTheRequestAreDiscardedNotTakenForTheReply() throws Exception {
        // Unit 7's own late answer to an earlier request (input 0 off) came in while the line was idle.
        byte[] staleFanOff = ModbusCrc.append(Hex.parse("07 02 01 00"));
        line.arriving(Duration.ZERO, staleFanOff);
        line.idle(Duration.ofMillis(50));
        line.answering(request -> List.of(new SimulatedLine.Reply(Duration.ofMillis(20), FAN_ON)));

        ModbusClient.Exchange exchange = master.transact(READ_FAN, TIMEOUT, 0);

        assertThat(exchange.last().discardedBefore()).isEqualTo(staleFanOff.length);
        assertThat(((ModbusReply.Values) exchange.reply()).values()).containsExactly(1);
    }

    @Test
    void silentIntervalIsKeptAfterAReplyBeforeTheNextRequest() throws Exception {
        line.answering(request -> List.of(new SimulatedLine.Reply(Duration.ofMillis(10), FAN_ON)));
        master.transact(READ_FAN, TIMEOUT, 0);
        long replyEnd = line.nanos();

        line.answering(request -> List.of());
        master.transact(READ_FAN, Duration.ofMillis(10), 0);

        // The second request's 8 characters start no sooner than t3.5 after the reply's last character.
        long secondRequestEnd = replyEnd + RtuTiming.forBaud(9600).interFrame().toNanos()
                + 8 * line.nanosPerCharacter();
        assertThat(line.nanos()).isEqualTo(secondRequestEnd + Duration.ofMillis(10).toNanos());
    }
}
