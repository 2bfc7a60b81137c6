package org.cryowarden.drivers.modbus;

import java.util.concurrent.locks.LockSupport;

/**
 * The clock a master measures line timing on (response timeouts, the t3.5 silence before a request): the
 * machine's monotonic clock for a real line, a simulated line's own clock in tests. Line timing is real time
 * even when the rest of the daemon runs on a virtual clock, because the bytes on a wire take real time.
 */
interface LineClock {

    LineClock SYSTEM = new LineClock() {
        @Override
        public long nanos() {
            return System.nanoTime();
        }

        @Override
        public void waitUntil(long due) {
            long wait;
            while ((wait = due - System.nanoTime()) > 0) {
                LockSupport.parkNanos(wait);
            }
        }
    };

    long nanos();

    /** Returns once {@link #nanos()} has reached {@code due}. */
    void waitUntil(long due);
}
