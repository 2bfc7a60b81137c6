package org.cryowarden.rules.engine;

import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;

/**
 * Fault alarm for a sensor that is not delivering: no GOOD reading within the timeout, or a BAD or STALE reading.
 * Cleared by the next GOOD reading; UNCERTAIN readings neither raise nor clear it.
 */
final class StaleEvaluator extends RuleEvaluator {

    private final Core core;
    private final String channel;
    private final long timeoutNanos;
    private long lastGood;
    private final Timer timer = new Timer() {
        @Override
        void expire() {
            timeout();
        }
    };

    StaleEvaluator(AlarmRuntime alarm, Core core, String channel, long timeoutNanos) {
        super(alarm);
        this.core = core;
        this.channel = channel;
        this.timeoutNanos = timeoutNanos;
    }

    void start(long now) {
        lastGood = now;
        core.timers.schedule(timer, now + timeoutNanos);
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        lastNode = node;
        Quality quality = reading.quality();
        if (quality == Quality.GOOD) {
            lastGood = core.now;
            if (!timer.queued) {
                core.timers.schedule(timer, lastGood + timeoutNanos);
            }
            if (raw) {
                change(false, reading, channel + " GOOD again");
            }
        } else if ((quality == Quality.BAD || quality == Quality.STALE) && !raw) {
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
