package org.cryowarden.daemon.mqtt;

import java.time.Duration;

/**
 * Delay before the next connect attempt: doubles from {@code min} after each failure, capped at {@code max}.
 * Used for the first connect and every reconnect alike (Paho's own automatic reconnect is not used: it does not
 * retry a failed first connect, paho.mqtt.java #9, and its timer thread outlives close, #654).
 */
record Backoff(Duration min, Duration max) {

    Backoff {
        if (min.isNegative() || min.isZero()) {
            throw new IllegalArgumentException("minimum retry delay must be positive, got " + min);
        }
        if (max.compareTo(min) < 0) {
            throw new IllegalArgumentException("maximum retry delay " + max + " is shorter than the minimum " + min);
        }
    }

    /** The delay after {@code failures} consecutive failed attempts (0 = the first retry). */
    Duration delayAfter(int failures) {
        Duration delay = min;
        for (int i = 0; i < failures && delay.compareTo(max) < 0; i++) {
            delay = delay.multipliedBy(2);
        }
        return delay.compareTo(max) > 0 ? max : delay;
    }
}
