package org.cryowarden.rules.engine;

import java.time.Duration;
import java.time.ZoneId;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.DeviationRule;
import org.cryowarden.rules.model.FillDef;
import org.cryowarden.rules.model.ForecastRule;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.OutputAction;
import org.cryowarden.rules.model.OutputDef;
import org.cryowarden.rules.model.RateRule;
import org.cryowarden.rules.model.RuleDef;
import org.cryowarden.rules.model.StaleRule;
import org.cryowarden.rules.model.VoteRule;

/**
 * Builds the engine's runtime graph from a configuration: converts every setpoint, deadband, tolerance and rate into
 * its channel's unit, indexes rules by channel, and refuses anything inconsistent with an
 * {@link IllegalArgumentException} that names the item and where it was written. The loader validates first and
 * reports nicer errors; this is the last line, so the engine never runs on garbage.
 */
final class Wiring {

    private final EngineConfig config;
    private final DerivedFunctions functions;
    private final Core core;
    private final double ambientPa;
    private final Map<String, SourcePosition> defined = new HashMap<>();
    /** Stale timeout of each channel, derived channels inheriting the longest of their inputs. */
    private final Map<String, Long> staleAfter = new HashMap<>();
    /** Polling period of each measured channel: how many points a rate rule's window will hold. */
    private final Map<String, Long> periods = new HashMap<>();
    private final List<StaleEvaluator> staleRules = new ArrayList<>();

    private Wiring(EngineConfig config, TimeSource time, DerivedFunctions functions) {
        this.config = config;
        this.functions = functions;
        this.ambientPa = config.ambientPressurePa();
        if (!(Double.isFinite(ambientPa) && ambientPa > 0)) {
            throw new IllegalArgumentException("the ambient pressure must be a positive number of Pa, got " + ambientPa);
        }
        this.core = new Core(time, ambientPa);
    }

    static Core build(EngineConfig config, TimeSource time, DerivedFunctions functions) {
        Wiring wiring = new Wiring(config, time, functions);
        wiring.channels();
        wiring.core.measuredIndex = new MeasuredIndex(wiring.core.measured);
        wiring.derived();
        wiring.outputs();
        wiring.interlocks();
        wiring.core.flood = new FloodDetector(wiring.core, config.ruleSet().flood());
        wiring.forecastChannels();
        wiring.rules();
        wiring.fills();
        wiring.start();
        return wiring.core;
    }

    private void channels() {
        for (ChannelDef def : config.channels()) {
            unique("channel", def.id(), def.position());
            MeasuredChannel channel = new MeasuredChannel(core, def);
            core.measured.put(def.id(), channel);
            core.channels.put(def.id(), channel);
            staleAfter.put(def.id(), def.staleAfter().toNanos());
            periods.put(def.id(), def.period().toNanos());
        }
    }

    private void derived() {
        Map<String, DerivedChannelDef> pending = new LinkedHashMap<>();
        for (DerivedChannelDef def : config.derived()) {
            unique("channel", def.id(), def.position());
            pending.put(def.id(), def);
        }
        for (DerivedChannelDef def : pending.values()) {
            for (String input : def.inputs()) {
                if (!core.channels.containsKey(input) && !pending.containsKey(input)) {
                    throw refuse(def.position(), "derived channel " + def.id(), "unknown input channel '" + input + "'"
                            + suggest(input, allChannelIds()));
                }
                if (input.equals(def.id())) {
                    throw refuse(def.position(), "derived channel " + def.id(), "cannot be an input of itself");
                }
            }
        }
        // Kahn's order: a derived channel is wired once all its inputs are; what is left at the end is a cycle.
        boolean progress = true;
        while (!pending.isEmpty() && progress) {
            progress = false;
            for (var iterator = pending.values().iterator(); iterator.hasNext(); ) {
                DerivedChannelDef def = iterator.next();
                if (def.inputs().stream().allMatch(core.channels::containsKey)) {
                    wireDerived(def);
                    iterator.remove();
                    progress = true;
                }
            }
        }
        if (!pending.isEmpty()) {
            DerivedChannelDef first = pending.values().iterator().next();
            throw refuse(first.position(), "derived channel " + first.id(), "its inputs form a cycle through "
                    + String.join(", ", pending.keySet()));
        }
    }

    private void wireDerived(DerivedChannelDef def) {
        List<Unit> inputUnits = new ArrayList<>();
        ChannelNode[] inputs = new ChannelNode[def.inputs().size()];
        long longestStale = 0;
        for (int i = 0; i < inputs.length; i++) {
            inputs[i] = core.channels.get(def.inputs().get(i));
            inputUnits.add(inputs[i].unit);
            longestStale = Math.max(longestStale, staleAfter.get(inputs[i].id));
        }
        BoundFunction bound;
        try {
            bound = functions.bind(def, inputUnits, ambientPa);
        } catch (IllegalArgumentException e) {
            throw refuse(def.position(), "derived channel " + def.id(), e.getMessage());
        }
        DerivedChannel channel = new DerivedChannel(def, inputs, bound);
        Set<ChannelNode> seen = new HashSet<>();
        for (ChannelNode input : inputs) {
            if (seen.add(input)) {
                input.addDependent(channel);
            }
        }
        core.channels.put(def.id(), channel);
        staleAfter.put(def.id(), longestStale);
    }

    private void outputs() {
        for (OutputDef def : config.outputs()) {
            unique("output", def.id(), def.position());
            core.outputs.put(def.id(), def);
        }
    }

    private void interlocks() {
        for (InterlockDef def : config.ruleSet().interlocks()) {
            unique("interlock", def.id(), def.position());
            for (OutputAction action : def.actions()) {
                if (!core.outputs.containsKey(action.output())) {
                    throw refuse(def.position(), "interlock " + def.id(), "unknown output '" + action.output() + "'"
                            + suggest(action.output(), core.outputs.keySet()));
                }
            }
            core.interlocks.put(def.id(), new InterlockRuntime(core, def));
        }
    }

    /** The channels forecast rules publish, created first so that any rule may read them. */
    private void forecastChannels() {
        for (RuleDef rule : config.ruleSet().rules()) {
            if (rule instanceof ForecastRule forecast && forecast.publish().isPresent()) {
                String id = forecast.publish().get();
                unique("channel", id, rule.position());
                if (!core.channels.containsKey(forecast.channel())) {
                    continue; // reported as an unknown channel when the rule is wired
                }
                ForecastChannel channel = new ForecastChannel(id);
                core.forecasts.put(id, channel);
                core.channels.put(id, channel);
                staleAfter.put(id, staleAfter.get(forecast.channel()));
            }
        }
    }

    private void fills() {
        Map<String, String> valves = new HashMap<>();
        for (FillDef def : config.ruleSet().fills()) {
            String what = "fill " + def.id();
            if (core.alarms.containsKey(def.id()) || core.interlocks.containsKey(def.id())) {
                throw refuse(def.position(), what, "its id is already the id of a rule or interlock; a fill's id is "
                        + "also its fault alarm's id");
            }
            unique("fill", def.id(), def.position());
            ChannelNode level = core.channels.get(def.channel());
            if (level == null) {
                throw refuse(def.position(), what, "unknown channel '" + def.channel() + "'"
                        + suggest(def.channel(), allChannelIds()));
            }
            OutputDef valve = core.outputs.get(def.valve());
            if (valve == null) {
                throw refuse(def.position(), what, "unknown output '" + def.valve() + "'"
                        + suggest(def.valve(), core.outputs.keySet()));
            }
            String other = valves.putIfAbsent(def.valve(), def.id());
            if (other != null) {
                throw refuse(def.position(), what, "output " + def.valve() + " is already the valve of fill " + other);
            }
            for (InterlockRuntime interlock : core.interlocks.values()) {
                if (interlock.acts(def.valve())) {
                    throw refuse(def.position(), what, "output " + def.valve() + " is also driven by interlock "
                            + interlock.id + ": a fill valve has one owner; list that interlock's alarms in "
                            + "blocked_by instead");
                }
            }
            Unit unit = level.unit;
            double start = level(def.position(), what, "start level", def.startBelow(), unit);
            double stop = level(def.position(), what, "stop level", def.stopAbove(), unit);
            if (!(stop > start)) {
                throw refuse(def.position(), what, "the stop level " + def.stopAbove() + " must be above the start "
                        + "level " + def.startBelow());
            }
            double rise = difference(def.position(), what, "minimum rise", def.minRise(), unit);
            AlarmRuntime alarm = new AlarmRuntime(core, def.id(), def.alarm());
            FillController controller = new FillController(alarm, core, def, unit, start, stop, rise,
                    valve.safeValue());
            alarm.evaluator = controller;
            core.alarms.put(def.id(), alarm);
            core.fills.put(def.id(), controller);
            level.addRule(controller, 0);
        }
        // Blockers after every fill alarm exists: a fill may be blocked by another fill's fault alarm.
        for (FillController controller : core.fills.values()) {
            FillDef def = controller.def;
            String what = "fill " + def.id();
            AlarmRuntime alarm = controller.alarm;
            List<AlarmRuntime> blockers = new ArrayList<>();
            for (String blocker : def.blockedBy()) {
                AlarmRuntime runtime = core.alarms.get(blocker);
                if (runtime == null || runtime == alarm) {
                    throw refuse(def.position(), what, runtime == null ? "is blocked by unknown alarm '" + blocker
                            + "'" + suggest(blocker, core.alarms.keySet()) : "cannot be blocked by its own alarm");
                }
                blockers.add(runtime);
                runtime.blocksFills.add(controller);
            }
            controller.blockers = blockers.toArray(new AlarmRuntime[0]);
        }
    }

    private void rules() {
        for (RuleDef rule : config.ruleSet().rules()) {
            unique("rule", rule.id(), rule.position());
            AlarmRuntime alarm = new AlarmRuntime(core, rule.id(), rule.alarm());
            core.alarms.put(rule.id(), alarm);
            RuleEvaluator evaluator = evaluator(rule, alarm);
            alarm.evaluator = evaluator;
            Set<String> seen = new HashSet<>();
            List<String> inputs = rule.inputs();
            for (int i = 0; i < inputs.size(); i++) {
                String input = inputs.get(i);
                if (!seen.add(input)) {
                    throw refuse(rule, "channel '" + input + "' is listed twice");
                }
                core.channels.get(input).addRule(evaluator, i);
            }
        }
        for (RuleDef rule : config.ruleSet().rules()) {
            AlarmRuntime alarm = core.alarms.get(rule.id());
            AlarmOptions options = rule.alarm();
            if (options.trips().isPresent()) {
                InterlockRuntime interlock = core.interlocks.get(options.trips().get());
                if (interlock == null) {
                    throw refuse(rule, "trips unknown interlock '" + options.trips().get() + "'"
                            + suggest(options.trips().get(), core.interlocks.keySet()));
                }
                alarm.trips = interlock;
                interlock.causes.add(alarm);
            }
            List<AlarmRuntime> suppressors = new ArrayList<>();
            for (String other : options.suppressWhile()) {
                AlarmRuntime suppressor = core.alarms.get(other);
                if (suppressor == null) {
                    throw refuse(rule, "is suppressed while unknown alarm '" + other + "' is active"
                            + suggest(other, core.alarms.keySet()));
                }
                if (suppressor == alarm) {
                    throw refuse(rule, "cannot be suppressed by itself");
                }
                suppressors.add(suppressor);
                suppressor.suppresses.add(alarm);
            }
            alarm.suppressors = suppressors.toArray(new AlarmRuntime[0]);
        }
    }

    private RuleEvaluator evaluator(RuleDef rule, AlarmRuntime alarm) {
        for (String input : rule.inputs()) {
            if (!core.channels.containsKey(input)) {
                throw refuse(rule, "unknown channel '" + input + "'" + suggest(input, allChannelIds()));
            }
        }
        if (rule instanceof LimitRule) {
            LimitRule limit = (LimitRule) rule;
            Unit unit = core.channels.get(limit.channel()).unit;
            return new LimitEvaluator(alarm, limit.direction(), level(rule, "setpoint", limit.setpoint(), unit),
                    difference(rule, "deadband", limit.deadband(), unit), unit);
        }
        if (rule instanceof RateRule) {
            RateRule rate = (RateRule) rule;
            Unit unit = core.channels.get(rate.channel()).unit;
            double change = difference(rule, "rate", rate.change(), unit);
            double perSeconds = rate.per().toNanos() * 1e-9;
            String perText = per(rate.per());
            String rateUnit = rate.change().unit().symbol() + "/" + perText;
            long period = periods.getOrDefault(rate.channel(), 0L);
            int expected = period > 0 ? (int) Math.min(1 << 20, rate.window().toNanos() / period + 2) : 0;
            return new RateEvaluator(alarm, core, rate.direction(), change / perSeconds, rate.window().toNanos(), unit,
                    rate.change().unit(), perSeconds, rateUnit,
                    Texts.number(rate.change().value()) + " " + rateUnit, expected);
        }
        if (rule instanceof StaleRule) {
            StaleRule stale = (StaleRule) rule;
            long timeout = stale.timeout().map(Duration::toNanos).orElse(staleAfter.get(stale.channel()));
            if (timeout <= 0) {
                throw refuse(rule, "the stale timeout must be positive, got " + Texts.nanos(timeout));
            }
            long channelStale = staleAfter.get(stale.channel());
            StaleEvaluator evaluator = new StaleEvaluator(alarm, core, stale.channel(), timeout,
                    Math.min(timeout, channelStale),
                    core.measured.containsKey(stale.channel()) && channelStale <= timeout);
            staleRules.add(evaluator);
            return evaluator;
        }
        if (rule instanceof VoteRule) {
            VoteRule vote = (VoteRule) rule;
            int n = vote.channels().size();
            if (n > VoteEvaluator.MAX_CHANNELS) {
                throw refuse(rule, "a vote reads at most " + VoteEvaluator.MAX_CHANNELS + " channels, got " + n);
            }
            ChannelNode[] channels = new ChannelNode[n];
            double[] setpoints = new double[n];
            double[] deadbands = new double[n];
            for (int i = 0; i < n; i++) {
                channels[i] = core.channels.get(vote.channels().get(i));
                setpoints[i] = level(rule, "setpoint", vote.setpoint(), channels[i].unit);
                deadbands[i] = difference(rule, "deadband", vote.deadband(), channels[i].unit);
            }
            return new VoteEvaluator(alarm, channels, vote.required(), vote.direction(), setpoints, deadbands,
                    vote.faultCountsAsTripped(), Texts.quantity(vote.setpoint().value(), vote.setpoint().unit()));
        }
        if (rule instanceof ForecastRule forecast) {
            return forecast(forecast, alarm);
        }
        DeviationRule deviation = (DeviationRule) rule;
        ChannelNode[] channels = new ChannelNode[deviation.channels().size()];
        for (int i = 0; i < channels.length; i++) {
            channels[i] = core.channels.get(deviation.channels().get(i));
            if (!channels[i].unit.isCompatibleWith(channels[0].unit)) {
                throw refuse(rule, "cannot compare " + channels[i].id + " in " + channels[i].unit + " with "
                        + channels[0].id + " in " + channels[0].unit);
            }
        }
        double tolerance = difference(rule, "tolerance", deviation.tolerance(), channels[0].unit);
        if (!(tolerance > 0)) {
            throw refuse(rule, "the tolerance must be positive, got " + deviation.tolerance());
        }
        return new DeviationEvaluator(alarm, channels, tolerance, ambientPa);
    }

    private RuleEvaluator forecast(ForecastRule rule, AlarmRuntime alarm) {
        if (core.forecasts.containsKey(rule.channel())) {
            throw refuse(rule, "cannot forecast channel " + rule.channel() + ", itself a forecast");
        }
        Unit unit = core.channels.get(rule.channel()).unit;
        double reaches = level(rule, "minimum level", rule.reaches(), unit);
        double rise = difference(rule, "refill rise", rule.refillRise(), unit);
        if (!(rise > 0)) {
            throw refuse(rule, "the refill rise must be more than zero, got " + rule.refillRise());
        }
        ZoneId zone = rule.timeZone().or(config::timeZone).orElse(null);
        if (rule.before().isPresent() && zone == null) {
            throw refuse(rule, "'before " + rule.before().get() + "' needs a time zone: give the rule or the site "
                    + "a time_zone");
        }
        return new ForecastEvaluator(alarm, core, rule.channel(), unit, reaches, rise, rule.window().toNanos(),
                rule.publish().map(core.forecasts::get).orElse(null), rule.before().orElse(null), zone,
                rule.within().map(Duration::toNanos).orElse(0L));
    }

    private void start() {
        long now = core.now;
        for (MeasuredChannel channel : core.measured.values()) {
            channel.start(now);
        }
        for (StaleEvaluator stale : staleRules) {
            stale.start(now);
        }
    }

    /** A level (a setpoint) in the channel's unit: offsets apply, gauge/absolute through the ambient pressure. */
    private double level(RuleDef rule, String what, Quantity quantity, Unit channelUnit) {
        return level(rule.position(), "rule " + rule.id(), what, quantity, channelUnit);
    }

    private double level(SourcePosition at, String item, String what, Quantity quantity, Unit channelUnit) {
        if (!Double.isFinite(quantity.value())) {
            throw refuse(at, item, "the " + what + " must be a finite number, got " + quantity);
        }
        if (!quantity.unit().isCompatibleWith(channelUnit)) {
            throw refuse(at, item, "the " + what + " " + quantity + " is " + quantity.unit().dimension().expected()
                    + " but the channel is in " + channelUnit.symbol() + ", " + channelUnit.dimension().expected());
        }
        return quantity.in(channelUnit, ambientPa);
    }

    /** A difference (deadband, tolerance, rate) in the channel's unit: no offsets, no gauge/absolute shift. */
    private double difference(RuleDef rule, String what, Quantity quantity, Unit channelUnit) {
        return difference(rule.position(), "rule " + rule.id(), what, quantity, channelUnit);
    }

    private double difference(SourcePosition at, String item, String what, Quantity quantity, Unit channelUnit) {
        if (!Double.isFinite(quantity.value()) || quantity.value() < 0) {
            throw refuse(at, item, "the " + what + " must be a non-negative finite number, got " + quantity);
        }
        if (quantity.value() == 0) {
            return 0;
        }
        if (!quantity.unit().isCompatibleWith(channelUnit)) {
            throw refuse(at, item, "the " + what + " " + quantity + " is " + quantity.unit().dimension().expected()
                    + " but the channel is in " + channelUnit.symbol() + ", " + channelUnit.dimension().expected());
        }
        return quantity.unit().differenceTo(channelUnit, quantity.value());
    }

    private static String per(Duration per) {
        if (per.equals(Duration.ofHours(1))) {
            return "h";
        }
        if (per.equals(Duration.ofMinutes(1))) {
            return "min";
        }
        if (per.equals(Duration.ofSeconds(1))) {
            return "s";
        }
        return Texts.duration(per);
    }

    private void unique(String kind, String id, SourcePosition position) {
        String key = kind.equals("channel") ? "channel:" + id : kind + ":" + id;
        SourcePosition first = defined.putIfAbsent(key, position);
        if (first != null) {
            throw refuse(position, kind + " " + id, "is defined twice (first at " + first + ")");
        }
    }

    private List<String> allChannelIds() {
        List<String> ids = new ArrayList<>(core.channels.keySet());
        for (DerivedChannelDef def : config.derived()) {
            if (!ids.contains(def.id())) {
                ids.add(def.id());
            }
        }
        return ids;
    }

    private static String suggest(String wrong, java.util.Collection<String> known) {
        return Suggestion.didYouMean(wrong, known);
    }

    private static IllegalArgumentException refuse(RuleDef rule, String message) {
        return refuse(rule.position(), "rule " + rule.id(), message);
    }

    private static IllegalArgumentException refuse(SourcePosition position, String what, String message) {
        return new IllegalArgumentException(position + ": " + what + ": " + message);
    }

}
