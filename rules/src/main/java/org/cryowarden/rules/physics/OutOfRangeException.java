package org.cryowarden.rules.physics;

/**
 * A physics function was asked for a value outside the range its published source covers. The message names
 * the value and the valid range; nothing is ever extrapolated. Callers that turn readings into derived values
 * catch it and publish a BAD reading with the message as the reason.
 */
public final class OutOfRangeException extends IllegalArgumentException {

    public OutOfRangeException(String message) {
        super(message);
    }
}
