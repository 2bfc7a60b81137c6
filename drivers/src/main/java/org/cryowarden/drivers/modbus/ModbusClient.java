package org.cryowarden.drivers.modbus;

import java.io.IOException;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.cryowarden.drivers.spi.Transport;

/**
 * A Modbus RTU master over one transport: drains stale input, keeps the silent interval before each request,
 * sends it, frames and classifies the reply, and retries on silence or corruption (never on an exception
 * response, which is a definite answer). One caller thread at a time; the bus poller is that thread.
 */
public final class ModbusClient {

    private final Transport transport;
    private final RtuFrameReader reader;
    private final Duration interFrame;
    private long lastActivityNanos = Long.MIN_VALUE;

    /**
     * @param interFrame the t3.5 silent interval kept before sending (from {@link RtuTiming})
     * @param silence    the silence that ends a received frame (at least {@code interFrame})
     */
    public ModbusClient(Transport transport, Duration interFrame, Duration silence) {
        this.transport = Objects.requireNonNull(transport, "transport");
        this.interFrame = interFrame;
        this.reader = new RtuFrameReader(silence.compareTo(interFrame) < 0 ? interFrame : silence);
    }

    /** A client with timing for the transport: t3.5 of its baud rate, or of 19200 baud for TCP links. */
    public static ModbusClient forTransport(Transport transport, Duration silence) {
        RtuTiming timing = RtuTiming.forBaud(transport.baudRate().orElse(19200));
        return new ModbusClient(transport, timing.interFrame(), silence);
    }

    /** One attempt: the bytes sent, those received, their classification and the round-trip time. */
    public record Attempt(byte[] sent, RtuFrame received, ModbusReply reply, Duration roundTrip, int discardedBefore) {
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
        int discarded = transport.drainInput();
        byte[] sent = request.encode();
        long start = System.nanoTime();
        transport.write(sent);
        if (request.unit() == 0) {
            // Broadcast: slaves do not reply (Modbus over Serial Line V1.02, §2.1).
            lastActivityNanos = System.nanoTime();
            return new Attempt(sent, new RtuFrame(new byte[0], RtuFrame.Ending.NO_REPLY),
                    new ModbusReply.WriteConfirmed(request), Duration.ZERO, discarded);
        }
        RtuFrame frame = reader.read(transport, (buffer, length) -> ModbusMasterCodec.replyLength(request, buffer,
                length), responseTimeout);
        long end = System.nanoTime();
        lastActivityNanos = end;
        ModbusReply reply = classify(request, frame, responseTimeout);
        return new Attempt(sent, frame, reply, Duration.ofNanos(end - start), discarded);
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
        long due = lastActivityNanos + interFrame.toNanos();
        long wait;
        while ((wait = due - System.nanoTime()) > 0) {
            java.util.concurrent.locks.LockSupport.parkNanos(wait);
        }
    }
}
