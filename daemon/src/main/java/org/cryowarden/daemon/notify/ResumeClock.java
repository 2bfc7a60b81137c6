package org.cryowarden.daemon.notify;

import java.time.Duration;
import java.time.Instant;
import org.cryowarden.rules.TimeSource;

/**
 * The escalation's clock: live time, except while a restart replays the journal's recent events, when it stands
 * at each replayed moment. Replayed moments sit on the live monotonic axis (the journal's wall time of an event,
 * counted back from the live clock's "now"), so the timers the replay leaves behind are due on the live clock
 * without conversion, and the clock does not jump when it goes live.
 */
final class ResumeClock implements TimeSource {

    private final TimeSource live;
    private boolean replaying;
    private Instant anchorWall;
    private long anchorMono;
    private long replayMono;

    ResumeClock(TimeSource live) {
        this.live = live;
    }

    /** Starts a replay anchored at the live clock's present; returns that present. */
    Instant startReplay() {
        anchorWall = live.wallNow();
        anchorMono = live.monotonicNanos();
        replayMono = Long.MIN_VALUE;
        replaying = true;
        return anchorWall;
    }

    /** The monotonic reading that {@code wall} had, counted back from the anchor. */
    long monoAt(Instant wall) {
        return anchorMono - Duration.between(wall, anchorWall).toNanos();
    }

    /** Moves the replay to {@code mono}; never backwards (journal wall times may step back after an NTP jump). */
    void replayTo(long mono) {
        if (replayMono == Long.MIN_VALUE || mono - replayMono > 0) {
            replayMono = mono;
        }
    }

    long replayMono() {
        return replayMono;
    }

    void goLive() {
        replaying = false;
    }

    @Override
    public Instant wallNow() {
        return replaying ? anchorWall.minusNanos(anchorMono - replayMono) : live.wallNow();
    }

    @Override
    public long monotonicNanos() {
        return replaying ? replayMono : live.monotonicNanos();
    }
}
