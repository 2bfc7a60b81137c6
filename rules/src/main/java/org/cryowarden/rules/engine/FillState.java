package org.cryowarden.rules.engine;

/** Where a fill controller stands. */
public enum FillState {
    /** Valve closed, watching the level. */
    IDLE("idle"),
    /** Valve open, filling. */
    FILLING("filling"),
    /** Valve closed after a fault (no rise, maximum open time) until an operator resets the fill. */
    LOCKED_OUT("locked-out");

    private final String wire;

    FillState(String wire) {
        this.wire = wire;
    }

    public String wire() {
        return wire;
    }

    @Override
    public String toString() {
        return wire;
    }
}
