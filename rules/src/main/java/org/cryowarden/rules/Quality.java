package org.cryowarden.rules;

/**
 * How far a reading can be trusted. A reading that is not {@link #GOOD} is never treated as normal by the
 * rules: BAD and STALE inputs raise fault alarms and count as tripped in votes unless a rule says otherwise.
 */
public enum Quality {
    /** The device answered with a plausible value inside its measuring range. */
    GOOD,
    /** A value exists but is doubtful, e.g. a 4-20 mA loop between the measuring range and the failure band. */
    UNCERTAIN,
    /** No usable value: the device reported a failure, the frame was corrupt, or the value is outside the valid range. */
    BAD,
    /** No fresh value arrived within the channel's stale timeout. */
    STALE;

    public boolean isGood() {
        return this == GOOD;
    }
}
