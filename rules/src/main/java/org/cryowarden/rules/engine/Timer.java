package org.cryowarden.rules.engine;

/**
 * Something that expires on the engine's monotonic clock: an on/off-delay, a stale timeout, a shelving or a bypass.
 * A timer is in its queue at most once: re-scheduling moves it, cancelling takes it out.
 */
abstract class Timer {

    /** Its number in {@link TimerQueue}, given at its first scheduling; -1 before. */
    int id = -1;
    /** Whether it is queued. */
    boolean queued;

    /** Called by {@link TimerQueue#runDue(long)} when this timer comes due. */
    abstract void expire();
}
