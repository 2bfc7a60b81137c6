package org.cryowarden.rules.config;

import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.Dimension;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.PressureReference;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.engine.DerivedFunctions;
import org.cryowarden.rules.model.BusDef;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.OutputDef;
import org.cryowarden.rules.model.PointDef;
import org.cryowarden.rules.model.SiteDef;
import org.cryowarden.rules.model.TransportDef;
import org.cryowarden.rules.model.ValueRange;

/**
 * Reads a site file ({@code *-site.yaml}: the lab, its buses, instruments, channels, outputs and derived
 * channels) into a {@link SiteDef}, checking everything the file can check on its own. References from rule
 * files are checked by {@link CrossFileValidator}; driver-specific settings by a {@link DriverSettingsValidator}.
 * The schema is documented in {@code config-examples/README.md}.
 */
public final class SiteLoader {

    static final List<String> TOP_KEYS = List.of("site", "buses", "derived", "mqtt", "journal", "api", "notifiers",
            "watchdog", "common_alarm", "operators", "polling");
    static final List<String> SECTIONS = List.of("mqtt", "journal", "api", "notifiers", "watchdog",
            "common_alarm", "operators", "polling");
    static final List<String> SITE_KEYS = List.of("name", "ambient_pressure", "time_zone");
    static final List<String> BUS_KEYS = List.of("id", "transport", "instruments");
    static final List<String> TRANSPORT_KINDS = List.of("serial", "tcp");
    static final List<String> INSTRUMENT_KEYS = List.of("id", "driver", "settings", "channels", "outputs");
    static final List<String> CHANNEL_KEYS =
            List.of("id", "unit", "description", "period", "stale_after", "valid_range", "point");
    static final List<String> OUTPUT_KEYS = List.of("id", "description", "safe_value", "point");
    static final List<String> DERIVED_KEYS = List.of("id", "function", "inputs", "unit", "description", "parameters");

    /** Poll period of a channel that states none. */
    static final Duration DEFAULT_PERIOD = Duration.ofSeconds(1);
    /** Stale timeout of a channel that states none, as a multiple of its period. */
    static final int DEFAULT_STALE_PERIODS = 3;

    private SiteLoader() {
    }

    /**
     * Loads and checks one site file on its own, accepting every driver setting.
     *
     * @throws ConfigException with every problem found
     */
    public static SiteDef load(Path file) throws ConfigException {
        return load(file, DriverSettingsValidator.acceptAll());
    }

    /**
     * Loads and checks one site file, letting {@code drivers} check the driver-specific settings.
     *
     * @throws ConfigException with every problem found
     */
    public static SiteDef load(Path file, DriverSettingsValidator drivers) throws ConfigException {
        Problems problems = new Problems();
        SiteFile site = read(file, problems, drivers);
        problems.throwIfAny();
        return site.site().orElseThrow();
    }

    /** Reads a site file, adding every problem to {@code problems}; never throws for bad input. */
    static SiteFile read(Path file, Problems problems, DriverSettingsValidator drivers) {
        ConfigNode root;
        try {
            root = YamlReader.read(file);
        } catch (ConfigException e) {
            problems.addAll(e.problems());
            return SiteFile.unreadable(file.toString());
        }
        SiteFile site = new Reader(problems).read(root, file.toString());
        site.site().ifPresent(def -> problems.addAll(drivers.validate(def)));
        return site;
    }

    /** The engine's catalogue: the loader refuses what the engine could not bind, with positions. */
    private static final DerivedFunctions FUNCTIONS = DerivedFunctions.builtIn();

    /** The state of reading one file. */
    private static final class Reader {
        private final Problems problems;
        private final SourceMap sources = new SourceMap();
        private final Map<String, SourcePosition> busIds = new LinkedHashMap<>();
        private final Map<String, SourcePosition> instrumentIds = new LinkedHashMap<>();
        /** Measured channels, derived channels and outputs share one namespace. */
        private final Map<String, SourcePosition> signalIds = new LinkedHashMap<>();
        private final Map<String, SourcePosition> channelIds = new LinkedHashMap<>();
        private final Map<String, SourcePosition> outputIds = new LinkedHashMap<>();
        private final List<ChannelDef> channels = new ArrayList<>();
        private final List<OutputDef> outputs = new ArrayList<>();
        private final List<DerivedChannelDef> derived = new ArrayList<>();

        Reader(Problems problems) {
            this.problems = problems;
        }

        SiteFile read(ConfigNode root, String label) {
            Optional<Fields> top = Fields.open(root, "a site file", TOP_KEYS, problems);
            if (top.isEmpty()) {
                return SiteFile.unreadable(label);
            }
            Fields file = top.get();
            file.rejectUnknownKeys();
            String name = "";
            double ambient = Quantity.STANDARD_ATMOSPHERE_PA;
            Optional<java.time.ZoneId> zone = Optional.empty();
            Optional<ConfigNode> siteNode = file.node("site", true);
            if (siteNode.isPresent()) {
                Optional<Fields> site = Fields.open(siteNode.get(), "the 'site' section", SITE_KEYS, problems);
                if (site.isPresent()) {
                    site.get().rejectUnknownKeys();
                    name = site.get().text("name", true).orElse("");
                    ambient = ambientPressure(site.get()).orElse(ambient);
                    zone = site.get().zone("time_zone", false);
                }
            }
            List<BusDef> buses = new ArrayList<>();
            file.list("buses", true, "a list of buses").ifPresent(list -> {
                for (ConfigNode item : list.items()) {
                    bus(item).ifPresent(buses::add);
                }
            });
            file.list("derived", false, "a list of derived channels").ifPresent(list -> {
                for (ConfigNode item : list.items()) {
                    derived(item);
                }
            });
            for (DerivedChannelDef def : derived) {
                checkDerivedInputs(def);
            }
            Map<String, ConfigNode.Mapping> sections = new LinkedHashMap<>();
            for (String section : SECTIONS) {
                file.mapping(section, false, "a mapping (its keys are described by the issue that uses it)")
                        .ifPresent(mapping -> sections.put(section, mapping));
            }
            SiteDef site = new SiteDef(name, ambient, buses, channels, derived, outputs, sections, zone,
                    root.position());
            return new SiteFile(Optional.of(site), label, channelIds, outputIds, sources);
        }

        private Optional<Double> ambientPressure(Fields site) {
            Optional<Quantity> quantity = site.quantity("ambient_pressure", false);
            if (quantity.isEmpty()) {
                return Optional.empty();
            }
            SourcePosition at = site.valuePosition("ambient_pressure");
            Unit unit = quantity.get().unit();
            if (unit.dimension() != Dimension.PRESSURE) {
                problems.add(at, "'ambient_pressure' in the 'site' section must be " + Dimension.PRESSURE.expected()
                        + ", found '" + quantity.get() + "' which is " + unit.dimension().expected());
                return Optional.empty();
            }
            if (unit.pressureReference() == PressureReference.GAUGE) {
                problems.add(at, "'ambient_pressure' in the 'site' section must be an absolute pressure, found the "
                        + "gauge pressure '" + quantity.get() + "'; write e.g. 101.325 kPa");
                return Optional.empty();
            }
            double pascal = quantity.get().in(Unit.PASCAL);
            if (pascal < 50_000 || pascal > 110_000) {
                problems.add(at, "'ambient_pressure' in the 'site' section must be between 50 kPa and 110 kPa "
                        + "(sea level to about 5,500 m), found '" + quantity.get() + "'");
                return Optional.empty();
            }
            return Optional.of(pascal);
        }

        private Optional<BusDef> bus(ConfigNode node) {
            Optional<Fields> opened = Fields.open(node, "a bus", BUS_KEYS, problems);
            if (opened.isEmpty()) {
                return Optional.empty();
            }
            Fields bus = opened.get();
            Optional<String> id = bus.id("id", true);
            id.ifPresent(value -> bus.describeAs("bus '" + value + "'"));
            bus.rejectUnknownKeys();
            id.ifPresent(value -> unique(busIds, value, bus.valuePosition("id"), "bus"));
            Optional<TransportDef> transport = bus.mapping("transport", true, "a mapping with a 'kind'")
                    .flatMap(mapping -> transport(mapping, bus.context()));
            List<InstrumentDef> instruments = new ArrayList<>();
            boolean complete = true;
            Optional<ConfigNode.Sequence> list = bus.list("instruments", true, "a list of instruments");
            if (list.isPresent()) {
                for (ConfigNode item : list.get().items()) {
                    Optional<InstrumentDef> instrument = instrument(item);
                    instrument.ifPresent(instruments::add);
                    complete &= instrument.isPresent();
                }
            }
            if (id.isEmpty() || transport.isEmpty() || list.isEmpty() || !complete) {
                return Optional.empty();
            }
            return Optional.of(new BusDef(id.get(), transport.get(), instruments, bus.position()));
        }

        private Optional<TransportDef> transport(ConfigNode.Mapping mapping, String bus) {
            // Only 'kind' is ours; every other key belongs to the transport and is checked by the drivers module.
            Fields transport = Fields.open(mapping, "the transport of " + bus, List.of("kind"), problems).orElseThrow();
            Optional<String> kind = transport.word("kind", true, TRANSPORT_KINDS, "transport kind");
            List<ConfigNode.Entry> settings = new ArrayList<>();
            for (ConfigNode.Entry entry : mapping.entries()) {
                if (!entry.key().equals("kind")) {
                    settings.add(entry);
                }
            }
            return kind.map(value -> new TransportDef(value, new ConfigNode.Mapping(settings, mapping.position()),
                    mapping.position()));
        }

        private Optional<InstrumentDef> instrument(ConfigNode node) {
            Optional<Fields> opened = Fields.open(node, "an instrument", INSTRUMENT_KEYS, problems);
            if (opened.isEmpty()) {
                return Optional.empty();
            }
            Fields instrument = opened.get();
            Optional<String> id = instrument.id("id", true);
            id.ifPresent(value -> instrument.describeAs("instrument '" + value + "'"));
            instrument.rejectUnknownKeys();
            id.ifPresent(value -> unique(instrumentIds, value, instrument.valuePosition("id"), "instrument"));
            Optional<String> driver = instrument.id("driver", true);
            ConfigNode.Mapping settings = instrument.mapping("settings", false, "a mapping of driver settings")
                    .orElse(new ConfigNode.Mapping(List.of(), instrument.position()));
            List<PointDef> points = new ArrayList<>();
            boolean complete = true;
            Optional<ConfigNode.Sequence> channelList = instrument.list("channels", false, "a list of channels");
            if (channelList.isPresent()) {
                for (ConfigNode item : channelList.get().items()) {
                    Optional<PointDef> point = channel(item);
                    point.ifPresent(points::add);
                    complete &= point.isPresent();
                }
            }
            Optional<ConfigNode.Sequence> outputList = instrument.list("outputs", false, "a list of outputs");
            if (outputList.isPresent()) {
                for (ConfigNode item : outputList.get().items()) {
                    Optional<PointDef> point = output(item);
                    point.ifPresent(points::add);
                    complete &= point.isPresent();
                }
            }
            if (!instrument.has("channels") && !instrument.has("outputs")) {
                problems.add(instrument.position(), instrument.context() + " has neither 'channels' nor 'outputs'");
                complete = false;
            }
            if (id.isEmpty() || driver.isEmpty() || !complete) {
                return Optional.empty();
            }
            return Optional.of(new InstrumentDef(id.get(), driver.get(), settings, points, instrument.position()));
        }

        private Optional<PointDef> channel(ConfigNode node) {
            Optional<Fields> opened = Fields.open(node, "a channel", CHANNEL_KEYS, problems);
            if (opened.isEmpty()) {
                return Optional.empty();
            }
            Fields channel = opened.get();
            Optional<String> id = channel.id("id", true);
            id.ifPresent(value -> channel.describeAs("channel '" + value + "'"));
            channel.rejectUnknownKeys();
            id.ifPresent(value -> {
                unique(signalIds, value, channel.valuePosition("id"), "channel");
                channelIds.putIfAbsent(value, channel.valuePosition("id"));
            });
            Optional<Unit> unit = unit(channel, "unit");
            String description = channel.text("description", false).orElse("");
            Optional<Duration> period = positive(channel, "period");
            Optional<Duration> staleAfter = positive(channel, "stale_after");
            Optional<ValueRange> range = unit.isPresent() ? validRange(channel, unit.get()) : Optional.empty();
            Optional<ConfigNode.Mapping> point = channel.mapping("point", true, "a mapping of driver point settings");
            boolean periodOk = period.isPresent() || !channel.has("period");
            boolean staleOk = staleAfter.isPresent() || !channel.has("stale_after");
            boolean rangeOk = range.isPresent() || !channel.has("valid_range");
            Duration effectivePeriod = period.orElse(DEFAULT_PERIOD);
            Duration effectiveStale = staleAfter.orElse(effectivePeriod.multipliedBy(DEFAULT_STALE_PERIODS));
            if (staleAfter.isPresent() && periodOk && effectiveStale.compareTo(effectivePeriod) <= 0) {
                problems.add(channel.valuePosition("stale_after"), staleMessage(effectiveStale, effectivePeriod,
                        id.map(v -> "channel '" + v + "'").orElse("the channel"), "is polled every"));
                staleOk = false;
            }
            if (id.isEmpty() || unit.isEmpty() || point.isEmpty() || !periodOk || !staleOk || !rangeOk) {
                return Optional.empty();
            }
            ChannelDef def = new ChannelDef(id.get(), unit.get(), description, effectivePeriod, effectiveStale,
                    range, channel.position());
            channels.add(def);
            sources.putAll(def, channel.positions());
            return Optional.of(new PointDef(id.get(), false, point.get(), point.get().position()));
        }

        private Optional<PointDef> output(ConfigNode node) {
            Optional<Fields> opened = Fields.open(node, "an output", OUTPUT_KEYS, problems);
            if (opened.isEmpty()) {
                return Optional.empty();
            }
            Fields output = opened.get();
            Optional<String> id = output.id("id", true);
            id.ifPresent(value -> output.describeAs("output '" + value + "'"));
            output.rejectUnknownKeys();
            id.ifPresent(value -> {
                unique(signalIds, value, output.valuePosition("id"), "output");
                outputIds.putIfAbsent(value, output.valuePosition("id"));
            });
            String description = output.text("description", false).orElse("");
            Optional<Double> safeValue = output.number("safe_value", true);
            Optional<ConfigNode.Mapping> point = output.mapping("point", true, "a mapping of driver point settings");
            if (id.isEmpty() || safeValue.isEmpty() || point.isEmpty()) {
                return Optional.empty();
            }
            OutputDef def = new OutputDef(id.get(), description, safeValue.get(), output.position());
            outputs.add(def);
            sources.putAll(def, output.positions());
            return Optional.of(new PointDef(id.get(), true, point.get(), point.get().position()));
        }

        private void derived(ConfigNode node) {
            Optional<Fields> opened = Fields.open(node, "a derived channel", DERIVED_KEYS, problems);
            if (opened.isEmpty()) {
                return;
            }
            Fields derivedChannel = opened.get();
            Optional<String> id = derivedChannel.id("id", true);
            id.ifPresent(value -> derivedChannel.describeAs("derived channel '" + value + "'"));
            derivedChannel.rejectUnknownKeys();
            id.ifPresent(value -> {
                unique(signalIds, value, derivedChannel.valuePosition("id"), "channel");
                channelIds.putIfAbsent(value, derivedChannel.valuePosition("id"));
            });
            Optional<DerivedFunctions.Entry> function = derivedChannel
                    .word("function", true, List.copyOf(FUNCTIONS.names()), "function")
                    .flatMap(FUNCTIONS::find);
            Optional<List<String>> inputs = derivedChannel.ids("inputs", true, "a list of channel ids");
            Optional<Unit> unit = unit(derivedChannel, "unit");
            String description = derivedChannel.text("description", false).orElse("");
            Map<String, Quantity> parameters = new LinkedHashMap<>();
            boolean parametersOk = true;
            Optional<ConfigNode.Mapping> parameterNode =
                    derivedChannel.mapping("parameters", false, "a mapping of named quantities");
            if (parameterNode.isPresent()) {
                for (ConfigNode.Entry entry : parameterNode.get().entries()) {
                    String where = "parameter '" + entry.key() + "' of " + derivedChannel.context();
                    if (entry.value() instanceof ConfigNode.Scalar scalar && !scalar.isNull()) {
                        Optional<Quantity> value = Fields.quantity(scalar, where, problems);
                        value.ifPresent(q -> parameters.put(entry.key(), q));
                        parametersOk &= value.isPresent();
                    } else {
                        problems.add(entry.value().position(), where + " must be a quantity with its unit, found "
                                + Fields.found(entry.value()));
                        parametersOk = false;
                    }
                }
            }
            if (function.isPresent() && inputs.isPresent()) {
                DerivedFunctions.Entry signature = function.get();
                int count = inputs.get().size();
                if (count < signature.minInputs() || count > signature.maxInputs()) {
                    String wanted = signature.minInputs() == signature.maxInputs()
                            ? "exactly " + signature.minInputs()
                            : "at least " + signature.minInputs();
                    problems.add(derivedChannel.valuePosition("inputs"), "function '" + signature.name() + "' of "
                            + derivedChannel.context() + " takes " + wanted + " inputs, found " + count);
                    inputs = Optional.empty();
                }
            }
            if (function.isPresent() && parametersOk) {
                parametersOk = checkParameters(function.get(), parameters, parameterNode, derivedChannel);
            }
            if (function.isPresent() && unit.isPresent() && function.get().outputUnit().isPresent()
                    && !function.get().outputUnit().get().isCompatibleWith(unit.get())) {
                Unit result = function.get().outputUnit().get();
                problems.add(derivedChannel.valuePosition("unit"), "function '" + function.get().name() + "' of "
                        + derivedChannel.context() + " gives " + result.dimension().expected() + ", found unit "
                        + unit.get().symbol() + " (" + unit.get().dimension().expected() + ")");
                unit = Optional.empty();
            }
            if (id.isEmpty() || function.isEmpty() || inputs.isEmpty() || unit.isEmpty() || !parametersOk) {
                return;
            }
            DerivedChannelDef def = new DerivedChannelDef(id.get(), function.get().name(), inputs.get(), unit.get(),
                    parameters, description, derivedChannel.position());
            derived.add(def);
            sources.putAll(def, derivedChannel.positions());
        }

        /** Every parameter the function needs, in a unit of the right kind, and no other. */
        private boolean checkParameters(DerivedFunctions.Entry function, Map<String, Quantity> given,
                Optional<ConfigNode.Mapping> node, Fields owner) {
            boolean ok = true;
            List<String> known = new ArrayList<>();
            for (DerivedFunctions.Parameter parameter : function.parameters()) {
                known.add(parameter.name());
                Quantity value = given.get(parameter.name());
                if (value == null) {
                    problems.add(node.map(ConfigNode::position).orElse(owner.position()), "function '"
                            + function.name() + "' of " + owner.context() + " needs the parameter '" + parameter.name()
                            + "' (" + parameter.unit().dimension().expected() + ")");
                    ok = false;
                } else if (!value.unit().isCompatibleWith(parameter.unit())) {
                    SourcePosition at = node.flatMap(n -> n.get(parameter.name())).map(ConfigNode::position)
                            .orElse(owner.position());
                    problems.add(at, "parameter '" + parameter.name() + "' of " + owner.context() + " must be "
                            + parameter.unit().dimension().expected() + ", found " + value);
                    ok = false;
                }
            }
            if (node.isPresent()) {
                for (ConfigNode.Entry entry : node.get().entries()) {
                    if (!known.contains(entry.key())) {
                        String hint = known.isEmpty() ? ": it takes no parameters"
                                : Suggestions.didYouMean(entry.key(), known);
                        problems.add(entry.keyPosition(), "function '" + function.name() + "' of " + owner.context()
                                + " has no parameter '" + entry.key() + "'" + hint);
                        ok = false;
                    }
                }
            }
            return ok;
        }

        /** Derived inputs name channels of this same file: check them here, with units and cycles. */
        private void checkDerivedInputs(DerivedChannelDef def) {
            Map<String, Unit> units = new LinkedHashMap<>();
            for (ChannelDef channel : channels) {
                units.put(channel.id(), channel.unit());
            }
            for (DerivedChannelDef other : derived) {
                units.put(other.id(), other.unit());
            }
            DerivedFunctions.Entry signature = FUNCTIONS.find(def.function()).orElseThrow();
            for (int i = 0; i < def.inputs().size(); i++) {
                String input = def.inputs().get(i);
                SourcePosition at = sources.get(def, "inputs[" + i + "]", def.position());
                if (input.equals(def.id())) {
                    problems.add(at, "derived channel '" + def.id() + "' cannot be an input of itself");
                } else if (!channelIds.containsKey(input)) {
                    String hint = outputIds.containsKey(input) ? ": '" + input + "' is an output, not a channel"
                            : ": no such channel in the site" + Suggestions.didYouMean(input, channelIds.keySet());
                    problems.add(at, "unknown channel '" + input + "' in the inputs of derived channel '" + def.id()
                            + "'" + hint);
                } else if (signature.inputUnits().isPresent() && units.containsKey(input)
                        && !units.get(input).isCompatibleWith(signature.inputUnits().get().get(i))) {
                    Unit inputUnit = units.get(input);
                    Unit wanted = signature.inputUnits().get().get(i);
                    problems.add(at, "unit mismatch: input '" + input + "' is in " + inputUnit.symbol() + ", "
                            + inputUnit.dimension().expected() + ", but function '" + def.function()
                            + "' needs " + wanted.dimension().expected() + " as input " + (i + 1));
                } else if (signature.inputUnits().isEmpty() && units.containsKey(input)
                        && !units.get(input).isCompatibleWith(def.unit())) {
                    Unit inputUnit = units.get(input);
                    problems.add(at, "unit mismatch: input '" + input + "' is in " + inputUnit.symbol() + ", "
                            + inputUnit.dimension().expected() + ", but derived channel '" + def.id() + "' is in "
                            + def.unit().symbol() + ", " + def.unit().dimension().expected() + "; function '"
                            + def.function() + "' needs inputs of the result's kind");
                }
            }
            if (dependsOn(def, def.id(), new ArrayList<>())) {
                problems.add(def.position(), "derived channel '" + def.id() + "' depends on itself through its inputs");
            }
        }

        private boolean dependsOn(DerivedChannelDef def, String target, List<String> visited) {
            for (String input : def.inputs()) {
                if (input.equals(def.id()) || visited.contains(input)) {
                    continue;
                }
                visited.add(input);
                for (DerivedChannelDef other : derived) {
                    if (other.id().equals(input) && (input.equals(target) || other.inputs().contains(target)
                            || dependsOn(other, target, visited))) {
                        return true;
                    }
                }
            }
            return false;
        }

        private Optional<Unit> unit(Fields fields, String key) {
            Optional<ConfigNode.Scalar> scalar = fields.scalar(key, true, "a unit such as K, kPa, bar(g) or %vol");
            if (scalar.isEmpty()) {
                return Optional.empty();
            }
            return Units.parse(scalar.get(), "'" + key + "' in " + fields.context(), problems);
        }

        private Optional<Duration> positive(Fields fields, String key) {
            Optional<Duration> duration = fields.duration(key, false);
            if (duration.isPresent() && (duration.get().isZero() || duration.get().isNegative())) {
                problems.add(fields.valuePosition(key), "'" + key + "' in " + fields.context()
                        + " must be longer than zero, found '" + DurationSyntax.format(duration.get()) + "'");
                return Optional.empty();
            }
            return duration;
        }

        private Optional<ValueRange> validRange(Fields channel, Unit unit) {
            Optional<ConfigNode.Sequence> list = channel.list("valid_range", false, "a list [low, high]");
            if (list.isEmpty()) {
                return Optional.empty();
            }
            List<ConfigNode> items = list.get().items();
            if (items.size() != 2) {
                problems.add(list.get().position(), "'valid_range' in " + channel.context() + " must be a list [low, "
                        + "high] of two values, found " + items.size() + " values");
                return Optional.empty();
            }
            Optional<Double> low = bound(items.get(0), unit, channel.context());
            Optional<Double> high = bound(items.get(1), unit, channel.context());
            if (low.isEmpty() || high.isEmpty()) {
                return Optional.empty();
            }
            if (!(low.get() < high.get())) {
                problems.add(list.get().position(), "'valid_range' in " + channel.context() + " must be [low, high] "
                        + "with low < high, found [" + Units.number(low.get()) + ", " + Units.number(high.get()) + "]");
                return Optional.empty();
            }
            return Optional.of(new ValueRange(low.get(), high.get()));
        }

        /** A bound of a valid range: a bare number in the channel's unit, or a quantity that converts into it. */
        private Optional<Double> bound(ConfigNode node, Unit unit, String context) {
            String where = "a bound of 'valid_range' in " + context;
            if (node instanceof ConfigNode.Scalar scalar && !scalar.isNull()
                    && !Units.isBareNumber(scalar.text())) {
                return Fields.quantity(scalar, where, problems).flatMap(q -> {
                    if (!q.unit().isCompatibleWith(unit)) {
                        problems.add(node.position(), "unit mismatch: " + where + " is " + q + ", "
                                + q.unit().dimension().expected() + ", but the channel is in " + unit.symbol() + ", "
                                + unit.dimension().expected());
                        return Optional.empty();
                    }
                    return Optional.of(q.in(unit));
                });
            }
            return Fields.number(node, where, problems);
        }

        private void unique(Map<String, SourcePosition> ids, String id, SourcePosition at, String what) {
            SourcePosition earlier = ids.putIfAbsent(id, at);
            if (earlier != null) {
                problems.add(at, "duplicate " + what + " id '" + id + "': already used at " + earlier);
            }
        }
    }

    /** The message for a stale timeout that is not longer than the poll period it guards. */
    static String staleMessage(Duration stale, Duration period, String subject, String verb) {
        String relation = stale.compareTo(period) < 0 ? " < " : " = ";
        return "stale timeout must be longer than the poll period (got " + DurationSyntax.format(stale) + relation
                + DurationSyntax.format(period) + "): " + subject + " " + verb + " " + DurationSyntax.format(period);
    }
}
