package org.cryowarden.rules.engine;

/**
 * Something that expires on the engine's monotonic clock: an on/off-delay, a stale timeout, a shelving or a bypass.
 * Re-scheduling or cancelling bumps the generation, so older queue entries are ignored when they come due.
 */
abstract class Timer {

    int generation;
    boolean queued;

    /** Called by {@link TimerQueue#runDue(long)} when this timer's current entry comes due. */
    abstract void expire();
}
