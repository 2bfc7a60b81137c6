package org.cryowarden.rules.engine;

/** Why a fill valve closed; the word is what the journal and payloads carry. */
public enum FillStopReason {
    /** The level reached the stop level: the fill is done. */
    STOP_LEVEL("stop-level"),
    /** The level rose less than the minimum within the rise window: supply empty or valve stuck. Locks out. */
    NO_RISE("no-rise"),
    /** The valve was open for the maximum open time. Locks out. */
    MAX_OPEN_TIME("max-open-time"),
    /** A blocking alarm (oxygen, overpressure) became active. */
    BLOCKED("blocked"),
    /** The level reading was not GOOD: the controller cannot see what it fills. */
    LEVEL_UNUSABLE("level-unusable"),
    /** The daemon restarted while the valve was open; it stays closed until the controller decides again. */
    RESTART("restart");

    private final String wire;

    FillStopReason(String wire) {
        this.wire = wire;
    }

    public String wire() {
        return wire;
    }

    /** Whether this reason locks the fill out until an operator resets it. */
    public boolean locksOut() {
        return this == NO_RISE || this == MAX_OPEN_TIME;
    }

    @Override
    public String toString() {
        return wire;
    }
}
