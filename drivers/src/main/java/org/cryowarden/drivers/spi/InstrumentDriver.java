package org.cryowarden.drivers.spi;

import java.io.IOException;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.function.Consumer;
import org.cryowarden.rules.Reading;

/**
 * One instrument on a bus, created by its {@link DriverFactory}. All methods are called by the bus poller's
 * single thread, one transaction at a time, with the bus's open {@link Transport}; a driver needs no locking.
 *
 * <p>Device misbehaviour (silence, garbage, bad checksums, error responses, out-of-range values) becomes readings
 * that are not GOOD, with a reason, and a count in {@link #counters()}. {@link IOException} means the transport
 * failed; the poller then marks the bus's channels and reopens the transport.
 */
public interface InstrumentDriver {

    /** The instrument id from the site file. */
    String instrumentId();

    /**
     * Called after the transport was opened or reopened, before the next poll: a place to ask {@code *IDN?} or
     * set a device mode. Returns the instrument's identity when it has one.
     */
    Optional<String> connect(Transport transport) throws IOException;

    /**
     * Reads the given channels, all of this instrument and due now, and returns exactly one reading per channel,
     * stamped with the context's wall clock.
     */
    List<Reading> poll(List<String> channels, Transport transport) throws IOException;

    /**
     * Like {@link #poll(List, Transport)}, but hands each reading to {@code each} as soon as it is decoded, so a
     * reading that crosses a limit does not wait for the rest of the instrument's round. A driver that reads a
     * request per channel overrides this; by default all are read, then handed over.
     */
    default void poll(List<String> channels, Transport transport, Consumer<Reading> each) throws IOException {
        for (Reading reading : poll(channels, transport)) {
            each.accept(reading);
        }
    }

    /**
     * Drives an output (an interlock action or an operator command) and, where the device allows, reads it back.
     * A device that refuses or does not answer gives a failed {@link WriteResult}, not an exception.
     */
    WriteResult write(String output, double value, Transport transport) throws IOException;

    /** Counts of outcomes since creation, by key ("ok", "timeout", "bad_crc"): a snapshot, safe to keep. */
    Map<String, Long> counters();
}
