package org.cryowarden.drivers.modbus;

import java.io.IOException;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.cryowarden.drivers.spi.Transport;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * A Modbus RTU master over one transport: drains stale input, keeps the silent interval before each request,
 * sends it, frames and classifies the reply, and retries on silence or corruption (never on an exception
 * response, which is a definite answer). One caller thread at a time; the bus poller is that thread.
 *
 * <p>On a multidrop line a slave that answered after the master's response timeout puts its late reply on the
 * line during the next transaction, perhaps one addressed to another unit. A frame with a valid CRC from a unit
 * other than the one addressed is therefore not this transaction's answer and not a fault of the addressed unit:
 * it is discarded (counted in {@link Attempt#foreignUnits()}, logged at debug) and the master keeps waiting for
 * its own reply until its own response timeout, counted from the end of its request. Bytes already waiting before
 * a request are discarded too. Source: Modbus over Serial Line Specification and Implementation Guide V1.02,
 * §2.4.1 (the master's response time-out; a reply is only expected from the addressed slave) and §2.5.1.1 (t3.5).
 */
public final class ModbusClient {

    private static final Logger LOG = LoggerFactory.getLogger(ModbusClient.class);

    private final Transport transport;
    private final RtuFrameReader reader;
    private final Duration interFrame;
    private final LineClock clock;
    private long lastActivityNanos = Long.MIN_VALUE;

    /**
     * @param interFrame the t3.5 silent interval kept before sending (from {@link RtuTiming})
     * @param silence    the silence that ends a received frame (at least {@code interFrame})
     */
    public ModbusClient(Transport transport, Duration interFrame, Duration silence) {
        this(transport, interFrame, silence, LineClock.SYSTEM);
    }

    /**
     * As {@link #ModbusClient(Transport, Duration, Duration)}, with the clock the line's timing is measured on:
     * the machine's monotonic clock for a real line, the test line's own clock for a simulated one.
     */
    ModbusClient(Transport transport, Duration interFrame, Duration silence, LineClock clock) {
        this.transport = Objects.requireNonNull(transport, "transport");
        this.interFrame = interFrame;
        this.reader = new RtuFrameReader(silence.compareTo(interFrame) < 0 ? interFrame : silence);
        this.clock = Objects.requireNonNull(clock, "clock");
    }

    /** A client with timing for the transport: t3.5 of its baud rate, or of 19200 baud for TCP links. */
    public static ModbusClient forTransport(Transport transport, Duration silence) {
        RtuTiming timing = RtuTiming.forBaud(transport.baudRate().orElse(19200));
        return new ModbusClient(transport, timing.interFrame(), silence);
    }

    /**
     * One attempt: the bytes sent, those received, their classification and the round-trip time.
     *
     * @param discardedBefore bytes that were waiting before the request was sent, discarded
     * @param foreignUnits    the unit of each valid frame from another unit discarded while waiting, in order
     */
    public record Attempt(byte[] sent, RtuFrame received, ModbusReply reply, Duration roundTrip, int discardedBefore,
            List<Integer> foreignUnits) {
        public Attempt {
            foreignUnits = List.copyOf(foreignUnits);
        }
    }

    /** All attempts of one transaction; the last one's reply is the outcome. */
    public record Exchange(ModbusRequest request, List<Attempt> attempts) {
        public Exchange {
            attempts = List.copyOf(attempts);
        }

        public ModbusReply reply() {
            return attempts.get(attempts.size() - 1).reply();
        }

        public Attempt last() {
            return attempts.get(attempts.size() - 1);
        }
    }

    /**
     * Runs one transaction with up to {@code retries} repeats after silence or a corrupt reply.
     *
     * @throws IOException only when the transport failed
     */
    public Exchange transact(ModbusRequest request, Duration responseTimeout, int retries) throws IOException {
        List<Attempt> attempts = new ArrayList<>(1 + retries);
        for (int attempt = 0; attempt <= retries; attempt++) {
            Attempt result = once(request, responseTimeout);
            attempts.add(result);
            if (result.reply().isOk() || result.reply() instanceof ModbusReply.ExceptionReply) {
                break;
            }
        }
        return new Exchange(request, attempts);
    }

    private Attempt once(ModbusRequest request, Duration responseTimeout) throws IOException {
        keepSilentInterval();
        int discarded = reader.discardPending() + transport.drainInput();
        if (discarded > 0) {
            LOG.debug("{}: discarded {} stale bytes before {}", transport.describe(), discarded, request.describe());
        }
        byte[] sent = request.encode();
        long start = clock.nanos();
        transport.write(sent);
        if (request.unit() == 0) {
            // Broadcast: slaves do not reply (Modbus over Serial Line V1.02, §2.1).
            lastActivityNanos = clock.nanos();
            return new Attempt(sent, new RtuFrame(new byte[0], RtuFrame.Ending.NO_REPLY),
                    new ModbusReply.WriteConfirmed(request), Duration.ZERO, discarded, List.of());
        }
        long deadline = clock.nanos() + responseTimeout.toNanos();
        List<Integer> foreign = new ArrayList<>();
        while (true) {
            long remaining = deadline - clock.nanos();
            // Bytes that came in behind a discarded frame started before the deadline: they are read regardless.
            RtuFrame frame = remaining > 0 || reader.hasPending() ? reader.read(transport, (buffer, length) ->
                    ModbusMasterCodec.replyLength(request, buffer, length), Duration.ofNanos(Math.max(0, remaining)))
                    : new RtuFrame(new byte[0], RtuFrame.Ending.NO_REPLY);
            long end = clock.nanos();
            lastActivityNanos = end;
            ModbusReply reply = classify(request, frame, responseTimeout);
            if (reply instanceof ModbusReply.Fault fault && fault.fault() == FrameFault.WRONG_UNIT) {
                // A valid frame, not for us: most likely another slave's late reply. Not this unit's fault.
                int unit = frame.bytes()[0] & 0xFF;
                foreign.add(unit);
                LOG.debug("{}: discarded a frame from unit {} while waiting for unit {} ({})", transport.describe(),
                        unit, request.unit(), Hex.of(frame.bytes(), frame.length()));
                continue;
            }
            if (!foreign.isEmpty() && reply instanceof ModbusReply.Fault fault
                    && fault.fault() == FrameFault.NO_REPLY) {
                reply = new ModbusReply.Fault(FrameFault.NO_REPLY, fault.detail() + " (discarded meanwhile "
                        + foreign.size() + (foreign.size() == 1 ? " frame" : " frames") + " from unit "
                        + foreign.stream().distinct().map(String::valueOf).reduce((a, b) -> a + ", " + b).orElse("")
                        + ")");
            }
            return new Attempt(sent, frame, reply, Duration.ofNanos(end - start), discarded, foreign);
        }
    }

    private static ModbusReply classify(ModbusRequest request, RtuFrame frame, Duration responseTimeout) {
        return switch (frame.ending()) {
            case NO_REPLY -> new ModbusReply.Fault(FrameFault.NO_REPLY, "no reply from unit " + request.unit()
                    + " within " + responseTimeout.toMillis() + " ms to " + request.describe());
            case OVERSIZED -> new ModbusReply.Fault(FrameFault.OVERSIZED, "reply to " + request.describe()
                    + " ran past " + ModbusMasterCodec.MAX_FRAME + " bytes without a silent interval");
            case COMPLETE, SILENCE -> ModbusMasterCodec.decodeResponse(request, frame.bytes(), frame.length());
        };
    }

    private void keepSilentInterval() {
        if (lastActivityNanos == Long.MIN_VALUE) {
            return;
        }
        clock.waitUntil(lastActivityNanos + interFrame.toNanos());
    }
}
