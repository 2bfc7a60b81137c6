package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.Test;

class TimerQueueTest {

    /** A timer that records its expiry and, like a stale timeout, may re-arm itself. */
    private static final class Recording extends Timer {
        final int name;
        final List<Integer> log;
        long rearmAt = Long.MIN_VALUE;
        TimerQueue queue;

        Recording(int name, List<Integer> log) {
            this.name = name;
            this.log = log;
        }

        @Override
        void expire() {
            log.add(name);
            if (rearmAt != Long.MIN_VALUE) {
                long at = rearmAt;
                rearmAt = Long.MIN_VALUE;
                queue.schedule(this, at);
            }
        }
    }

    private record Entry(long due, long sequence) {
    }

    @Test
    void timersExpireByDueTimeAndEqualDueTimesInSchedulingOrder() {
        List<Integer> log = new ArrayList<>();
        TimerQueue queue = new TimerQueue();
        Recording[] timers = new Recording[5];
        for (int i = 0; i < timers.length; i++) {
            timers[i] = new Recording(i, log);
        }
        queue.schedule(timers[3], 20);
        queue.schedule(timers[0], 10);
        queue.schedule(timers[4], 10);
        queue.schedule(timers[1], 30);
        queue.schedule(timers[2], 10);
        queue.schedule(timers[1], 5);
        queue.cancel(timers[4]);

        queue.runDue(20);

        assertThat(log).containsExactly(1, 0, 2, 3);
        assertThat(timers[4].queued).isFalse();
        assertThat(queue.anyDue(Long.MAX_VALUE)).isFalse();
    }

    /**
     * Many timers scheduled, moved, cancelled and re-armed while expiring, against a plain model of the contract
     * (earliest due time first, equal due times in the order of their latest scheduling; common practice for a
     * deterministic timer queue): every expiry comes in the model's order.
     */
    @Test
    void randomSchedulingExpiresInTheSameOrderAsThePlainModel() {
        Random random = new Random(20_250_115L);
        List<Integer> log = new ArrayList<>();
        TimerQueue queue = new TimerQueue();
        Recording[] timers = new Recording[300];
        for (int i = 0; i < timers.length; i++) {
            timers[i] = new Recording(i, log);
            timers[i].queue = queue;
        }
        Map<Integer, Entry> model = new HashMap<>();
        long[] sequence = {0};
        long now = 0;
        for (int step = 0; step < 20_000; step++) {
            Recording timer = timers[random.nextInt(timers.length)];
            int action = random.nextInt(10);
            if (action < 6) {
                // Few distinct due times, so ties are common.
                long at = now + random.nextInt(50);
                queue.schedule(timer, at);
                model.put(timer.name, new Entry(at, sequence[0]++));
            } else if (action < 7) {
                queue.cancel(timer);
                model.remove(timer.name);
            } else if (action < 8 && model.containsKey(timer.name)) {
                timer.rearmAt = model.get(timer.name).due() + 1 + random.nextInt(40);
            } else {
                now += random.nextInt(8);
                List<Integer> expected = new ArrayList<>();
                Map<Integer, Long> rearms = new HashMap<>();
                for (Recording each : timers) {
                    if (each.rearmAt != Long.MIN_VALUE) {
                        rearms.put(each.name, each.rearmAt);
                    }
                }
                while (true) {
                    Map.Entry<Integer, Entry> first = model.entrySet().stream()
                            .min(Comparator.comparingLong((Map.Entry<Integer, Entry> e) -> e.getValue().due())
                                    .thenComparingLong(e -> e.getValue().sequence()))
                            .orElse(null);
                    if (first == null || first.getValue().due() > now) {
                        break;
                    }
                    int name = first.getKey();
                    model.remove(name);
                    expected.add(name);
                    Long rearm = rearms.remove(name);
                    if (rearm != null) {
                        model.put(name, new Entry(rearm, sequence[0]++));
                    }
                }
                log.clear();
                queue.runDue(now);
                assertThat(log).as("expiries at %d", now).isEqualTo(expected);
                for (Recording each : timers) {
                    assertThat(each.queued).as("timer %d queued", each.name).isEqualTo(model.containsKey(each.name));
                }
            }
        }
    }
}
