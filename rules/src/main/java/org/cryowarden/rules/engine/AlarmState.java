package org.cryowarden.rules.engine;

import java.util.Optional;

/**
 * The alarm states of ANSI/ISA-18.2-2016 (IEC 62682), each with the hyphenated word used on the wire (topics,
 * payloads, the journal and the API).
 */
public enum AlarmState {
    /** Condition clear, nothing to acknowledge. */
    NORMAL("normal"),
    /** Condition active, not yet acknowledged; a latching alarm also stays here after its condition clears. */
    UNACKNOWLEDGED("active-unacknowledged"),
    /** Condition active, acknowledged by an operator. */
    ACKNOWLEDGED("active-acknowledged"),
    /** Condition cleared before anybody acknowledged it. */
    RETURNED_UNACKNOWLEDGED("returned-unacknowledged"),
    /** Silenced by an operator for a limited time; returns by itself when the shelving expires. */
    SHELVED("shelved"),
    /** Suppressed by design while another named alarm is active (e.g. downstream alarms of a dewar in maintenance). */
    SUPPRESSED("suppressed-by-design"),
    /** Taken out of service by an operator (maintenance, a removed sensor) until returned to service. */
    OUT_OF_SERVICE("out-of-service");

    private final String wire;

    AlarmState(String wire) {
        this.wire = wire;
    }

    /** The word used in topics, payloads and the journal, e.g. {@code active-unacknowledged}. */
    public String wire() {
        return wire;
    }

    /** The state whose {@link #wire()} word is {@code word}. */
    public static Optional<AlarmState> fromWire(String word) {
        for (AlarmState state : values()) {
            if (state.wire.equals(word)) {
                return Optional.of(state);
            }
        }
        return Optional.empty();
    }

    /** Whether an operator acknowledgement is awaited in this state. */
    public boolean awaitsAcknowledgement() {
        return this == UNACKNOWLEDGED || this == RETURNED_UNACKNOWLEDGED;
    }

    @Override
    public String toString() {
        return wire;
    }
}
