package org.cryowarden.daemon.replay;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.daemon.history.BlockEncoder;
import org.cryowarden.daemon.history.BlockReadings;
import org.cryowarden.daemon.history.HistoryBlock;
import org.cryowarden.daemon.history.MergedReadings;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.engine.CommandResult;
import org.cryowarden.rules.engine.Engine;
import org.cryowarden.rules.engine.EngineConfig;
import org.cryowarden.rules.engine.EngineEvent;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.RuleDef;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.StaleRule;

/**
 * An invented six-hour night in cold room 2, run live once: one tick per second, then the readings of o2_a, o2_b and
 * p_bath in that order, then the operator's commands. Every reading goes into hour-long history blocks and every
 * command into the action list, as the daemon would journal them; the engine's events are the recorded ones.
 *
 * <p>The script (seconds from 18:00:00): o2_a dithers between 19.45 and 19.55 %vol every 10 s from 19:00:00 for
 * 3 min; o2_b falls 0.01 %vol per second from 20.90 at 22:00:00 for 300 s, holds at 17.90 and is back at 20.90 at
 * 22:30:00; o2_b is silent from 23:30:00 to 23:32:00 (shelved at 23:31:00 for 20 min); p_bath is at 1350 mbar from 23:00:00 to 23:02:00.
 */
final class RecordedNight {

    static final Instant START = Instant.parse("2025-01-15T18:00:00Z");
    static final int SECONDS = 6 * 3600;
    static final Instant LAST_SECOND = START.plusSeconds(SECONDS - 1);
    static final int DITHER = hms(19, 0, 0);
    static final int FALL = hms(22, 0, 0);
    static final int FALL_END = hms(22, 30, 0);
    static final int SILENT = hms(23, 30, 0);
    static final int SILENT_END = hms(23, 32, 0);
    static final int PEAK = hms(23, 0, 0);
    static final int PEAK_END = hms(23, 2, 0);

    final List<EngineEvent> events = new ArrayList<>();
    final List<OperatorAction> actions = new ArrayList<>();
    final Map<String, List<HistoryBlock>> blocks = new LinkedHashMap<>();
    private final Map<String, BlockEncoder> encoders = new LinkedHashMap<>();

    /** Runs the night against the rules of {@link #config} with the recorded settings. */
    static RecordedNight record() {
        RecordedNight night = new RecordedNight();
        night.run();
        return night;
    }

    private void run() {
        VirtualTimeSource clock = new VirtualTimeSource(START);
        Engine engine = new Engine(config(q("0 %vol"), q("19.5 %vol")), clock);
        for (String channel : List.of("o2_a", "o2_b", "p_bath")) {
            encoders.put(channel, new BlockEncoder(channel, channel.startsWith("o2") ? Unit.PERCENT_VOLUME
                    : Unit.MILLIBAR));
            blocks.put(channel, new ArrayList<>());
        }
        for (int t = 0; t < SECONDS; t++) {
            events.addAll(engine.tick());
            Instant now = clock.wallNow();
            read(engine, Reading.good("o2_a", oxygenA(t), Unit.PERCENT_VOLUME, now));
            if (t < SILENT || t >= SILENT_END) {
                read(engine, Reading.good("o2_b", oxygenB(t), Unit.PERCENT_VOLUME, now));
            }
            read(engine, Reading.good("p_bath", t >= PEAK && t < PEAK_END ? 1350 : 1050, Unit.MILLIBAR, now));
            if (t == hms(19, 10, 0)) {
                act(engine, new OperatorAction.Acknowledge(now, "o2_a_low", "dana", "cell A dithering at 19.5"));
            } else if (t == hms(22, 10, 0)) {
                act(engine, new OperatorAction.Acknowledge(now, "o2_b_low", "dana", "transfer line leak, valve shut"));
            } else if (t == hms(23, 5, 0)) {
                act(engine, new OperatorAction.Acknowledge(now, "p_bath_high", "dana", ""));
            } else if (t == hms(23, 31, 0)) {
                act(engine, new OperatorAction.Shelve(now, "o2_b_fault", "erik", Duration.ofMinutes(20),
                        "cable reseated"));
            }
            clock.advance(Duration.ofSeconds(1));
        }
        encoders.forEach((channel, encoder) -> {
            if (!encoder.isEmpty()) {
                blocks.get(channel).add(encoder.seal());
            }
        });
    }

    /** The stored readings, decoded and merged in channel order, as a replay reads them. */
    Iterator<Reading> storedReadings() {
        List<Iterator<Reading>> streams = new ArrayList<>();
        blocks.values().forEach(list -> streams.add(BlockReadings.of(list)));
        return MergedReadings.of(streams);
    }

    /** Cold room 2 with o2_a_low's deadband and o2_b_low's setpoint as given. */
    static EngineConfig config(Quantity o2aDeadband, Quantity o2bSetpoint) {
        List<ChannelDef> channels = List.of(
                channel("o2_a", Unit.PERCENT_VOLUME), channel("o2_b", Unit.PERCENT_VOLUME),
                channel("p_bath", Unit.MILLIBAR));
        List<RuleDef> rules = List.of(
                new LimitRule("o2_a_low", "o2_a", Direction.LOW, q("19.5 %vol"), o2aDeadband,
                        options(Priority.HIGH, "Oxygen low at cell A", Duration.ZERO, Duration.ZERO), at(3)),
                new LimitRule("o2_b_low", "o2_b", Direction.LOW, o2bSetpoint, q("0.2 %vol"),
                        options(Priority.HIGH, "Oxygen low at cell B", Duration.ofSeconds(10), Duration.ZERO), at(9)),
                new StaleRule("o2_b_fault", "o2_b", Optional.empty(),
                        options(Priority.MEDIUM, "Oxygen cell B silent", Duration.ZERO, Duration.ZERO), at(15)),
                new LimitRule("p_bath_high", "p_bath", Direction.HIGH, q("1300 mbar"), q("20 mbar"),
                        options(Priority.HIGH, "Bath pressure high", Duration.ZERO, Duration.ofSeconds(60)), at(20)));
        return new EngineConfig(channels, List.of(), List.of(), new RuleSet(rules, List.of()),
                Quantity.STANDARD_ATMOSPHERE_PA);
    }

    static Quantity q(String text) {
        return Quantity.parse(text);
    }

    static Instant time(int hour, int minute, int second) {
        return START.plusSeconds(hms(hour, minute, second));
    }

    private void read(Engine engine, Reading reading) {
        events.addAll(engine.onReading(reading));
        BlockEncoder encoder = encoders.get(reading.channel());
        encoder.append(reading);
        if (encoder.count() == 3600) {
            blocks.get(reading.channel()).add(encoder.seal());
        }
    }

    private void act(Engine engine, OperatorAction action) {
        actions.add(action);
        CommandResult result = action.applyTo(engine);
        events.addAll(result.events());
        if (!result.isOk()) {
            throw new AssertionError("the scripted operator was refused: " + result.refusal().orElseThrow());
        }
    }

    private static double oxygenA(int t) {
        if (t >= DITHER && t < DITHER + 180) {
            return ((t - DITHER) / 10) % 2 == 0 ? 19.45 : 19.55;
        }
        return 20.9;
    }

    private static double oxygenB(int t) {
        if (t >= FALL && t < FALL_END) {
            return Math.max(1790, 2090 - (t - FALL)) / 100.0;
        }
        return 20.9;
    }

    private static ChannelDef channel(String id, Unit unit) {
        return new ChannelDef(id, unit, "cold room 2 " + id, Duration.ofSeconds(1), Duration.ofSeconds(5),
                Optional.empty(), new SourcePosition("cold-room-2-site.yaml", 1, 1));
    }

    private static AlarmOptions options(Priority priority, String message, Duration onDelay, Duration offDelay) {
        return new AlarmOptions(priority, message, onDelay, offDelay, false, List.of(), Optional.empty());
    }

    private static SourcePosition at(int line) {
        return new SourcePosition("cold-room-2-rules.yaml", line, 3);
    }

    /** Seconds from 18:00:00 to the given clock time of the night (hours before 18 are after midnight). */
    private static int hms(int hour, int minute, int second) {
        int fromSix = ((hour - 18 + 24) % 24) * 3600;
        return fromSix + minute * 60 + second;
    }
}
