package org.cryowarden.rules.config;

import java.nio.file.Path;
import java.time.Duration;
import java.time.LocalTime;
import java.time.ZoneId;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.DeviationRule;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.FillDef;
import org.cryowarden.rules.model.FloodDef;
import org.cryowarden.rules.model.ForecastRule;
import org.cryowarden.rules.model.InterlockDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.OutputAction;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.RateRule;
import org.cryowarden.rules.model.RuleDef;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.StaleRule;
import org.cryowarden.rules.model.VoteRule;

/**
 * Reads rule-set files ({@code *-rules.yaml}: rules, interlocks, fills and the alarm-flood criterion) into a
 * {@link RuleSet}, checking what each
 * file can check on its own: keys, types, durations, quantities, voting shapes. Whether the channels, alarms,
 * interlocks and outputs they name exist, and whether units and limits agree with the site, is for
 * {@link CrossFileValidator}. The schema is documented in {@code config-examples/README.md}.
 */
public final class RuleSetLoader {

    static final List<String> TOP_KEYS = List.of("rules", "interlocks", "fills", "alarm_flood");
    static final List<String> TYPES = List.of("limit", "rate", "stale", "vote", "deviation", "forecast");
    static final List<String> ALARM_KEYS =
            List.of("priority", "message", "on_delay", "off_delay", "latching", "suppress_while", "trips");
    static final List<String> RULE_KEYS;
    static final List<String> LIMIT_KEYS = List.of("channel", "above", "below", "deadband");
    static final List<String> RATE_KEYS = List.of("channel", "rising_faster_than", "falling_faster_than", "window");
    static final List<String> STALE_KEYS = List.of("channel", "timeout");
    static final List<String> VOTE_KEYS =
            List.of("channels", "voting", "above", "below", "deadband", "faults_count_as_tripped");
    static final List<String> DEVIATION_KEYS = List.of("channels", "tolerance");
    static final List<String> FORECAST_KEYS =
            List.of("channel", "reaches", "window", "refill_rise", "publish", "before", "within", "time_zone");
    static final List<String> FILL_KEYS = List.of("id", "channel", "valve", "start_below", "stop_above", "open_value",
            "max_open", "min_rise", "rise_window", "blocked_by", "priority", "message");
    static final List<String> FLOOD_KEYS = List.of("more_than", "within", "ends_below");
    static final List<String> INTERLOCK_KEYS = List.of("id", "description", "actions");
    static final List<String> ACTION_KEYS = List.of("output", "value");
    static final List<String> PRIORITIES = List.of("critical", "high", "medium", "low");

    private static final Pattern VOTING = Pattern.compile("(\\d+)oo(\\d+)");
    private static final Pattern TIME_BASE = Pattern.compile("(\\d+(?:\\.\\d+)?)?\\s*(ms|s|min|h|d)");

    static {
        List<String> keys = new ArrayList<>();
        keys.add("id");
        keys.addAll(TYPES);
        keys.addAll(ALARM_KEYS);
        RULE_KEYS = List.copyOf(keys);
    }

    /** Placeholder options of a rule whose own options had errors; such a rule never leaves the loader. */
    static final AlarmOptions INCOMPLETE_ALARM = AlarmOptions.simple(Priority.LOW, "");

    private RuleSetLoader() {
    }

    /**
     * Loads rule-set files on their own, without a site: only what the files themselves can show is checked.
     * Use {@link ConfigurationLoader} to check them against a site.
     *
     * @throws ConfigException with every problem of every file
     */
    public static RuleSet load(List<Path> files) throws ConfigException {
        Problems problems = new Problems();
        List<RuleDef> rules = new ArrayList<>();
        List<RuleFile> read = new ArrayList<>();
        for (Path file : files) {
            read.add(read(file, problems));
        }
        RuleSet merged = merge(read, problems);
        problems.throwIfAny();
        return merged;
    }

    /** Reads one rule-set file, adding every problem to {@code problems}; never throws for bad input. */
    static RuleFile read(Path file, Problems problems) {
        ConfigNode root;
        try {
            root = YamlReader.read(file);
        } catch (ConfigException e) {
            problems.addAll(e.problems());
            return RuleFile.unreadable(file.toString());
        }
        return new Reader(problems, file.toString()).read(root);
    }

    /** The state of reading one file. */
    private static final class Reader {
        private final Problems problems;
        private final String label;
        private final SourceMap sources = new SourceMap();
        private final Map<String, SourcePosition> ruleIds = new LinkedHashMap<>();
        private final Map<String, SourcePosition> interlockIds = new LinkedHashMap<>();
        private final List<RuleDef> rules = new ArrayList<>();
        private final List<InterlockDef> interlocks = new ArrayList<>();
        private final Map<String, SourcePosition> fillIds = new LinkedHashMap<>();
        private final List<FillDef> fills = new ArrayList<>();

        Reader(Problems problems, String label) {
            this.problems = problems;
            this.label = label;
        }

        RuleFile read(ConfigNode root) {
            Optional<Fields> top = Fields.open(root, "a rule-set file", TOP_KEYS, problems);
            if (top.isEmpty()) {
                return RuleFile.unreadable(label);
            }
            top.get().rejectUnknownKeys();
            if (!top.get().has("rules") && !top.get().has("interlocks") && !top.get().has("fills")) {
                problems.add(root.position(), "a rule-set file needs 'rules', 'interlocks' or 'fills', found none");
            }
            top.get().list("rules", false, "a list of rules").ifPresent(list -> {
                for (ConfigNode item : list.items()) {
                    rule(item);
                }
            });
            top.get().list("interlocks", false, "a list of interlocks").ifPresent(list -> {
                for (ConfigNode item : list.items()) {
                    interlock(item);
                }
            });
            top.get().list("fills", false, "a list of fill controllers").ifPresent(list -> {
                for (ConfigNode item : list.items()) {
                    fill(item);
                }
            });
            Optional<FloodDef> flood = top.get().mapping("alarm_flood", false, "a mapping of more_than, within and "
                    + "ends_below").flatMap(this::flood);
            Optional<SourcePosition> floodAt = top.get().has("alarm_flood")
                    ? Optional.of(top.get().keyPosition("alarm_flood")) : Optional.empty();
            return new RuleFile(label, rules, interlocks, ruleIds, interlockIds, fills, fillIds, flood, floodAt,
                    sources);
        }

        private void rule(ConfigNode node) {
            Optional<Fields> opened = Fields.open(node, "a rule", RULE_KEYS, problems);
            if (opened.isEmpty()) {
                return;
            }
            Fields rule = opened.get();
            Optional<String> id = rule.id("id", true);
            id.ifPresent(value -> rule.describeAs("rule '" + value + "'"));
            rule.rejectUnknownKeys();
            id.ifPresent(value -> unique(ruleIds, value, rule.valuePosition("id"), "rule"));
            List<String> types = new ArrayList<>();
            for (ConfigNode.Entry entry : rule.mapping().entries()) {
                if (TYPES.contains(entry.key())) {
                    types.add(entry.key());
                    if (types.size() == 2) {
                        problems.add(entry.keyPosition(), rule.context() + " has both '" + types.get(0) + "' and '"
                                + entry.key() + "': a rule has exactly one type, write one rule for each");
                    }
                }
            }
            if (types.isEmpty()) {
                problems.add(rule.position(), rule.context() + " needs exactly one of " + String.join(", ", TYPES)
                        + ", found none");
            }
            // A rule whose alarm options are wrong is still built, with placeholder options, so that its channel
            // references are checked in the same run; any problem keeps the rule set from being returned.
            Optional<AlarmOptions> alarm = Optional.of(alarm(rule).orElse(INCOMPLETE_ALARM));
            if (types.size() != 1) {
                return;
            }
            String type = types.get(0);
            ConfigNode body = rule.node(type, true).orElseThrow();
            Optional<Fields> parameters = Fields.open(body, "the '" + type + "' of " + rule.context(),
                    keysOf(type), problems);
            if (parameters.isEmpty()) {
                return;
            }
            parameters.get().rejectUnknownKeys();
            Optional<RuleDef> def = switch (type) {
                case "limit" -> limit(id, parameters.get(), alarm, rule.position());
                case "rate" -> rate(id, parameters.get(), alarm, rule.position());
                case "stale" -> stale(id, parameters.get(), alarm, rule.position());
                case "vote" -> vote(id, parameters.get(), alarm, rule.position());
                case "forecast" -> forecast(id, parameters.get(), alarm, rule.position());
                default -> deviation(id, parameters.get(), alarm, rule.position());
            };
            def.ifPresent(value -> {
                rules.add(value);
                sources.putAll(value, rule.positions());
                sources.putAll(value, parameters.get().positions());
            });
        }

        private Optional<AlarmOptions> alarm(Fields rule) {
            Optional<Priority> priority = rule.word("priority", true, PRIORITIES, "priority")
                    .map(word -> Priority.valueOf(word.toUpperCase(Locale.ROOT)));
            Optional<String> message = rule.text("message", true);
            Optional<Duration> onDelay = delay(rule, "on_delay");
            Optional<Duration> offDelay = delay(rule, "off_delay");
            Optional<Boolean> latching = rule.bool("latching");
            Optional<List<String>> suppressWhile = rule.ids("suppress_while", false, "a list of alarm (rule) ids");
            Optional<String> trips = rule.id("trips", false);
            boolean complete = priority.isPresent() && message.isPresent()
                    && (onDelay.isPresent() || !rule.has("on_delay"))
                    && (offDelay.isPresent() || !rule.has("off_delay"))
                    && (latching.isPresent() || !rule.has("latching"))
                    && (suppressWhile.isPresent() || !rule.has("suppress_while"))
                    && (trips.isPresent() || !rule.has("trips"));
            if (!complete) {
                return Optional.empty();
            }
            return Optional.of(new AlarmOptions(priority.get(), message.get(), onDelay.orElse(Duration.ZERO),
                    offDelay.orElse(Duration.ZERO), latching.orElse(false), suppressWhile.orElse(List.of()), trips));
        }

        private Optional<Duration> delay(Fields fields, String key) {
            Optional<Duration> delay = fields.duration(key, false);
            if (delay.isPresent() && delay.get().isNegative()) {
                problems.add(fields.valuePosition(key), "'" + key + "' in " + fields.context()
                        + " cannot be negative, found '" + DurationSyntax.format(delay.get()) + "'");
                return Optional.empty();
            }
            return delay;
        }

        private Optional<RuleDef> limit(Optional<String> id, Fields limit, Optional<AlarmOptions> alarm,
                SourcePosition at) {
            Optional<String> channel = limit.id("channel", true);
            Optional<Direction> direction = direction(limit, "above", "below");
            Optional<Quantity> setpoint = direction.flatMap(d -> limit.quantityOrPlain(
                    d == Direction.HIGH ? "above" : "below", true));
            Optional<Quantity> deadband = deadband(limit, setpoint);
            if (id.isEmpty() || alarm.isEmpty() || channel.isEmpty() || setpoint.isEmpty() || deadband.isEmpty()) {
                return Optional.empty();
            }
            LimitRule rule = new LimitRule(id.get(), channel.get(), direction.get(), setpoint.get(), deadband.get(),
                    alarm.get(), at);
            sources.put(rule, "setpoint", limit.valuePosition(direction.get() == Direction.HIGH ? "above" : "below"));
            return Optional.of(rule);
        }

        private Optional<RuleDef> rate(Optional<String> id, Fields rate, Optional<AlarmOptions> alarm,
                SourcePosition at) {
            Optional<String> channel = rate.id("channel", true);
            Optional<Direction> direction = direction(rate, "rising_faster_than", "falling_faster_than");
            String key = direction.map(d -> d == Direction.HIGH ? "rising_faster_than" : "falling_faster_than")
                    .orElse("rising_faster_than");
            Optional<RateSpec> spec = direction.flatMap(d -> rateSpec(rate, key));
            Optional<Duration> window = rate.duration("window", true);
            if (window.isPresent() && (window.get().isZero() || window.get().isNegative())) {
                problems.add(rate.valuePosition("window"), "'window' in " + rate.context()
                        + " must be longer than zero, found '" + DurationSyntax.format(window.get()) + "'");
                window = Optional.empty();
            }
            if (id.isEmpty() || alarm.isEmpty() || channel.isEmpty() || spec.isEmpty() || window.isEmpty()) {
                return Optional.empty();
            }
            RateRule rule = new RateRule(id.get(), channel.get(), direction.get(), spec.get().change(),
                    spec.get().per(), window.get(), alarm.get(), at);
            sources.put(rule, "change", rate.valuePosition(key));
            return Optional.of(rule);
        }

        private Optional<RuleDef> stale(Optional<String> id, Fields stale, Optional<AlarmOptions> alarm,
                SourcePosition at) {
            Optional<String> channel = stale.id("channel", true);
            Optional<Duration> timeout = stale.duration("timeout", false);
            if (timeout.isPresent() && (timeout.get().isZero() || timeout.get().isNegative())) {
                problems.add(stale.valuePosition("timeout"), "'timeout' in " + stale.context()
                        + " must be longer than zero, found '" + DurationSyntax.format(timeout.get()) + "'");
                return Optional.empty();
            }
            if (id.isEmpty() || alarm.isEmpty() || channel.isEmpty() || (timeout.isEmpty() && stale.has("timeout"))) {
                return Optional.empty();
            }
            return Optional.of(new StaleRule(id.get(), channel.get(), timeout, alarm.get(), at));
        }

        private Optional<RuleDef> vote(Optional<String> id, Fields vote, Optional<AlarmOptions> alarm,
                SourcePosition at) {
            Optional<List<String>> channels = vote.ids("channels", true, "a list of channel ids");
            Optional<Integer> required = voting(vote, channels);
            Optional<Direction> direction = direction(vote, "above", "below");
            Optional<Quantity> setpoint = direction.flatMap(d -> vote.quantityOrPlain(
                    d == Direction.HIGH ? "above" : "below", true));
            Optional<Quantity> deadband = deadband(vote, setpoint);
            Optional<Boolean> faults = vote.bool("faults_count_as_tripped");
            if (id.isEmpty() || alarm.isEmpty() || channels.isEmpty() || required.isEmpty() || setpoint.isEmpty()
                    || deadband.isEmpty() || (faults.isEmpty() && vote.has("faults_count_as_tripped"))) {
                return Optional.empty();
            }
            VoteRule rule = new VoteRule(id.get(), channels.get(), required.get(), direction.get(), setpoint.get(),
                    deadband.get(), faults.orElse(true), alarm.get(), at);
            sources.put(rule, "setpoint", vote.valuePosition(direction.get() == Direction.HIGH ? "above" : "below"));
            return Optional.of(rule);
        }

        private Optional<RuleDef> deviation(Optional<String> id, Fields deviation, Optional<AlarmOptions> alarm,
                SourcePosition at) {
            Optional<List<String>> channels = deviation.ids("channels", true, "a list of channel ids");
            if (channels.isPresent() && channels.get().size() < 2) {
                problems.add(deviation.valuePosition("channels"), "'channels' in " + deviation.context()
                        + " must name at least 2 channels to compare, found " + channels.get().size());
                channels = Optional.empty();
            }
            Optional<Quantity> tolerance = deviation.quantity("tolerance", true);
            if (tolerance.isPresent() && !(tolerance.get().value() > 0)) {
                problems.add(deviation.valuePosition("tolerance"), "'tolerance' in " + deviation.context()
                        + " must be more than zero, found '" + tolerance.get() + "'");
                tolerance = Optional.empty();
            }
            if (id.isEmpty() || alarm.isEmpty() || channels.isEmpty() || tolerance.isEmpty()) {
                return Optional.empty();
            }
            return Optional.of(new DeviationRule(id.get(), channels.get(), tolerance.get(), alarm.get(), at));
        }

        private Optional<RuleDef> forecast(Optional<String> id, Fields forecast, Optional<AlarmOptions> alarm,
                SourcePosition at) {
            Optional<String> channel = forecast.id("channel", true);
            Optional<Quantity> reaches = forecast.quantity("reaches", true);
            Optional<Duration> window = positive(forecast, "window", true);
            Optional<Quantity> rise = forecast.quantity("refill_rise", true);
            if (rise.isPresent() && !(rise.get().value() > 0)) {
                problems.add(forecast.valuePosition("refill_rise"), "'refill_rise' in " + forecast.context()
                        + " must be more than zero, found '" + rise.get() + "'");
                rise = Optional.empty();
            }
            Optional<String> publish = forecast.id("publish", false);
            Optional<LocalTime> before = forecast.timeOfDay("before", false);
            Optional<Duration> within = positive(forecast, "within", false);
            Optional<ZoneId> zone = forecast.zone("time_zone", false);
            if (!forecast.has("before") && !forecast.has("within")) {
                problems.add(forecast.position(), forecast.context() + " needs 'before' (a local time of day such as "
                        + "07:00) or 'within' (a duration such as 12h), or both, found neither");
                return Optional.empty();
            }
            if (forecast.has("time_zone") && !forecast.has("before")) {
                problems.add(forecast.keyPosition("time_zone"), "'time_zone' in " + forecast.context() + " is only "
                        + "used with 'before'");
            }
            boolean complete = (before.isPresent() || !forecast.has("before"))
                    && (within.isPresent() || !forecast.has("within"))
                    && (zone.isPresent() || !forecast.has("time_zone"))
                    && (publish.isPresent() || !forecast.has("publish"));
            if (id.isEmpty() || alarm.isEmpty() || channel.isEmpty() || reaches.isEmpty() || window.isEmpty()
                    || rise.isEmpty() || !complete) {
                return Optional.empty();
            }
            ForecastRule rule = new ForecastRule(id.get(), channel.get(), reaches.get(), window.get(), rise.get(),
                    publish, before, within, zone, alarm.get(), at);
            sources.put(rule, "reaches", forecast.valuePosition("reaches"));
            sources.put(rule, "refill_rise", forecast.valuePosition("refill_rise"));
            sources.put(rule, "publish", forecast.valuePosition("publish"));
            sources.put(rule, "before", forecast.valuePosition("before"));
            return Optional.of(rule);
        }

        /** A duration that must be longer than zero. */
        private Optional<Duration> positive(Fields fields, String key, boolean required) {
            Optional<Duration> duration = fields.duration(key, required);
            if (duration.isPresent() && (duration.get().isZero() || duration.get().isNegative())) {
                problems.add(fields.valuePosition(key), "'" + key + "' in " + fields.context()
                        + " must be longer than zero, found '" + DurationSyntax.format(duration.get()) + "'");
                return Optional.empty();
            }
            return duration;
        }

        private void fill(ConfigNode node) {
            Optional<Fields> opened = Fields.open(node, "a fill", FILL_KEYS, problems);
            if (opened.isEmpty()) {
                return;
            }
            Fields fill = opened.get();
            Optional<String> id = fill.id("id", true);
            id.ifPresent(value -> fill.describeAs("fill '" + value + "'"));
            fill.rejectUnknownKeys();
            id.ifPresent(value -> unique(fillIds, value, fill.valuePosition("id"), "fill"));
            Optional<String> channel = fill.id("channel", true);
            Optional<String> valve = fill.id("valve", true);
            Optional<Quantity> start = fill.quantity("start_below", true);
            Optional<Quantity> stop = fill.quantity("stop_above", true);
            Optional<Double> openValue = fill.has("open_value") ? fill.number("open_value", false) : Optional.of(1.0);
            Optional<Duration> maxOpen = positive(fill, "max_open", true);
            Optional<Quantity> minRise = fill.quantity("min_rise", true);
            if (minRise.isPresent() && !(minRise.get().value() > 0)) {
                problems.add(fill.valuePosition("min_rise"), "'min_rise' in " + fill.context()
                        + " must be more than zero, found '" + minRise.get() + "'");
                minRise = Optional.empty();
            }
            Optional<Duration> riseWindow = positive(fill, "rise_window", true);
            if (riseWindow.isPresent() && maxOpen.isPresent() && riseWindow.get().compareTo(maxOpen.get()) > 0) {
                problems.add(fill.valuePosition("rise_window"), "'rise_window' in " + fill.context() + " ("
                        + DurationSyntax.format(riseWindow.get()) + ") is longer than 'max_open' ("
                        + DurationSyntax.format(maxOpen.get()) + "): the rise could never be checked");
                riseWindow = Optional.empty();
            }
            if (start.isPresent() && stop.isPresent() && start.get().unit().isCompatibleWith(stop.get().unit())
                    && !(stop.get().in(start.get().unit()) > start.get().value())) {
                problems.add(fill.valuePosition("stop_above"), "'stop_above' in " + fill.context() + " ("
                        + stop.get() + ") must be above 'start_below' (" + start.get() + "): the valve would "
                        + "open and close at once");
                stop = Optional.empty();
            }
            Optional<List<String>> blockedBy = fill.ids("blocked_by", false, "a list of alarm (rule) ids");
            Optional<Priority> priority = fill.word("priority", true, PRIORITIES, "priority")
                    .map(word -> Priority.valueOf(word.toUpperCase(Locale.ROOT)));
            Optional<String> message = fill.text("message", true);
            if (id.isEmpty() || channel.isEmpty() || valve.isEmpty() || start.isEmpty() || stop.isEmpty()
                    || openValue.isEmpty() || maxOpen.isEmpty() || minRise.isEmpty() || riseWindow.isEmpty()
                    || (blockedBy.isEmpty() && fill.has("blocked_by")) || priority.isEmpty() || message.isEmpty()) {
                return;
            }
            FillDef def = new FillDef(id.get(), channel.get(), valve.get(), start.get(), stop.get(), openValue.get(),
                    maxOpen.get(), minRise.get(), riseWindow.get(), blockedBy.orElse(List.of()),
                    AlarmOptions.simple(priority.get(), message.get()), fill.position());
            fills.add(def);
            sources.putAll(def, fill.positions());
        }

        private Optional<FloodDef> flood(ConfigNode.Mapping node) {
            Optional<Fields> opened = Fields.open(node, "'alarm_flood'", FLOOD_KEYS, problems);
            if (opened.isEmpty()) {
                return Optional.empty();
            }
            Fields flood = opened.get();
            flood.rejectUnknownKeys();
            Optional<Integer> moreThan = flood.has("more_than") ? flood.count("more_than", false, 1)
                    : Optional.of(FloodDef.DEFAULT.moreThan());
            Optional<Duration> within = flood.has("within") ? positive(flood, "within", false)
                    : Optional.of(FloodDef.DEFAULT.within());
            Optional<Integer> endsBelow = flood.has("ends_below") ? flood.count("ends_below", false, 1)
                    : Optional.of(Math.min(FloodDef.DEFAULT.endsBelow(), moreThan.orElse(1)));
            if (moreThan.isEmpty() || within.isEmpty() || endsBelow.isEmpty()) {
                return Optional.empty();
            }
            if (endsBelow.get() > moreThan.get()) {
                problems.add(flood.valuePosition("ends_below"), "'ends_below' in 'alarm_flood' (" + endsBelow.get()
                        + ") must not be more than 'more_than' (" + moreThan.get() + ")");
                return Optional.empty();
            }
            return Optional.of(new FloodDef(moreThan.get(), within.get(), endsBelow.get()));
        }

        /** Exactly one of two keys, the first meaning HIGH (above, rising), the second LOW (below, falling). */
        private Optional<Direction> direction(Fields fields, String high, String low) {
            boolean hasHigh = fields.has(high);
            boolean hasLow = fields.has(low);
            if (hasHigh && hasLow) {
                problems.add(fields.keyPosition(low), fields.context() + " has both '" + high + "' and '" + low
                        + "': give exactly one, and write a second rule for the other side");
                return Optional.empty();
            }
            if (!hasHigh && !hasLow) {
                problems.add(fields.position(), fields.context() + " needs '" + high + "' or '" + low + "', found "
                        + "neither");
                return Optional.empty();
            }
            return Optional.of(hasHigh ? Direction.HIGH : Direction.LOW);
        }

        /** The deadband, in the setpoint's unit when omitted; same kind as the setpoint and not negative. */
        private Optional<Quantity> deadband(Fields fields, Optional<Quantity> setpoint) {
            if (!fields.has("deadband")) {
                return setpoint.map(s -> Quantity.of(0, s.unit()));
            }
            Optional<Quantity> deadband = fields.quantityOrPlain("deadband", false);
            if (deadband.isEmpty()) {
                return Optional.empty();
            }
            SourcePosition at = fields.valuePosition("deadband");
            if (deadband.get().value() < 0) {
                problems.add(at, "'deadband' in " + fields.context() + " cannot be negative, found '" + deadband.get()
                        + "'");
                return Optional.empty();
            }
            if (setpoint.isPresent() && !deadband.get().unit().isCompatibleWith(setpoint.get().unit())) {
                problems.add(at, "unit mismatch: 'deadband' in " + fields.context() + " is " + deadband.get() + ", "
                        + deadband.get().unit().dimension().expected() + ", but the setpoint is " + setpoint.get()
                        + ", " + setpoint.get().unit().dimension().expected());
                return Optional.empty();
            }
            return deadband;
        }

        /** MooN, e.g. 2oo3: M of N channels must be past the setpoint; N must match the channels listed. */
        private Optional<Integer> voting(Fields vote, Optional<List<String>> channels) {
            Optional<String> text = vote.text("voting", true);
            if (text.isEmpty()) {
                return Optional.empty();
            }
            SourcePosition at = vote.valuePosition("voting");
            Matcher matcher = VOTING.matcher(text.get().strip());
            if (!matcher.matches()) {
                problems.add(at, "'voting' in " + vote.context() + " must be MooN such as 2oo3 (M of N channels "
                        + "past the setpoint), found '" + text.get() + "'");
                return Optional.empty();
            }
            int m = Integer.parseInt(matcher.group(1));
            int n = Integer.parseInt(matcher.group(2));
            String voting = m + "oo" + n;
            if (n < 2) {
                problems.add(at, "voting " + voting + " in " + vote.context() + " is not a vote: a vote needs at "
                        + "least 2 channels (use a limit rule for a single channel)");
                return Optional.empty();
            }
            if (m < 1 || m > n) {
                problems.add(at, "voting " + voting + " in " + vote.context() + " is impossible: M must be between 1 "
                        + "and N (" + n + ")");
                return Optional.empty();
            }
            if (channels.isPresent() && channels.get().size() != n) {
                problems.add(at, "voting " + voting + " in " + vote.context() + " needs " + n + " channels, found "
                        + channels.get().size() + " in 'channels' (a " + voting + " over " + channels.get().size()
                        + " channels)");
                return Optional.empty();
            }
            return Optional.of(m);
        }

        private Optional<RateSpec> rateSpec(Fields rate, String key) {
            Optional<ConfigNode.Scalar> scalar = rate.scalar(key, true, "a rate such as 3 %/h or 5 kPa/min");
            if (scalar.isEmpty()) {
                return Optional.empty();
            }
            String text = scalar.get().text().strip();
            String where = "'" + key + "' in " + rate.context();
            int slash = text.lastIndexOf('/');
            Matcher base = TIME_BASE.matcher(slash < 0 ? "" : text.substring(slash + 1).strip());
            if (slash < 0 || !base.matches()) {
                problems.add(scalar.get().position(), where + " must be a rate such as 3 %/h or 5 kPa/min (a change "
                        + "per ms, s, min, h or d), found '" + text + "'");
                return Optional.empty();
            }
            ConfigNode.Scalar change = new ConfigNode.Scalar(text.substring(0, slash), false, scalar.get().position());
            Optional<Quantity> quantity = Fields.quantity(change, where, problems);
            if (quantity.isEmpty()) {
                return Optional.empty();
            }
            if (!(quantity.get().value() > 0)) {
                problems.add(scalar.get().position(), where + " must be more than zero, found '" + text
                        + "' (the key says rising or falling)");
                return Optional.empty();
            }
            Duration per = DurationSyntax.parse((base.group(1) == null ? "1" : base.group(1)) + base.group(2));
            if (per.isZero()) {
                problems.add(scalar.get().position(), where + " has a time base of zero in '" + text + "'");
                return Optional.empty();
            }
            return Optional.of(new RateSpec(quantity.get(), per));
        }

        private void unique(Map<String, SourcePosition> ids, String id, SourcePosition at, String what) {
            SourcePosition earlier = ids.putIfAbsent(id, at);
            if (earlier != null) {
                problems.add(at, CrossFileValidator.duplicate(what, id, earlier));
            }
        }

        private void interlock(ConfigNode node) {
            Optional<Fields> opened = Fields.open(node, "an interlock", INTERLOCK_KEYS, problems);
            if (opened.isEmpty()) {
                return;
            }
            Fields interlock = opened.get();
            Optional<String> id = interlock.id("id", true);
            id.ifPresent(value -> interlock.describeAs("interlock '" + value + "'"));
            interlock.rejectUnknownKeys();
            id.ifPresent(value -> unique(interlockIds, value, interlock.valuePosition("id"), "interlock"));
            String description = interlock.text("description", false).orElse("");
            List<OutputAction> actions = new ArrayList<>();
            List<SourcePosition> actionPositions = new ArrayList<>();
            boolean complete = true;
            Optional<ConfigNode.Sequence> list = interlock.list("actions", true, "a list of {output, value} actions");
            if (list.isPresent()) {
                if (list.get().items().isEmpty()) {
                    problems.add(list.get().position(), "'actions' in " + interlock.context() + " is empty: an "
                            + "interlock needs at least one action");
                    complete = false;
                }
                for (ConfigNode item : list.get().items()) {
                    Optional<Fields> action = Fields.open(item, "an action of " + interlock.context(), ACTION_KEYS,
                            problems);
                    if (action.isEmpty()) {
                        complete = false;
                        continue;
                    }
                    action.get().rejectUnknownKeys();
                    Optional<String> output = action.get().id("output", true);
                    Optional<Double> value = action.get().number("value", true);
                    if (output.isPresent() && value.isPresent()) {
                        actions.add(new OutputAction(output.get(), value.get()));
                        actionPositions.add(action.get().valuePosition("output"));
                    } else {
                        complete = false;
                    }
                }
            }
            if (id.isEmpty() || list.isEmpty() || !complete) {
                return;
            }
            InterlockDef def = new InterlockDef(id.get(), description, actions, interlock.position());
            interlocks.add(def);
            for (int i = 0; i < actions.size(); i++) {
                sources.put(def, "actions[" + i + "].output", actionPositions.get(i));
            }
        }
    }

    /**
     * Merges what the files yielded: rules, interlocks and fills in file order, and the one alarm-flood criterion
     * (the default unless a file states one; two files stating it is a problem at the second).
     */
    static RuleSet merge(List<RuleFile> files, Problems problems) {
        List<RuleDef> rules = new ArrayList<>();
        List<InterlockDef> interlocks = new ArrayList<>();
        List<FillDef> fills = new ArrayList<>();
        FloodDef flood = FloodDef.DEFAULT;
        SourcePosition floodAt = null;
        for (RuleFile file : files) {
            rules.addAll(file.rules());
            interlocks.addAll(file.interlocks());
            fills.addAll(file.fills());
            if (file.floodPosition().isPresent()) {
                if (floodAt != null) {
                    problems.add(file.floodPosition().get(), "'alarm_flood' is already stated at " + floodAt
                            + ": the flood criterion is one for the whole site; state it once");
                } else {
                    floodAt = file.floodPosition().get();
                    flood = file.flood().orElse(FloodDef.DEFAULT);
                }
            }
        }
        return new RuleSet(rules, interlocks, fills, flood);
    }

    private static List<String> keysOf(String type) {
        return switch (type) {
            case "limit" -> LIMIT_KEYS;
            case "rate" -> RATE_KEYS;
            case "stale" -> STALE_KEYS;
            case "vote" -> VOTE_KEYS;
            case "forecast" -> FORECAST_KEYS;
            default -> DEVIATION_KEYS;
        };
    }

    /** A rate as written: {@code change} per {@code per}. */
    private record RateSpec(Quantity change, Duration per) {
    }
}
