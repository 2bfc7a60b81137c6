package org.cryowarden.drivers.poll;

/**
 * Asked by a bus poller before each transaction: the daemon lets an alarm on its way to the journal and the broker
 * go first, so that on a small server the rest of a bus's round does not take the CPU it needs. A gate holds a
 * poller only briefly and never stops polling: stale detection depends on it.
 */
@FunctionalInterface
public interface TransactionGate {

    /** Never holds. */
    TransactionGate OPEN = () -> { };

    /** Returns when the poller may start its next transaction. */
    void awaitTurn();
}
