package org.cryowarden.drivers.text;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

/**
 * Cuts a byte stream into lines at LF (dropping a CR before it), with a bound on the length of a line so that a
 * device that never sends a terminator cannot grow memory. Bytes are decoded as ISO-8859-1, so every byte maps to
 * exactly one character and garbage stays visible in reasons. Not thread-safe: one poller thread owns it.
 */
public final class LineAssembler {

    private final int maxLineBytes;
    private final byte[] partial;
    private int length;
    private int dropping;

    /** @param maxLineBytes the longest accepted line, terminator excluded */
    public LineAssembler(int maxLineBytes) {
        if (maxLineBytes < 1) {
            throw new IllegalArgumentException("line limit must be at least 1 byte, got " + maxLineBytes);
        }
        this.maxLineBytes = maxLineBytes;
        this.partial = new byte[maxLineBytes + 1];
    }

    /** Feeds received bytes; returns the complete lines and oversize events they finished, in order. */
    public List<LineEvent> feed(byte[] bytes, int offset, int count) {
        List<LineEvent> events = new ArrayList<>(2);
        for (int i = offset; i < offset + count; i++) {
            byte b = bytes[i];
            if (b == '\n') {
                if (dropping > 0) {
                    events.add(new LineEvent.Oversized(dropping, maxLineBytes));
                    dropping = 0;
                } else {
                    int end = length > 0 && partial[length - 1] == '\r' ? length - 1 : length;
                    events.add(new LineEvent.Line(new String(partial, 0, end, StandardCharsets.ISO_8859_1)));
                }
                length = 0;
            } else if (dropping > 0) {
                dropping++;
            } else if (length == maxLineBytes && b != '\r' || length > maxLineBytes) {
                dropping = length + 1;
                length = 0;
            } else {
                partial[length++] = b;
            }
        }
        return events;
    }

    /** The text received after the last terminator, if any (for "partial line" reasons). */
    public Optional<String> partial() {
        if (dropping > 0) {
            return Optional.of("(" + dropping + " bytes of an oversized line)");
        }
        return length == 0 ? Optional.empty() : Optional.of(new String(partial, 0, length, StandardCharsets.ISO_8859_1));
    }

    /** Forgets any partial line, e.g. before a new query. */
    public void reset() {
        length = 0;
        dropping = 0;
    }
}
