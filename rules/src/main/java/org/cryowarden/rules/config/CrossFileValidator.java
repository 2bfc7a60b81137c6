package org.cryowarden.rules.config;

import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.DeviationRule;
import org.cryowarden.rules.model.FillDef;
import org.cryowarden.rules.model.ForecastRule;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.OutputAction;
import org.cryowarden.rules.model.RateRule;
import org.cryowarden.rules.model.RuleDef;
import org.cryowarden.rules.model.SiteDef;
import org.cryowarden.rules.model.StaleRule;
import org.cryowarden.rules.model.VoteRule;

/**
 * The checks that need more than one file: rules against the site's channels (existence, units, poll periods),
 * limits against each other on one channel, ids unique over all rule files, and references between rules,
 * alarms, interlocks and outputs. Each problem points at the value that is wrong, in the rule file.
 */
final class CrossFileValidator {

    private final SiteFile site;
    private final List<RuleFile> files;
    private final Problems problems;
    private final Map<String, Unit> channelUnits = new LinkedHashMap<>();
    private final Map<String, ChannelDef> measured = new LinkedHashMap<>();
    private final Map<String, SourcePosition> ruleIds = new LinkedHashMap<>();
    private final Map<String, SourcePosition> interlockIds = new LinkedHashMap<>();
    private final Map<String, SourcePosition> fillIds = new LinkedHashMap<>();
    /** Channels that forecast rules publish (unit h), known to every rule file. */
    private final Map<String, SourcePosition> published = new LinkedHashMap<>();
    private final Map<String, String> valves = new LinkedHashMap<>();
    private final double ambientPascal;

    private CrossFileValidator(SiteFile site, List<RuleFile> files, Problems problems) {
        this.site = site;
        this.files = files;
        this.problems = problems;
        this.ambientPascal = site.site().map(SiteDef::ambientPressurePa).orElse(Quantity.STANDARD_ATMOSPHERE_PA);
        site.site().ifPresent(def -> {
            for (ChannelDef channel : def.channels()) {
                channelUnits.put(channel.id(), channel.unit());
                measured.put(channel.id(), channel);
            }
            for (DerivedChannelDef derived : def.derived()) {
                channelUnits.put(derived.id(), derived.unit());
            }
        });
    }

    /** Adds every problem between {@code site} and {@code files} to {@code problems}. */
    static void validate(SiteFile site, List<RuleFile> files, Problems problems) {
        new CrossFileValidator(site, files, problems).run();
    }

    static String duplicate(String what, String id, SourcePosition earlier) {
        return "duplicate " + what + " id '" + id + "': already defined at " + earlier;
    }

    private void run() {
        for (RuleFile file : files) {
            collectIds(file.ruleIds(), ruleIds, "rule");
            collectIds(file.interlockIds(), interlockIds, "interlock");
            collectIds(file.fillIds(), fillIds, "fill");
        }
        for (Map.Entry<String, SourcePosition> fill : fillIds.entrySet()) {
            SourcePosition earlier = ruleIds.containsKey(fill.getKey()) ? ruleIds.get(fill.getKey())
                    : interlockIds.get(fill.getKey());
            if (earlier != null) {
                problems.add(fill.getValue(), "fill id '" + fill.getKey() + "' is already used at " + earlier
                        + ": a fill's id is also the id of its fault alarm, unique among rules and interlocks");
            }
        }
        boolean siteKnown = site.site().isPresent();
        for (RuleFile file : files) {
            for (RuleDef rule : file.rules()) {
                if (rule instanceof ForecastRule forecast && forecast.publish().isPresent()) {
                    String id = forecast.publish().get();
                    SourcePosition at = file.sources().get(rule, "publish", rule.position());
                    if (site.channelIds().containsKey(id) || site.outputIds().containsKey(id)) {
                        problems.add(at, "forecast channel '" + id + "' of rule '" + rule.id() + "' is already a "
                                + (site.channelIds().containsKey(id) ? "channel" : "an output") + " of "
                                + site.label() + ": publish the forecast under a new id");
                        continue;
                    }
                    SourcePosition earlier = published.putIfAbsent(id, at);
                    if (earlier != null) {
                        problems.add(at, "forecast channel '" + id + "' is already published at " + earlier);
                    }
                }
            }
        }
        for (RuleFile file : files) {
            for (RuleDef rule : file.rules()) {
                if (siteKnown) {
                    checkChannels(rule, file.sources());
                }
                checkAlarmReferences(rule, file.sources());
            }
            for (FillDef fill : file.fills()) {
                checkFill(fill, file.sources(), siteKnown);
            }
            if (siteKnown) {
                for (InterlockDef interlock : file.interlocks()) {
                    checkActions(interlock, file.sources());
                }
            }
        }
        if (siteKnown) {
            checkLimitOrder();
        }
    }

    private void collectIds(Map<String, SourcePosition> declared, Map<String, SourcePosition> all, String what) {
        for (Map.Entry<String, SourcePosition> entry : declared.entrySet()) {
            SourcePosition earlier = all.putIfAbsent(entry.getKey(), entry.getValue());
            if (earlier != null) {
                problems.add(entry.getValue(), duplicate(what, entry.getKey(), earlier));
            }
        }
    }

    private void checkChannels(RuleDef rule, SourceMap sources) {
        List<String> inputs = rule.inputs();
        for (int i = 0; i < inputs.size(); i++) {
            String channel = inputs.get(i);
            String field = rule instanceof VoteRule || rule instanceof DeviationRule ? "channels[" + i + "]" : "channel";
            SourcePosition at = sources.get(rule, field, rule.position());
            if (!knownChannel(channel)) {
                problems.add(at, "unknown channel '" + channel + "' in rule '" + rule.id() + "'"
                        + channelHint(channel));
                continue;
            }
            Unit unit = published.containsKey(channel) ? Unit.HOUR : channelUnits.get(channel);
            if (unit == null) {
                continue; // declared but itself invalid: already reported in the site file
            }
            if (rule instanceof LimitRule limit) {
                unitsAgree(limit.setpoint(), "the setpoint", rule, channel, unit, sources.get(rule, "setpoint", at));
            } else if (rule instanceof RateRule rate) {
                unitsAgree(rate.change(), "the rate", rule, channel, unit, sources.get(rule, "change", at));
            } else if (rule instanceof VoteRule vote) {
                unitsAgree(vote.setpoint(), "the setpoint", rule, channel, unit, at);
            } else if (rule instanceof DeviationRule deviation) {
                unitsAgree(deviation.tolerance(), "the tolerance", rule, channel, unit, at);
            } else if (rule instanceof StaleRule stale) {
                checkStale(stale, channel, sources.get(rule, "timeout", at), at);
            } else if (rule instanceof ForecastRule forecast) {
                checkForecast(forecast, channel, unit, sources, at);
            }
        }
    }

    private boolean knownChannel(String channel) {
        return site.channelIds().containsKey(channel) || published.containsKey(channel);
    }

    private String channelHint(String channel) {
        if (site.outputIds().containsKey(channel)) {
            return ": '" + channel + "' is an output, not a channel";
        }
        List<String> known = new ArrayList<>(site.channelIds().keySet());
        known.addAll(published.keySet());
        return ": no such channel in " + site.label() + Suggestions.didYouMean(channel, known);
    }

    private void checkForecast(ForecastRule rule, String channel, Unit unit, SourceMap sources, SourcePosition at) {
        if (published.containsKey(channel)) {
            problems.add(at, "rule '" + rule.id() + "' forecasts channel '" + channel + "', itself a forecast: "
                    + "forecast the measured or derived channel instead");
            return;
        }
        unitsAgree(rule.reaches(), "the minimum level", rule, channel, unit, sources.get(rule, "reaches", at));
        unitsAgree(rule.refillRise(), "the refill rise", rule, channel, unit, sources.get(rule, "refill_rise", at));
        boolean zoneKnown = rule.timeZone().isPresent() || site.site().flatMap(SiteDef::timeZone).isPresent();
        if (rule.before().isPresent() && !zoneKnown) {
            problems.add(sources.get(rule, "before", at), "'before: " + rule.before().get() + "' in rule '" + rule.id()
                    + "' needs a time zone: add 'time_zone' to the forecast or to the 'site' section of "
                    + site.label());
        }
    }

    private void checkFill(FillDef fill, SourceMap sources, boolean siteKnown) {
        String what = "fill '" + fill.id() + "'";
        for (int i = 0; i < fill.blockedBy().size(); i++) {
            String alarm = fill.blockedBy().get(i);
            SourcePosition at = sources.get(fill, "blocked_by[" + i + "]", fill.position());
            if (alarm.equals(fill.id())) {
                problems.add(at, what + " cannot be blocked by its own fault alarm");
            } else if (!ruleIds.containsKey(alarm) && !fillIds.containsKey(alarm)) {
                List<String> alarms = new ArrayList<>(ruleIds.keySet());
                alarms.addAll(fillIds.keySet());
                problems.add(at, "unknown alarm '" + alarm + "' in 'blocked_by' of " + what + ": no rule or fill has "
                        + "this id" + Suggestions.didYouMean(alarm, alarms));
            }
        }
        if (!siteKnown) {
            return;
        }
        SourcePosition channelAt = sources.get(fill, "channel", fill.position());
        if (!knownChannel(fill.channel())) {
            problems.add(channelAt, "unknown channel '" + fill.channel() + "' in " + what
                    + channelHint(fill.channel()));
        } else {
            Unit unit = published.containsKey(fill.channel()) ? Unit.HOUR : channelUnits.get(fill.channel());
            if (unit != null) {
                fillUnit(fill, "start_below", fill.startBelow(), unit, sources);
                fillUnit(fill, "stop_above", fill.stopAbove(), unit, sources);
                fillUnit(fill, "min_rise", fill.minRise(), unit, sources);
            }
        }
        SourcePosition valveAt = sources.get(fill, "valve", fill.position());
        if (!site.outputIds().containsKey(fill.valve())) {
            String hint = site.channelIds().containsKey(fill.valve())
                    ? ": '" + fill.valve() + "' is a channel, not an output"
                    : ": no such output in " + site.label()
                            + Suggestions.didYouMean(fill.valve(), site.outputIds().keySet());
            problems.add(valveAt, "unknown output '" + fill.valve() + "' in " + what + hint);
            return;
        }
        String owner = valves.putIfAbsent(fill.valve(), fill.id());
        if (owner != null) {
            problems.add(valveAt, "output '" + fill.valve() + "' of " + what + " is already the valve of fill '"
                    + owner + "': one fill per valve");
        }
        for (RuleFile file : files) {
            for (InterlockDef interlock : file.interlocks()) {
                for (OutputAction action : interlock.actions()) {
                    if (action.output().equals(fill.valve())) {
                        problems.add(valveAt, "output '" + fill.valve() + "' of " + what + " is also driven by "
                                + "interlock '" + interlock.id() + "': a fill valve has one owner; list that "
                                + "interlock's alarms in 'blocked_by' instead");
                    }
                }
            }
        }
    }

    private void fillUnit(FillDef fill, String key, Quantity quantity, Unit unit, SourceMap sources) {
        if (!quantity.unit().isCompatibleWith(unit)) {
            problems.add(sources.get(fill, key, fill.position()), "unit mismatch: '" + key + "' of fill '" + fill.id()
                    + "' is " + quantity + ", " + quantity.unit().dimension().expected() + ", but channel '"
                    + fill.channel() + "' is in " + unit.symbol() + ", " + unit.dimension().expected());
        }
    }

    private void unitsAgree(Quantity quantity, String what, RuleDef rule, String channel, Unit unit, SourcePosition at) {
        if (quantity.unit() == Unit.ONE && unit != Unit.ONE) {
            problems.add(at, "unit mismatch: " + what + " of rule '" + rule.id() + "' is " + Units.number(quantity.value())
                    + " without a unit, but channel '" + channel + "' is in " + unit.symbol() + ", "
                    + unit.dimension().expected() + ": write the unit, e.g. " + Units.number(quantity.value()) + " "
                    + unit.symbol());
        } else if (!quantity.unit().isCompatibleWith(unit)) {
            problems.add(at, "unit mismatch: " + what + " of rule '" + rule.id() + "' is " + quantity + ", "
                    + quantity.unit().dimension().expected() + ", but channel '" + channel + "' is in " + unit.symbol()
                    + ", " + unit.dimension().expected());
        }
    }

    private void checkStale(StaleRule stale, String channel, SourcePosition timeoutAt, SourcePosition channelAt) {
        ChannelDef def = measured.get(channel);
        if (def == null) {
            if (stale.timeout().isEmpty()) {
                problems.add(channelAt, "stale rule '" + stale.id() + "' on derived channel '" + channel + "' needs a "
                        + "'timeout': a derived channel has no poll period of its own");
            }
            return;
        }
        Optional<Duration> timeout = stale.timeout();
        if (timeout.isPresent() && timeout.get().compareTo(def.period()) <= 0) {
            problems.add(timeoutAt, SiteLoader.staleMessage(timeout.get(), def.period(), "channel '" + channel + "'",
                    "is polled every"));
        }
    }

    private void checkAlarmReferences(RuleDef rule, SourceMap sources) {
        List<String> suppressors = rule.alarm().suppressWhile();
        for (int i = 0; i < suppressors.size(); i++) {
            String alarm = suppressors.get(i);
            SourcePosition at = sources.get(rule, "suppress_while[" + i + "]", rule.position());
            if (alarm.equals(rule.id())) {
                problems.add(at, "rule '" + rule.id() + "' cannot be suppressed while its own alarm is active");
            } else if (!ruleIds.containsKey(alarm) && !fillIds.containsKey(alarm)) {
                problems.add(at, "unknown alarm '" + alarm + "' in 'suppress_while' of rule '" + rule.id()
                        + "': no rule has this id" + Suggestions.didYouMean(alarm, ruleIds.keySet()));
            }
        }
        rule.alarm().trips().ifPresent(interlock -> {
            if (!interlockIds.containsKey(interlock)) {
                problems.add(sources.get(rule, "trips", rule.position()), "unknown interlock '" + interlock
                        + "' in 'trips' of rule '" + rule.id() + "': no interlock has this id"
                        + Suggestions.didYouMean(interlock, interlockIds.keySet()));
            }
        });
    }

    private void checkActions(InterlockDef interlock, SourceMap sources) {
        for (int i = 0; i < interlock.actions().size(); i++) {
            String output = interlock.actions().get(i).output();
            if (site.outputIds().containsKey(output)) {
                continue;
            }
            String hint = site.channelIds().containsKey(output)
                    ? ": '" + output + "' is a channel, not an output"
                    : ": no such output in " + site.label() + Suggestions.didYouMean(output, site.outputIds().keySet());
            problems.add(sources.get(interlock, "actions[" + i + "].output", interlock.position()),
                    "unknown output '" + output + "' in interlock '" + interlock.id() + "'" + hint);
        }
    }

    /**
     * On one channel every low limit must lie below every high limit, a more urgent high limit must not be
     * below a less urgent one (a high-high below a high), and a more urgent low limit must not be above a less
     * urgent one. Limits of equal priority may sit anywhere.
     */
    private void checkLimitOrder() {
        Map<String, List<Placed>> byChannel = new LinkedHashMap<>();
        for (RuleFile file : files) {
            for (RuleDef rule : file.rules()) {
                if (rule instanceof LimitRule limit && limit.alarm() != RuleSetLoader.INCOMPLETE_ALARM) {
                    Unit unit = channelUnits.get(limit.channel());
                    if (unit != null && limit.setpoint().unit().isCompatibleWith(unit)) {
                        double value = limit.setpoint().in(unit, ambientPascal);
                        SourcePosition at = file.sources().get(rule, "setpoint", rule.position());
                        byChannel.computeIfAbsent(limit.channel(), c -> new ArrayList<>()).add(new Placed(limit, value, at));
                    }
                }
            }
        }
        for (Map.Entry<String, List<Placed>> entry : byChannel.entrySet()) {
            List<Placed> limits = entry.getValue();
            for (int i = 0; i < limits.size(); i++) {
                for (int j = i + 1; j < limits.size(); j++) {
                    compare(entry.getKey(), limits.get(i), limits.get(j));
                }
            }
        }
    }

    private void compare(String channel, Placed a, Placed b) {
        Direction da = a.rule().direction();
        Direction db = b.rule().direction();
        if (da != db) {
            Placed low = da == Direction.LOW ? a : b;
            Placed high = da == Direction.LOW ? b : a;
            if (low.value() >= high.value()) {
                problems.add(low.at(), "low limit '" + low.rule().id() + "' at " + low.rule().setpoint()
                        + " is not below high limit '" + high.rule().id() + "' at " + high.rule().setpoint()
                        + " on channel '" + channel + "': every low limit must be below every high limit");
            }
            return;
        }
        int urgency = a.rule().alarm().priority().compareTo(b.rule().alarm().priority());
        if (urgency == 0) {
            return;
        }
        Placed urgent = urgency < 0 ? a : b;
        Placed milder = urgency < 0 ? b : a;
        boolean high = da == Direction.HIGH;
        boolean wrong = high ? urgent.value() < milder.value() : urgent.value() > milder.value();
        if (wrong) {
            String side = high ? "high" : "low";
            problems.add(urgent.at(), side + " limit '" + urgent.rule().id() + "' (" + urgent.rule().alarm().priority()
                    .word() + ") at " + urgent.rule().setpoint() + " is " + (high ? "below" : "above") + " " + side
                    + " limit '" + milder.rule().id() + "' (" + milder.rule().alarm().priority().word() + ") at "
                    + milder.rule().setpoint() + " on channel '" + channel + "': the more urgent " + side
                    + " limit must be the " + (high ? "higher" : "lower") + " one");
        }
    }

    /** A limit with its setpoint in the channel's unit and where the setpoint was written. */
    private record Placed(LimitRule rule, double value, SourcePosition at) {
    }
}
