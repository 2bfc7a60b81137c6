package org.cryowarden.rules.engine;

import java.time.Duration;
import java.time.Instant;
import java.time.ZoneId;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.FillDef;
import org.cryowarden.rules.model.FloodDef;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.OutputDef;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.RuleDef;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.ValueRange;

/**
 * An invented test site assembled from model records, with a virtual clock and helpers that feed readings and
 * describe events in one line each, so tests read like the night they script.
 */
final class Site {

    static final Instant START = Instant.parse("2025-01-15T18:00:00Z");
    private static final DateTimeFormatter CLOCK = DateTimeFormatter.ofPattern("HH:mm:ss").withZone(ZoneOffset.UTC);

    final VirtualTimeSource clock;
    private final List<ChannelDef> channels = new ArrayList<>();
    private final List<DerivedChannelDef> derived = new ArrayList<>();
    private final List<OutputDef> outputs = new ArrayList<>();
    private final List<RuleDef> rules = new ArrayList<>();
    private final List<InterlockDef> interlocks = new ArrayList<>();
    private final List<FillDef> fills = new ArrayList<>();
    private FloodDef flood = FloodDef.DEFAULT;
    private Optional<ZoneId> timeZone = Optional.empty();
    private double ambientPa = Quantity.STANDARD_ATMOSPHERE_PA;
    private DerivedFunctions functions = DerivedFunctions.builtIn();
    private Engine engine;

    Site() {
        this(START);
    }

    /** A site whose clock starts at {@code start}, e.g. the same lab after a restart. */
    Site(Instant start) {
        this.clock = new VirtualTimeSource(start);
    }

    /** A channel polled every second, stale after 5 s. */
    Site channel(String id, Unit unit) {
        return channel(id, unit, Duration.ofSeconds(1), Duration.ofSeconds(5), Optional.empty());
    }

    Site channel(String id, Unit unit, Duration period, Duration staleAfter, Optional<ValueRange> range) {
        channels.add(new ChannelDef(id, unit, "test channel " + id, period, staleAfter, range, at(id)));
        return this;
    }

    Site derived(String id, String function, Unit unit, String... inputs) {
        derived.add(new DerivedChannelDef(id, function, List.of(inputs), unit, java.util.Map.of(), "derived " + id, at(id)));
        return this;
    }

    Site derived(DerivedChannelDef def) {
        derived.add(def);
        return this;
    }

    Site output(String id, double safeValue) {
        outputs.add(new OutputDef(id, "test output " + id, safeValue, at(id)));
        return this;
    }

    Site rule(RuleDef rule) {
        rules.add(rule);
        return this;
    }

    Site interlock(InterlockDef interlock) {
        interlocks.add(interlock);
        return this;
    }

    Site fill(FillDef fill) {
        fills.add(fill);
        return this;
    }

    Site flood(FloodDef criterion) {
        this.flood = criterion;
        return this;
    }

    Site timeZone(String zone) {
        this.timeZone = Optional.of(ZoneId.of(zone));
        return this;
    }

    Site ambient(double pascal) {
        this.ambientPa = pascal;
        return this;
    }

    Site functions(DerivedFunctions catalogue) {
        this.functions = catalogue;
        return this;
    }

    EngineConfig config() {
        return new EngineConfig(channels, derived, outputs, new RuleSet(rules, interlocks, fills, flood), ambientPa,
                timeZone);
    }

    Engine engine() {
        if (engine == null) {
            engine = new Engine(config(), clock, functions);
        }
        return engine;
    }

    /** Feeds a GOOD reading stamped now and returns the events as lines. */
    List<String> read(String channel, double value, Unit unit) {
        return describe(engine().onReading(Reading.good(channel, value, unit, clock.wallNow())));
    }

    List<String> read(String channel, double value, Unit unit, Quality quality, String reason) {
        return describe(engine().onReading(new Reading(channel, value, unit, clock.wallNow(), quality, reason)));
    }

    List<String> bad(String channel, Unit unit, String reason) {
        return describe(engine().onReading(Reading.bad(channel, unit, clock.wallNow(), reason)));
    }

    /** Lets time pass on both clocks, then ticks. */
    List<String> advance(Duration step) {
        clock.advance(step);
        return describe(engine().tick());
    }

    /** Advances one second at a time, ticking each time, and collects every event. */
    List<String> tickFor(Duration span) {
        List<String> lines = new ArrayList<>();
        for (long s = 0; s < span.toSeconds(); s++) {
            lines.addAll(advance(Duration.ofSeconds(1)));
        }
        return lines;
    }

    AlarmState state(String alarmId) {
        return engine().alarm(alarmId).orElseThrow().state();
    }

    static SourcePosition at(String id) {
        return new SourcePosition("test-rules.yaml", Math.abs(id.hashCode() % 90) + 1, 3);
    }

    static AlarmOptions alarm(Priority priority, String message) {
        return AlarmOptions.simple(priority, message);
    }

    static AlarmOptions alarm(Priority priority, String message, Duration onDelay, Duration offDelay, boolean latching,
            List<String> suppressWhile, Optional<String> trips) {
        return new AlarmOptions(priority, message, onDelay, offDelay, latching, suppressWhile, trips);
    }

    static Quantity q(String text) {
        return Quantity.parse(text);
    }

    static List<String> describe(List<EngineEvent> events) {
        List<String> lines = new ArrayList<>();
        for (EngineEvent event : events) {
            lines.add(describe(event));
        }
        return lines;
    }

    /** One line per event: the wall time, what happened and, for alarm transitions, the cause. */
    static String describe(EngineEvent event) {
        String time = CLOCK.format(event.instant());
        if (event instanceof AlarmTransition) {
            AlarmTransition t = (AlarmTransition) event;
            return time + " " + t.alarmId() + " " + t.from().wire() + " -> " + t.to().wire() + ": " + t.cause();
        }
        if (event instanceof InterlockTripped) {
            InterlockTripped t = (InterlockTripped) event;
            return time + " " + t.interlockId() + " tripped by " + t.causeAlarm();
        }
        if (event instanceof InterlockReset) {
            InterlockReset r = (InterlockReset) event;
            return time + " " + r.interlockId() + " reset by " + r.operator();
        }
        if (event instanceof OutputCommand) {
            OutputCommand c = (OutputCommand) event;
            return time + " " + c.outputId() + " := " + Texts.number(c.value());
        }
        if (event instanceof BypassStarted) {
            BypassStarted b = (BypassStarted) event;
            return time + " " + b.interlockId() + " bypassed by " + b.owner() + " until " + CLOCK.format(b.until());
        }
        if (event instanceof FillStarted f) {
            return time + " " + f.fillId() + " started: " + f.cause();
        }
        if (event instanceof FillStopped f) {
            return time + " " + f.fillId() + " stopped: " + f.cause();
        }
        if (event instanceof FillReset f) {
            return time + " " + f.fillId() + " reset by " + f.operator();
        }
        if (event instanceof FloodStarted f) {
            return time + " flood started: " + f.count() + " alarms, first out " + f.firstOutAlarm() + " at "
                    + CLOCK.format(f.firstOutAt());
        }
        if (event instanceof FloodEnded f) {
            return time + " flood ended: " + f.activations() + " alarms since " + f.firstOutAlarm() + " in "
                    + Texts.duration(f.duration());
        }
        BypassEnded b = (BypassEnded) event;
        return time + " " + b.interlockId() + " bypass ended: " + b.cause();
    }
}
