package org.cryowarden.rules;

import java.time.Instant;

/**
 * The one clock of the program. Timers (on-delays, shelving expiry, stale timeouts, escalation) use the
 * monotonic side so that a wall-clock step neither fires nor stalls them; timestamps on readings and events
 * use the wall-clock side, in UTC. Tests, the simulator and {@code demo} inject a {@link VirtualTimeSource}.
 */
public interface TimeSource {

    /** Wall-clock time, UTC. May jump (NTP, an operator setting the clock). */
    Instant wallNow();

    /** Nanoseconds on a clock that never goes backwards and has an arbitrary origin. */
    long monotonicNanos();

    /** The real clocks of this machine. */
    static TimeSource system() {
        return SystemTimeSource.INSTANCE;
    }
}
