package org.cryowarden.drivers.modbus;

import java.io.IOException;
import java.time.Duration;
import java.util.Arrays;
import org.cryowarden.drivers.spi.Transport;

/**
 * Cuts one RTU frame out of the byte arrivals on a transport, with our own timing instead of the serial
 * library's (which rounds read timeouts to 100 ms): reception starts with the first byte within the response
 * timeout, and ends when the frame's header says it is complete, at a silent interval, or past 256 bytes (Modbus
 * over Serial Line V1.02, §2.5.1.1). Used by the master for replies and by slaves (the simulator) for requests,
 * each with its own length rule. Real waiting here is only for device bytes.
 */
public final class RtuFrameReader {

    /** Says how long the frame in {@code buffer} is, from its first {@code length} bytes, or -1 when not yet known. */
    @FunctionalInterface
    public interface LengthRule {
        int frameLength(byte[] buffer, int length);
    }

    private final Duration silence;
    /** Bytes received behind the last complete frame: the start of the next one, read before the transport. */
    private byte[] pending = new byte[0];

    /**
     * @param silence the silent interval that ends a frame: at least t3.5 of the line speed; longer for USB
     *                adapters and device servers, which deliver a frame in chunks
     */
    public RtuFrameReader(Duration silence) {
        if (silence.isNegative() || silence.isZero()) {
            throw new IllegalArgumentException("frame silence must be positive, got " + silence);
        }
        this.silence = silence;
    }

    public Duration silence() {
        return silence;
    }

    /**
     * Receives one frame, waiting at most {@code firstByteTimeout} for it to start. Bytes that arrived behind a
     * complete frame (the next frame, when two came in one chunk) are kept for the next call.
     */
    public RtuFrame read(Transport transport, LengthRule rule, Duration firstByteTimeout) throws IOException {
        byte[] buffer = new byte[ModbusMasterCodec.MAX_FRAME + 1];
        int length;
        if (pending.length > 0) {
            // At most 256 bytes: what followed a frame in one buffer of 257.
            length = pending.length;
            System.arraycopy(pending, 0, buffer, 0, length);
            pending = new byte[0];
        } else {
            length = transport.read(buffer, 0, buffer.length, firstByteTimeout);
        }
        if (length == 0) {
            return new RtuFrame(new byte[0], RtuFrame.Ending.NO_REPLY);
        }
        while (true) {
            int expected = rule.frameLength(buffer, length);
            if (expected > 0 && length >= expected) {
                pending = Arrays.copyOfRange(buffer, expected, length);
                return new RtuFrame(Arrays.copyOf(buffer, expected), RtuFrame.Ending.COMPLETE);
            }
            if (length > ModbusMasterCodec.MAX_FRAME) {
                return new RtuFrame(Arrays.copyOf(buffer, length), RtuFrame.Ending.OVERSIZED);
            }
            int more = transport.read(buffer, length, buffer.length - length, silence);
            if (more == 0) {
                return new RtuFrame(Arrays.copyOf(buffer, length), RtuFrame.Ending.SILENCE);
            }
            length += more;
        }
    }

    /** True when bytes from behind the last frame wait to be read as the start of the next. */
    public boolean hasPending() {
        return pending.length > 0;
    }

    /** Drops the bytes kept from behind the last frame (stale input before a new request); returns how many. */
    public int discardPending() {
        int count = pending.length;
        pending = new byte[0];
        return count;
    }
}
