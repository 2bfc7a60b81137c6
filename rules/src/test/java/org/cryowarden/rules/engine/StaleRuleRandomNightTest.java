package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.engine.Site.alarm;
import static org.cryowarden.rules.engine.Site.at;

import java.lang.reflect.Field;
import java.time.Duration;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.Random;
import java.util.function.UnaryOperator;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.StaleRule;
import org.cryowarden.rules.model.ValueRange;
import org.junit.jupiter.api.Test;

/**
 * Random nights against the stale rule as it was before its timer was left to the channel's own stale timeout: two
 * engines get the same readings, silences, ticks and restarts, one with the rule as built, the other with the
 * earlier rule swapped in (test code only), and must emit the same fault transitions.
 */
class StaleRuleRandomNightTest {

    private static final long SEED = 20261203L;
    private static final int STEPS = 4000;
    private static final String CHANNEL = "o2_a";
    private static final String FAULT = "o2_a_fault";

    /** (channel stale timeout, rule timeout; empty = the channel's) in seconds: shorter, equal and longer rules. */
    private static final List<Timeouts> PAIRS = List.of(
            new Timeouts(5, Optional.empty()), new Timeouts(5, Optional.of(5)), new Timeouts(3, Optional.of(4)),
            new Timeouts(5, Optional.of(8)), new Timeouts(5, Optional.of(30)), new Timeouts(8, Optional.of(5)));

    /**
     * Raise and clear instants: the part of the fault an operator is paged by. The cause may differ where the rule's
     * timeout and the channel's come due at the same instant: whichever was scheduled first names the fault, the
     * channel's STALE reading or the rule's "no GOOD reading", and the change moved which one that is.
     */
    @Test
    void randomNightRaisesAndClearsTheStaleFaultWhenTheOldRuleDoes() {
        assertThat(PAIRS).allSatisfy(pair -> compareNight(pair, StaleRuleRandomNightTest::withoutCause));
    }

    /**
     * With equal timeouts (the default), BAD readings past the rule timeout, one GOOD and then silence: the fault
     * comes at the same instant as it did, now named by the channel's STALE reading (the old rule's re-armed timer
     * came due first and named the silence itself).
     */
    @Test
    void silenceAfterALongBadRunAndOneGoodReadingIsNamedByTheChannelsStaleReading() {
        Night night = new Night(new Timeouts(5, Optional.empty()));
        night.good();
        for (int second = 1; second <= 6; second++) {
            night.advance(1, true);
            night.bad();
        }
        night.advance(1, true);
        night.good();
        for (int second = 8; second <= 12; second++) {
            night.advance(1, true);
        }

        assertThat(night.current.lines.stream().map(StaleRuleRandomNightTest::withoutCause).toList())
                .containsExactlyElementsOf(night.old.lines.stream().map(StaleRuleRandomNightTest::withoutCause)
                        .toList());
        assertThat(night.old.lines).last().asString().endsWith("no GOOD reading of o2_a for 5s");
        assertThat(night.current.lines).last().asString()
                .endsWith("o2_a STALE (no reading for 5s, polled every 1s)");
    }

    private static void compareNight(Timeouts pair, UnaryOperator<String> view) {
        Random random = new Random(SEED + pair.hashCode());
        Night night = new Night(pair);
        ArrayDeque<String> recent = new ArrayDeque<>();
        for (int step = 0; step < STEPS; step++) {
            String action = night.randomStep(random);
            recent.addLast(step + ": " + action);
            if (recent.size() > 30) {
                recent.removeFirst();
            }
            List<String> current = night.current.lines.stream().map(view).toList();
            List<String> old = night.old.lines.stream().map(view).toList();
            assertThat(current).as("%s, step %d, recent steps:%n%s", pair, step, String.join("\n", recent))
                    .containsExactlyElementsOf(old);
        }
        assertThat(night.old.lines).as("%s: the night must raise the fault often", pair).hasSizeGreaterThan(100);
    }

    private static String withoutCause(String line) {
        int colon = line.indexOf(": ");
        return colon < 0 ? line : line.substring(0, colon);
    }

    record Timeouts(int channelStaleSeconds, Optional<Integer> ruleSeconds) {
    }

    /** The same night on two sites: {@link #current} with the rule as built, {@link #old} with the earlier rule. */
    private static final class Night {

        private final Timeouts pair;
        /** A sick sensor: UNCERTAIN readings a second or two apart, so readings arrive but no GOOD one for a while. */
        private boolean sick;
        Side current;
        Side old;

        Night(Timeouts pair) {
            this.pair = pair;
            this.current = new Side(newSite(new Site()), false);
            this.old = new Side(newSite(new Site()), true);
        }

        private Site newSite(Site site) {
            return site.channel(CHANNEL, Unit.PERCENT_VOLUME, Duration.ofSeconds(1),
                            Duration.ofSeconds(pair.channelStaleSeconds()), Optional.of(new ValueRange(0, 30)))
                    .rule(new StaleRule(FAULT, CHANNEL, pair.ruleSeconds().map(Duration::ofSeconds),
                            alarm(Priority.HIGH, "Oxygen sensor A fault"), at(FAULT)));
        }

        String randomStep(Random random) {
            if (random.nextInt(50) == 0) {
                sick = !sick;
            }
            if (sick) {
                long seconds = random.nextInt(3);
                advance(seconds, true);
                both(side -> side.site.read(CHANNEL, 20.9, Unit.PERCENT_VOLUME, Quality.UNCERTAIN, "drift"));
                return "+" + seconds + "s UNCERTAIN (sick)";
            }
            int roll = random.nextInt(100);
            long seconds = roll < 20 ? 0 : roll < 70 ? 1 : 2 + random.nextInt(pair.channelStaleSeconds() + 3);
            boolean tick = random.nextInt(3) > 0;
            if (seconds > 0) {
                advance(seconds, tick);
            }
            int kind = random.nextInt(100);
            String what;
            if (kind < 40) {
                what = "GOOD";
                good();
            } else if (kind < 55) {
                what = "UNCERTAIN";
                both(side -> side.site.read(CHANNEL, 20.9, Unit.PERCENT_VOLUME, Quality.UNCERTAIN, "drift"));
            } else if (kind < 63) {
                what = "BAD";
                bad();
            } else if (kind < 71) {
                what = "driver STALE";
                both(side -> Site.describe(side.site.engine().onReading(
                        Reading.stale(CHANNEL, Unit.PERCENT_VOLUME, side.site.clock.wallNow(), "missed reply"))));
            } else if (kind < 78) {
                what = "out of range";
                both(side -> side.site.read(CHANNEL, 45, Unit.PERCENT_VOLUME));
            } else if (kind < 79) {
                what = "restart";
                restart();
            } else {
                what = "silence";
                both(side -> side.site.advance(Duration.ZERO));
            }
            return "+" + seconds + "s" + (tick || seconds == 0 ? "" : " (no tick)") + " " + what;
        }

        void advance(long seconds, boolean tick) {
            for (Side side : List.of(current, old)) {
                if (tick) {
                    side.lines.addAll(side.site.tickFor(Duration.ofSeconds(seconds)));
                } else {
                    side.site.clock.advance(Duration.ofSeconds(seconds));
                }
            }
        }

        void good() {
            both(side -> side.site.read(CHANNEL, 20.9, Unit.PERCENT_VOLUME));
        }

        void bad() {
            both(side -> side.site.bad(CHANNEL, Unit.PERCENT_VOLUME, "no reply"));
        }

        /** A restart of the daemon: a fresh engine at the same instant, restored from the last one's snapshot. */
        void restart() {
            current = current.restarted(newSite(new Site(current.site.clock.wallNow())));
            old = old.restarted(newSite(new Site(old.site.clock.wallNow())));
        }

        private void both(java.util.function.Function<Side, List<String>> action) {
            current.lines.addAll(action.apply(current));
            old.lines.addAll(action.apply(old));
        }
    }

    /** One engine of the night and the transition lines it emitted. */
    private static final class Side {

        final Site site;
        final boolean oldRule;
        final List<String> lines;

        Side(Site site, boolean oldRule) {
            this(site, oldRule, new ArrayList<>());
        }

        private Side(Site site, boolean oldRule, List<String> lines) {
            this.site = site;
            this.oldRule = oldRule;
            this.lines = lines;
            if (oldRule) {
                installOldRule(site.engine());
            } else {
                site.engine();
            }
        }

        Side restarted(Site fresh) {
            Side next = new Side(fresh, oldRule, lines);
            assertThat(next.site.engine().restore(site.engine().snapshot()).events()).isEmpty();
            return next;
        }
    }

    /** Swaps the earlier stale rule in for the built one, before the engine's first call, as the wiring started it. */
    private static void installOldRule(Engine engine) {
        try {
            Core core = (Core) field(Engine.class, "core").get(engine);
            AlarmRuntime alarm = core.alarms.get(FAULT);
            StaleEvaluator built = (StaleEvaluator) alarm.evaluator;
            core.timers.cancel((Timer) field(StaleEvaluator.class, "timer").get(built));
            OldStaleEvaluator old = new OldStaleEvaluator(alarm, core, CHANNEL,
                    field(StaleEvaluator.class, "timeoutNanos").getLong(built),
                    field(StaleEvaluator.class, "staleGraceNanos").getLong(built));
            alarm.evaluator = old;
            ChannelNode node = core.channels.get(CHANNEL);
            for (int i = 0; i < node.rules.length; i++) {
                if (node.rules[i] == built) {
                    node.rules[i] = old;
                    old.attached(node, 0, i);
                    // The earlier rule names no quiet band: it sees every reading.
                    node.quiet[2 * i] = Double.NaN;
                    node.quiet[2 * i + 1] = Double.NaN;
                }
            }
            old.start(core.now);
        } catch (ReflectiveOperationException e) {
            throw new AssertionError("cannot swap the earlier stale rule in", e);
        }
    }

    private static Field field(Class<?> type, String name) throws NoSuchFieldException {
        Field field = type.getDeclaredField(name);
        field.setAccessible(true);
        return field;
    }

    /** The stale rule as it was before the change under test: its timer always armed at the last GOOD + timeout. */
    private static final class OldStaleEvaluator extends RuleEvaluator {

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

        OldStaleEvaluator(AlarmRuntime alarm, Core core, String channel, long timeoutNanos, long staleGraceNanos) {
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
}
