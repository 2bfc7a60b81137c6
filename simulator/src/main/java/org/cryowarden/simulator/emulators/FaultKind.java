package org.cryowarden.simulator.emulators;

import java.util.Locale;
import java.util.Optional;

/** The misbehaviours an emulated instrument can be scripted to show, by the names scenario files use. */
public enum FaultKind {
    /** The value freezes at what it was when the fault began. */
    STUCK(true),
    /** The value wanders off at a steady rate (units per hour). */
    DRIFT(true),
    /** Extra white noise of a stated standard deviation. */
    NOISE(true),
    /** A 4-20 mA loop open: the analog input reads 0 mA (NAMUR NE 43 failure signal). */
    WIRE_BREAK(true),
    /** No reply at all. */
    SILENCE(false),
    /** Random bytes instead of the reply. */
    GARBAGE(false),
    /** A Modbus reply with a corrupted CRC. */
    BAD_CRC(false),
    /** Replies delayed by a stated time (longer than the master's timeout). */
    SLOW(false),
    /** The port drops its connections and refuses new ones until the fault ends (the pty link vanishes). */
    DISCONNECT(false);

    private final boolean valueFault;

    FaultKind(boolean valueFault) {
        this.valueFault = valueFault;
    }

    /** True for faults that change the value read, false for faults of the link. */
    public boolean isValueFault() {
        return valueFault;
    }

    public String configName() {
        return name().toLowerCase(Locale.ROOT).replace('_', '-');
    }

    public static Optional<FaultKind> fromConfig(String text) {
        for (FaultKind kind : values()) {
            if (kind.configName().equals(text)) {
                return Optional.of(kind);
            }
        }
        return Optional.empty();
    }
}
