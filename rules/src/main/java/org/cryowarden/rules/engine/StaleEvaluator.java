package org.cryowarden.rules.engine;

import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;

/**
 * Fault alarm for a sensor that is not delivering: no GOOD reading within the timeout, or a BAD reading (the
 * device or the range check says the value is unusable). A STALE reading (a missed reply, or the channel's own
 * stale timeout running out) raises it only once the channel's stale timeout since the last GOOD reading has
 * passed, so one lost frame is not a page. Cleared by the next GOOD
 * reading; UNCERTAIN readings neither raise nor clear it.
 *
 * <p>When the rule reads a measured channel whose own stale timeout is no longer than the rule's, silence after a
 * GOOD reading is the channel's to notice: its STALE reading raises this fault no later than the rule's own timer
 * would (where both come due at the same instant, either may name the fault). The rule's timer is then only armed
 * while the latest reading is not GOOD, which keeps a thousand healthy channels' timers out of the queue.
 */
final class StaleEvaluator extends RuleEvaluator {

    private final Core core;
    private final String channel;
    private final long timeoutNanos;
    private final long staleGraceNanos;
    /** Whether the channel's own stale timeout notices silence after a GOOD reading before this rule would. */
    private final boolean coveredByChannel;
    private final Timer timer = new Timer() {
        @Override
        void expire() {
            timeout();
        }
    };

    /**
     * @param staleGraceNanos how long after the last GOOD reading a STALE reading counts as a dead sensor: the
     *                        shorter of the rule's timeout and the channel's own stale timeout
     * @param coveredByChannel whether {@code channel} is a measured channel whose stale timeout is no longer than
     *                         {@code timeoutNanos}
     */
    StaleEvaluator(AlarmRuntime alarm, Core core, String channel, long timeoutNanos, long staleGraceNanos,
            boolean coveredByChannel) {
        super(alarm);
        this.core = core;
        this.channel = channel;
        this.timeoutNanos = timeoutNanos;
        this.staleGraceNanos = staleGraceNanos;
        this.coveredByChannel = coveredByChannel;
    }

    void start(long now) {
        input(0).lastGood = now;
        if (!coveredByChannel) {
            core.timers.schedule(timer, now + timeoutNanos);
        }
        settleBand();
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        Quality quality = reading.quality();
        long lastGood = node.lastGood;
        if (quality == Quality.GOOD) {
            if (!coveredByChannel && !timer.queued) {
                core.timers.schedule(timer, lastGood + timeoutNanos);
            }
            if (raw) {
                change(false, reading, channel + " GOOD again");
            }
            settleBand();
            return;
        }
        if (!timer.queued && !raw) {
            // Covered: after a GOOD reading the timer was let go. Had its time already run out, the channel's own
            // stale timeout would have run out first and raised this fault before this reading.
            core.timers.schedule(timer, lastGood + timeoutNanos);
        }
        if (quality == Quality.BAD && !raw) {
            change(true, reading, Texts.reading(reading));
        } else if (quality == Quality.STALE && !raw && core.now - lastGood >= staleGraceNanos) {
            // A driver reports one missed reply as STALE; that alone is not yet a dead sensor. The fault comes once
            // the channel's stale timeout (or the rule's, if shorter) since the last GOOD reading has run out.
            change(true, reading, Texts.reading(reading));
        }
        settleBand();
    }

    /**
     * A GOOD reading changes nothing here (the channel keeps its time) while the fault is clear and either the
     * channel's own timeout covers silence or this rule's timer runs.
     */
    private void settleBand() {
        if (!raw && (coveredByChannel || timer.queued)) {
            quietBetween(0, Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY);
        } else {
            quietBetween(0, Double.NaN, Double.NaN);
        }
    }

    private void timeout() {
        long due = input(0).lastGood + timeoutNanos;
        if (due - core.now > 0) {
            if (!(coveredByChannel && latestGood())) {
                core.timers.schedule(timer, due);
            }
        } else if (!raw) {
            change(true, null, "no GOOD reading of " + channel + " for " + Texts.nanos(timeoutNanos));
        }
        settleBand();
    }

    /** Whether the channel's latest reading, as this rule saw it, is GOOD (false before any reading). */
    private boolean latestGood() {
        ChannelNode node = lastNode();
        return node != null && node.latest != null && node.latest.quality() == Quality.GOOD;
    }
}
