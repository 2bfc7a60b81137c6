package org.cryowarden.rules.engine.bench;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.engine.EngineConfig;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DeviationRule;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.RateRule;
import org.cryowarden.rules.model.RuleDef;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.StaleRule;
import org.cryowarden.rules.model.VoteRule;

/**
 * The engine benchmark's load, one source for the {@code bench engine} suite and the JMH benchmark (in this
 * module's tests): 1,000 channels and 5,000 rules (2,000 limits,
 * 1,000 stale, 1,000 rate, 500 2oo3 votes, 500 deviations), each channel read once per simulated second with
 * values that swing across the limits for a few seconds of each 4-minute swing, so alarms really transition.
 */
public final class EngineBenchLoad {

    public static final int CHANNELS = 1_000;
    public static final int VALUES_PER_CHANNEL = 240;
    public static final Instant START = Instant.parse("2025-01-15T18:00:00Z");

    /**
     * One id string per channel for the configuration and the readings alike, as in the daemon, where a driver's
     * readings carry the ids of the configuration the engine was built from.
     */
    private static final String[] IDS = new String[CHANNELS];

    static {
        for (int c = 0; c < CHANNELS; c++) {
            IDS[c] = "ch" + c;
        }
    }

    private EngineBenchLoad() {
    }

    public static EngineConfig config() {
        List<ChannelDef> channels = new ArrayList<>();
        List<RuleDef> rules = new ArrayList<>();
        for (int c = 0; c < CHANNELS; c++) {
            channels.add(new ChannelDef(id(c), Unit.PERCENT, "bench", Duration.ofSeconds(1), Duration.ofSeconds(5),
                    Optional.empty(), SourcePosition.NONE));
            rules.add(new LimitRule(id(c) + "_high", id(c), Direction.HIGH, Quantity.parse("90 %"),
                    Quantity.parse("2 %"), options("high", c), SourcePosition.NONE));
            rules.add(new LimitRule(id(c) + "_low", id(c), Direction.LOW, Quantity.parse("10 %"),
                    Quantity.parse("2 %"), options("low", c), SourcePosition.NONE));
            rules.add(new StaleRule(id(c) + "_stale", id(c), Optional.empty(), options("stale", c),
                    SourcePosition.NONE));
            rules.add(new RateRule(id(c) + "_rate", id(c), Direction.LOW, Quantity.parse("60 %"),
                    Duration.ofMinutes(1), Duration.ofMinutes(1), options("rate", c), SourcePosition.NONE));
            if (c % 2 == 0) {
                rules.add(new VoteRule(id(c) + "_vote", List.of(id(c), id((c + 1) % CHANNELS),
                        id((c + 2) % CHANNELS)), 2, Direction.HIGH, Quantity.parse("85 %"), Quantity.parse("2 %"),
                        true, options("vote", c), SourcePosition.NONE));
            } else {
                rules.add(new DeviationRule(id(c) + "_deviation", List.of(id(c), id((c + 1) % CHANNELS)),
                        Quantity.parse("50 %"), options("deviation", c), SourcePosition.NONE));
            }
        }
        return new EngineConfig(channels, List.of(), List.of(), new RuleSet(rules, List.of()),
                Quantity.STANDARD_ATMOSPHERE_PA);
    }

    /** Every channel 240 times, channel after channel (the clock moves 1 ms per reading as the engine takes it). */
    public static Reading[] readings() {
        Reading[] readings = new Reading[CHANNELS * VALUES_PER_CHANNEL];
        int slot = 0;
        for (int k = 0; k < VALUES_PER_CHANNEL; k++) {
            for (int c = 0; c < CHANNELS; c++) {
                double value = 50 + 42 * Math.sin(2 * Math.PI * k / VALUES_PER_CHANNEL + c * 0.37);
                readings[slot++] = Reading.good(id(c), value, Unit.PERCENT, START);
            }
        }
        return readings;
    }

    /** 5 rules per channel: high and low limit, stale, rate, and a 2oo3 vote or a deviation. */
    public static int ruleCount() {
        return 5 * CHANNELS;
    }

    private static AlarmOptions options(String kind, int channel) {
        return new AlarmOptions(Priority.values()[channel % 4], kind + " " + channel,
                channel % 3 == 0 ? Duration.ofSeconds(2) : Duration.ZERO, Duration.ZERO, channel % 5 == 0, List.of(),
                Optional.empty());
    }

    private static String id(int channel) {
        return IDS[channel];
    }

    /** A virtual clock with no locking, so the figure measures the engine; advanced 1 ms per reading. */
    public static final class Clock implements TimeSource {

        private long nanos;
        private Instant wall = START;
        private long wallSecond;

        public void advanceMillis(long millis) {
            nanos += millis * 1_000_000L;
        }

        @Override
        public Instant wallNow() {
            long second = nanos / 1_000_000_000L;
            if (second != wallSecond) {
                wallSecond = second;
                wall = START.plusSeconds(second);
            }
            return wall;
        }

        @Override
        public long monotonicNanos() {
            return nanos;
        }
    }
}
