package org.cryowarden.rules.engine;

import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;

/**
 * Fault alarm for a sensor that is not delivering: no GOOD reading within the timeout, or a BAD reading (the
 * device or the range check says the value is unusable). A STALE reading (a missed reply, or the channel's own
 * stale timeout running out) raises it only once the channel's stale timeout since the last GOOD reading has
 * passed, so one lost frame is not a page. Cleared by the next GOOD
 * reading; UNCERTAIN readings neither raise nor clear it.
 */
final class StaleEvaluator extends RuleEvaluator {

    private final Core core;
    private final String channel;
    private final long timeoutNanos;
    private final long staleGraceNanos;
    private long lastGood;
    private final Timer timer = new Timer() {
        @Override
        void expire() {
            timeout();
        }
    };

    /**
     * @param staleGraceNanos how long after the last GOOD reading a STALE reading counts as a dead sensor: the
     *                        shorter of the rule's timeout and the channel's own stale timeout
     */
    StaleEvaluator(AlarmRuntime alarm, Core core, String channel, long timeoutNanos, long staleGraceNanos) {
        super(alarm);
        this.core = core;
        this.channel = channel;
        this.timeoutNanos = timeoutNanos;
        this.staleGraceNanos = staleGraceNanos;
    }

    void start(long now) {
        lastGood = now;
        core.timers.schedule(timer, now + timeoutNanos);
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        saw(node);
        Quality quality = reading.quality();
        if (quality == Quality.GOOD) {
            lastGood = core.now;
            if (!timer.queued) {
                core.timers.schedule(timer, lastGood + timeoutNanos);
            }
            if (raw) {
                change(false, reading, channel + " GOOD again");
            }
        } else if (quality == Quality.BAD && !raw) {
            change(true, reading, Texts.reading(reading));
        } else if (quality == Quality.STALE && !raw && core.now - lastGood >= staleGraceNanos) {
            // A driver reports one missed reply as STALE; that alone is not yet a dead sensor. The fault comes once
            // the channel's stale timeout (or the rule's, if shorter) since the last GOOD reading has run out.
            change(true, reading, Texts.reading(reading));
        }
    }

    private void timeout() {
        long due = lastGood + timeoutNanos;
        if (due - core.now > 0) {
            core.timers.schedule(timer, due);
        } else if (!raw) {
            change(true, null, "no GOOD reading of " + channel + " for " + Texts.nanos(timeoutNanos));
        }
    }
}
