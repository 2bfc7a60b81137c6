package org.cryowarden.simulator.scenario;

import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalDouble;
import java.util.OptionalInt;
import java.util.TreeMap;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.cryowarden.drivers.analog.CurrentLoop;
import org.cryowarden.drivers.modbus.RegisterType;
import org.cryowarden.drivers.modbus.WordOrder;
import org.cryowarden.drivers.scpi.Identity;
import org.cryowarden.drivers.settings.SettingsReader;
import org.cryowarden.drivers.text.Terminator;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.NameMatch;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.config.YamlReader;
import org.cryowarden.rules.physics.CalibrationTable;
import org.cryowarden.rules.physics.Cryogen;
import org.cryowarden.rules.physics.PlatinumResistanceThermometer;
import org.cryowarden.rules.physics.SuperconductingLevelProbe;
import org.cryowarden.rules.physics.Ventilation;
import org.cryowarden.rules.physics.VerticalVessel;
import org.cryowarden.simulator.emulators.AnalogInput;
import org.cryowarden.simulator.emulators.AnalogInputModule;
import org.cryowarden.simulator.emulators.Fault;
import org.cryowarden.simulator.emulators.FaultKind;
import org.cryowarden.simulator.emulators.LevelMeter;
import org.cryowarden.simulator.emulators.OxygenMonitor;
import org.cryowarden.simulator.emulators.PortSpec;
import org.cryowarden.simulator.emulators.Protocol;
import org.cryowarden.simulator.emulators.RelayModule;
import org.cryowarden.simulator.emulators.StreamingDevice;
import org.cryowarden.simulator.emulators.TemperatureMonitor;
import org.cryowarden.simulator.model.Actuators;
import org.cryowarden.simulator.model.Destination;
import org.cryowarden.simulator.model.MagnetSpec;
import org.cryowarden.simulator.model.Plant;
import org.cryowarden.simulator.model.ReliefSpec;
import org.cryowarden.simulator.model.RoomSpec;
import org.cryowarden.simulator.model.StageSpec;
import org.cryowarden.simulator.model.Vessel;
import org.cryowarden.simulator.model.VentSpec;
import org.cryowarden.simulator.model.VesselSpec;
import org.cryowarden.simulator.sensors.CalibratedThermometer;
import org.cryowarden.simulator.sensors.DemoCalibrations;
import org.cryowarden.simulator.sensors.LevelProbe;
import org.cryowarden.simulator.sensors.OxygenCell;
import org.cryowarden.simulator.sensors.PlatinumThermometer;
import org.cryowarden.simulator.sensors.PressureTransducer;
import org.cryowarden.simulator.sensors.VacuumGauge;

/**
 * Reads a scenario file: the plant, sensors, ports with their instruments, and the timeline. Every problem is
 * reported with {@code FILE:LINE:COLUMN} (positions from {@link YamlReader}), all of them in one
 * {@link ConfigException}; references between sections (a vessel's room, a sensor's vessel, an input's sensor,
 * an event's target) are checked with a "did you mean". Stateless apart from one read.
 */
public final class ScenarioReader {

    private static final Pattern CLOCK = Pattern.compile("(\\d{1,3}):([0-5]\\d)(?::([0-5]\\d))?");
    /** Relief capacity is stated at this overpressure above set, the ASME VIII-1 UG-125 single-device limit. */
    private static final double RELIEF_OVERPRESSURE = 0.10;

    private final List<ConfigProblem> problems = new ArrayList<>();
    private final String source;
    private double ambient = Quantity.STANDARD_ATMOSPHERE_PA;
    private final Map<String, RoomSpec> rooms = new LinkedHashMap<>();
    private final Map<String, VesselSpec> vessels = new LinkedHashMap<>();
    private final Map<String, String> magnetVessel = new LinkedHashMap<>();
    private final Map<String, SensorDef> sensors = new LinkedHashMap<>();
    private final Map<String, InstrumentDef> instruments = new LinkedHashMap<>();
    private final Map<String, SourcePosition> ids = new LinkedHashMap<>();

    private ScenarioReader(String source) {
        this.source = source;
    }

    /** Reads a scenario file. */
    public static Scenario read(Path file) throws ConfigException {
        return new ScenarioReader(file.toString()).interpret(YamlReader.read(file));
    }

    /** Reads scenario text named {@code label} in messages. */
    public static Scenario read(String text, String label) throws ConfigException {
        return new ScenarioReader(label).interpret(YamlReader.read(text, label));
    }

    private Scenario interpret(ConfigNode root) throws ConfigException {
        if (!(root instanceof ConfigNode.Mapping top)) {
            throw new ConfigException(List.of(new ConfigProblem(root.position(),
                    "a scenario file must be a mapping with 'scenario', 'rooms', 'vessels', 'sensors', 'ports' and "
                            + "'timeline', got " + root.kind())));
        }
        SettingsReader file = new SettingsReader(top, "the scenario file");
        file.allowOnly("scenario", "rooms", "vessels", "sensors", "ports", "timeline");
        ConfigNode.Mapping header = file.mapping("scenario", true).orElse(new ConfigNode.Mapping(List.of(),
                top.position()));
        SettingsReader h = new SettingsReader(header, "'scenario'");
        h.allowOnly("name", "start", "duration", "step", "seed", "ambient_pressure");
        String name = h.text("name", true).orElse("");
        Instant start = h.text("start", false).flatMap(text -> instant(h, text)).orElse(Instant.parse(
                "2025-01-01T22:00:00Z"));
        Duration duration = h.duration("duration", Duration.ofMinutes(1), Duration.ofDays(7), false)
                .orElse(Duration.ofHours(8));
        Duration step = h.duration("step", Duration.ofMillis(10), Duration.ofMinutes(1), false)
                .orElse(Duration.ofSeconds(1));
        long seed = h.integer("seed", 0, Integer.MAX_VALUE, false).orElse(1);
        quantityIn(h, "ambient_pressure", Unit.PASCAL, false).ifPresent(p -> ambient = p);
        absorb(file, h);

        for (ConfigNode.Mapping item : items(file, "rooms", true)) {
            room(item);
        }
        for (ConfigNode.Mapping item : items(file, "vessels", false)) {
            vessel(item);
        }
        for (ConfigNode.Mapping item : items(file, "sensors", false)) {
            sensor(item);
        }
        List<PortSpec> ports = new ArrayList<>();
        for (ConfigNode.Mapping item : items(file, "ports", false)) {
            port(item).ifPresent(ports::add);
        }
        List<TimelineEvent> timeline = new ArrayList<>();
        List<ConfigNode.Mapping> entries = items(file, "timeline", false);
        for (int i = 0; i < entries.size(); i++) {
            timeline.addAll(event(entries.get(i), i + 1));
        }
        timeline.sort((a, b) -> a.at().compareTo(b.at()));
        problems.addAll(0, file.problems());
        if (!problems.isEmpty()) {
            problems.sort((a, b) -> a.position().line() != b.position().line()
                    ? Integer.compare(a.position().line(), b.position().line())
                    : Integer.compare(a.position().column(), b.position().column()));
            throw new ConfigException(problems);
        }
        return new Scenario(name, source, start, duration, step, seed, List.copyOf(rooms.values()),
                List.copyOf(vessels.values()), List.copyOf(sensors.values()), ports,
                List.copyOf(instruments.values()), timeline);
    }

    // ---- plant -------------------------------------------------------------------------------------------

    private void room(ConfigNode.Mapping item) {
        SettingsReader r = reader(item, "room");
        String what = "room '" + r.text("id", false).orElse("?") + "'";
        r = new SettingsReader(item, what);
        r.allowOnly("id", "volume", "ventilation", "ventilation_kind", "exhaust_fan", "temperature", "pressure",
                "description");
        Optional<String> id = id(r, "room");
        OptionalDouble volume = quantityIn(r, "volume", Unit.CUBIC_METRE, true);
        double ventilation = quantityIn(r, "ventilation", Unit.CUBIC_METRE_PER_SECOND, false).orElse(0);
        Ventilation kind = r.choice("ventilation_kind", Map.of("supply", Ventilation.SUPPLY, "exhaust",
                Ventilation.EXHAUST, "none", Ventilation.NONE), false).orElse(ventilation > 0 ? Ventilation.SUPPLY
                : Ventilation.NONE);
        double fan = quantityIn(r, "exhaust_fan", Unit.CUBIC_METRE_PER_SECOND, false).orElse(0);
        double temperature = quantityIn(r, "temperature", Unit.KELVIN, false).orElse(293.15);
        double pressure = quantityIn(r, "pressure", Unit.PASCAL, false).orElse(ambient);
        if (temperature < Cryogen.MIN_GAS_KELVIN || temperature > Cryogen.MAX_GAS_KELVIN) {
            r.problem(r.position("temperature"), "temperature in " + what + " must be between -50 °C and 60 °C");
            temperature = 293.15;
        }
        if (pressure < Cryogen.MIN_GAS_PASCAL || pressure > Cryogen.MAX_GAS_PASCAL) {
            r.problem(r.position("pressure"), "pressure in " + what + " must be between 50 kPa and 200 kPa absolute");
            pressure = ambient;
        }
        if (volume.isPresent() && !(volume.getAsDouble() > 0)) {
            r.problem(r.position("volume"), "volume in " + what + " must be positive");
        }
        absorb(r);
        if (id.isPresent() && volume.isPresent() && volume.getAsDouble() > 0) {
            rooms.put(id.get(), new RoomSpec(id.get(), volume.getAsDouble(), kind,
                    kind == Ventilation.NONE ? 0 : ventilation, fan, temperature, pressure));
        }
    }

    private void vessel(ConfigNode.Mapping item) {
        String what = "vessel '" + new SettingsReader(item, "vessel").text("id", false).orElse("?") + "'";
        SettingsReader r = new SettingsReader(item, what);
        r.allowOnly("id", "room", "fluid", "diameter", "straight_height", "bottom", "neck_volume", "liquid",
                "heat_load", "heater", "pressure", "vacuum", "vent", "relief_valve", "burst_disc", "magnets",
                "stages", "description");
        Optional<String> id = id(r, "vessel");
        Optional<RoomSpec> room = ref(r, "room", rooms, "room", true);
        Optional<Cryogen> fluid = r.choice("fluid", Map.of("helium", Cryogen.HELIUM, "nitrogen", Cryogen.NITROGEN),
                true);
        OptionalDouble diameter = quantityIn(r, "diameter", Unit.METRE, true);
        OptionalDouble straight = quantityIn(r, "straight_height", Unit.METRE, true);
        String bottom = r.choice("bottom", Map.of("flat", "flat", "hemispherical", "hemispherical",
                "torispherical", "torispherical"), false).orElse("torispherical");
        double liquid = quantityIn(r, "liquid", Unit.CUBIC_METRE, true).orElse(0);
        double heatLoad = quantityIn(r, "heat_load", Unit.WATT, true).orElse(0);
        double heater = quantityIn(r, "heater", Unit.WATT, false).orElse(0);
        double vacuum = quantityIn(r, "vacuum", Unit.MILLIBAR, false).orElse(1e-6);
        Optional<VerticalVessel> geometry = Optional.empty();
        if (diameter.isPresent() && straight.isPresent()) {
            try {
                geometry = Optional.of(switch (bottom) {
                    case "flat" -> VerticalVessel.flatBottom(diameter.getAsDouble(), straight.getAsDouble());
                    case "hemispherical" -> VerticalVessel.hemisphericalBottom(diameter.getAsDouble(),
                            straight.getAsDouble());
                    default -> VerticalVessel.asmeFlangedAndDishedBottom(diameter.getAsDouble(),
                            straight.getAsDouble());
                });
            } catch (IllegalArgumentException e) {
                r.problem(r.position("diameter"), "geometry of " + what + ": " + e.getMessage());
            }
        }
        double capacity = geometry.map(VerticalVessel::capacityCubicMetres).orElse(1.0);
        double neck = quantityIn(r, "neck_volume", Unit.CUBIC_METRE, false).orElse(0.1 * capacity);
        if (geometry.isPresent() && (liquid < 0 || liquid > capacity)) {
            r.problem(r.position("liquid"), "liquid in " + what + " must be between 0 L and the capacity "
                    + String.format(java.util.Locale.ROOT, "%.1f", capacity * 1000) + " L of the shell");
        }
        if (!(neck > 0)) {
            r.problem(r.position("neck_volume"), "neck_volume in " + what + " must be positive");
        }
        double roomPressure = room.map(RoomSpec::pressurePascal).orElse(ambient);
        double gasDensity = fluid.map(f -> f.gasDensityKgPerCubicMetre(293.15, Quantity.STANDARD_ATMOSPHERE_PA))
                .orElse(1.0);
        VentSpec vent = vent(r, what, gasDensity);
        Optional<ReliefSpec> relief = relief(r, "relief_valve", what, gasDensity, roomPressure, false);
        Optional<ReliefSpec> burst = relief(r, "burst_disc", what, gasDensity, roomPressure, true);
        double pressure = quantityIn(r, "pressure", Unit.PASCAL, false)
                .orElse(roomPressure + vent.crackingPascal());
        List<MagnetSpec> magnets = new ArrayList<>();
        for (ConfigNode.Mapping m : items(r, "magnets", false)) {
            SettingsReader mr = new SettingsReader(m, "a magnet of " + what);
            mr.allowOnly("id", "stored_energy", "quench_time", "peak_temperature", "recovery", "description");
            Optional<String> magnetId = id(mr, "magnet");
            double energy = quantityIn(mr, "stored_energy", Unit.JOULE, true).orElse(0);
            double quenchTime = seconds(mr, "quench_time").orElse(10);
            double peak = quantityIn(mr, "peak_temperature", Unit.KELVIN, false).orElse(40);
            double recovery = seconds(mr, "recovery").orElse(600);
            absorb(mr);
            magnetId.ifPresent(mid -> {
                magnets.add(new MagnetSpec(mid, energy, quenchTime, peak, recovery));
                id.ifPresent(vid -> magnetVessel.put(mid, vid));
            });
        }
        List<StageSpec> stages = new ArrayList<>();
        for (ConfigNode.Mapping s : items(r, "stages", false)) {
            SettingsReader sr = new SettingsReader(s, "a stage of " + what);
            sr.allowOnly("id", "temperature", "warmup", "description");
            Optional<String> stageId = sr.text("id", true);
            double temperature = quantityIn(sr, "temperature", Unit.KELVIN, true).orElse(80);
            double warmup = seconds(sr, "warmup").orElse(7200);
            absorb(sr);
            stageId.ifPresent(sid -> stages.add(new StageSpec(sid, temperature, warmup)));
        }
        absorb(r);
        if (id.isPresent() && room.isPresent() && fluid.isPresent() && geometry.isPresent() && neck > 0
                && liquid >= 0 && liquid <= capacity) {
            vessels.put(id.get(), new VesselSpec(id.get(), room.get().id(), fluid.get(), geometry.get(),
                    diameter.getAsDouble(), neck, liquid, heatLoad, heater, vent, relief, burst, magnets, stages,
                    vacuum, pressure));
        }
    }

    private VentSpec vent(SettingsReader vesselReader, String what, double gasDensity) {
        Optional<ConfigNode.Mapping> node = vesselReader.mapping("vent", false);
        if (node.isEmpty()) {
            return new VentSpec(Destination.RECOVERY, 1000, 2.0 / 3600 * gasDensity / 1000);
        }
        SettingsReader r = new SettingsReader(node.get(), "the vent of " + what);
        r.allowOnly("to", "check_valve", "capacity", "at");
        Destination to = destination(r, Destination.RECOVERY);
        double cracking = differenceIn(r, "check_valve", Unit.PASCAL).orElse(1000);
        double capacity = quantityIn(r, "capacity", Unit.CUBIC_METRE_PER_SECOND, false).orElse(2.0 / 3600);
        double at = differenceIn(r, "at", Unit.PASCAL).orElse(1000);
        if (!(at > 0)) {
            r.problem(r.position("at"), "at in the vent of " + what + " must be a positive pressure difference");
            at = 1000;
        }
        absorb(r);
        return new VentSpec(to, cracking, capacity * gasDensity / at);
    }

    private Optional<ReliefSpec> relief(SettingsReader vesselReader, String key, String what, double gasDensity,
            double roomPressure, boolean disc) {
        Optional<ConfigNode.Mapping> node = vesselReader.mapping(key, false);
        if (node.isEmpty()) {
            return Optional.empty();
        }
        String name = (disc ? "the burst disc of " : "the relief valve of ") + what;
        SettingsReader r = new SettingsReader(node.get(), name);
        r.allowOnly("set", "capacity", "to");
        OptionalDouble set = quantityIn(r, "set", Unit.PASCAL, true);
        OptionalDouble capacity = quantityIn(r, "capacity", Unit.CUBIC_METRE_PER_SECOND, true);
        Destination to = destination(r, Destination.ROOM);
        absorb(r);
        if (set.isEmpty() || capacity.isEmpty()) {
            return Optional.empty();
        }
        double gauge = set.getAsDouble() - roomPressure;
        if (!(gauge > 0)) {
            problems.add(new ConfigProblem(r.position("set"), "set in " + name + " must be above the room pressure"));
            return Optional.empty();
        }
        double drop = disc ? gauge : RELIEF_OVERPRESSURE * gauge;
        return Optional.of(new ReliefSpec(set.getAsDouble(), capacity.getAsDouble() * gasDensity / drop, to));
    }

    private Destination destination(SettingsReader r, Destination otherwise) {
        return r.choice("to", Map.of("recovery", Destination.RECOVERY, "room", Destination.ROOM), false)
                .orElse(otherwise);
    }

    // ---- sensors -----------------------------------------------------------------------------------------

    private void sensor(ConfigNode.Mapping item) {
        String what = "sensor '" + new SettingsReader(item, "sensor").text("id", false).orElse("?") + "'";
        SettingsReader r = new SettingsReader(item, what);
        Optional<String> id = id(r, "sensor");
        Optional<String> kind = r.choice("kind", Map.of("oxygen", "oxygen", "level", "level", "pressure",
                "pressure", "prt", "prt", "calibrated", "calibrated", "vacuum", "vacuum"), true);
        Optional<SensorDef.Factory> factory = Optional.empty();
        if (kind.isPresent()) {
            factory = switch (kind.get()) {
                case "oxygen" -> oxygenSensor(r);
                case "level" -> levelSensor(r);
                case "pressure" -> pressureSensor(r);
                case "prt" -> prtSensor(r, what);
                case "calibrated" -> calibratedSensor(r, what);
                default -> vacuumSensor(r);
            };
        }
        absorb(r);
        if (id.isPresent() && factory.isPresent()) {
            sensors.put(id.get(), new SensorDef(id.get(), kind.get(), item.position(), factory.get()));
        }
    }

    private Optional<SensorDef.Factory> oxygenSensor(SettingsReader r) {
        r.allowOnly("id", "kind", "room", "response_time", "noise", "description");
        Optional<RoomSpec> room = ref(r, "room", rooms, "room", true);
        double tau = seconds(r, "response_time").orElse(10);
        double noise = quantityIn(r, "noise", Unit.PERCENT_VOLUME, false).orElse(0.02);
        String id = r.text("id", false).orElse("");
        return room.map(spec -> (plant, seed) -> new OxygenCell(id, plant.room(spec.id()).orElseThrow(), tau, noise,
                seed));
    }

    private Optional<SensorDef.Factory> levelSensor(SettingsReader r) {
        r.allowOnly("id", "kind", "vessel", "active_length", "bottom_offset", "resistance", "noise", "description");
        Optional<VesselSpec> vessel = ref(r, "vessel", vessels, "vessel", true);
        OptionalDouble length = quantityIn(r, "active_length", Unit.METRE, true);
        double offset = quantityIn(r, "bottom_offset", Unit.METRE, false).orElse(0.02);
        double resistance = quantityIn(r, "resistance", Unit.OHM, false).orElse(40);
        double noise = quantityIn(r, "noise", Unit.PERCENT, false).orElse(0.05);
        String id = r.text("id", false).orElse("");
        if (vessel.isEmpty() || length.isEmpty()) {
            return Optional.empty();
        }
        SuperconductingLevelProbe probe;
        try {
            probe = new SuperconductingLevelProbe(resistance, length.getAsDouble(), offset);
        } catch (IllegalArgumentException e) {
            r.problem(r.position("active_length"), "probe of sensor '" + id + "': " + e.getMessage());
            return Optional.empty();
        }
        return Optional.of((plant, seed) -> new LevelProbe(id, vessel(plant, vessel.get()), probe, noise, seed));
    }

    private Optional<SensorDef.Factory> pressureSensor(SettingsReader r) {
        r.allowOnly("id", "kind", "vessel", "noise", "description");
        Optional<VesselSpec> vessel = ref(r, "vessel", vessels, "vessel", true);
        double noise = differenceIn(r, "noise", Unit.KILOPASCAL).orElse(0.05);
        String id = r.text("id", false).orElse("");
        return vessel.map(spec -> (plant, seed) -> new PressureTransducer(id, vessel(plant, spec), noise, seed));
    }

    private Optional<SensorDef.Factory> prtSensor(SettingsReader r, String what) {
        r.allowOnly("id", "kind", "vessel", "stage", "r0", "noise", "description");
        Optional<VesselSpec> vessel = ref(r, "vessel", vessels, "vessel", true);
        Optional<String> stage = r.text("stage", true);
        double r0 = quantityIn(r, "r0", Unit.OHM, false).orElse(100);
        double noise = quantityIn(r, "noise", Unit.OHM, false).orElse(0.005);
        String id = r.text("id", false).orElse("");
        if (vessel.isEmpty() || stage.isEmpty()) {
            return Optional.empty();
        }
        List<String> known = vessel.get().stages().stream().map(StageSpec::id).toList();
        if (!known.contains(stage.get())) {
            r.problem(r.position("stage"), "stage '" + stage.get() + "' of " + what + " is not a stage of vessel '"
                    + vessel.get().id() + "'" + hint(stage.get(), known));
            return Optional.empty();
        }
        PlatinumResistanceThermometer prt = new PlatinumResistanceThermometer(r0);
        return Optional.of((plant, seed) -> new PlatinumThermometer(id, vessel(plant, vessel.get()), stage.get(), prt,
                noise, seed));
    }

    private Optional<SensorDef.Factory> calibratedSensor(SettingsReader r, String what) {
        r.allowOnly("id", "kind", "vessel", "magnet", "calibration", "noise", "description");
        Optional<VesselSpec> vessel = ref(r, "vessel", vessels, "vessel", true);
        Optional<String> magnet = r.text("magnet", false);
        Optional<String> calibration = r.text("calibration", true);
        double noise = r.number("noise", false).orElse(0.0005);
        String id = r.text("id", false).orElse("");
        Optional<CalibrationTable> table = calibration.flatMap(DemoCalibrations::table);
        if (calibration.isPresent() && table.isEmpty()) {
            r.problem(r.position("calibration"), "calibration '" + calibration.get() + "' of " + what
                    + " is not a known table" + hint(calibration.get(), DemoCalibrations.names()));
        }
        if (vessel.isPresent() && magnet.isPresent()) {
            List<String> known = vessel.get().magnets().stream().map(MagnetSpec::id).toList();
            if (!known.contains(magnet.get())) {
                r.problem(r.position("magnet"), "magnet '" + magnet.get() + "' of " + what
                        + " is not a magnet of vessel '" + vessel.get().id() + "'" + hint(magnet.get(), known));
                return Optional.empty();
            }
        }
        if (vessel.isEmpty() || table.isEmpty()) {
            return Optional.empty();
        }
        return Optional.of((plant, seed) -> new CalibratedThermometer(id, vessel(plant, vessel.get()), magnet,
                table.get(), noise, seed));
    }

    private Optional<SensorDef.Factory> vacuumSensor(SettingsReader r) {
        r.allowOnly("id", "kind", "vessel", "noise", "description");
        Optional<VesselSpec> vessel = ref(r, "vessel", vessels, "vessel", true);
        double noise = r.number("noise", false).orElse(0.05);
        String id = r.text("id", false).orElse("");
        return vessel.map(spec -> (plant, seed) -> new VacuumGauge(id, vessel(plant, spec), noise, seed));
    }

    private static Vessel vessel(Plant plant, VesselSpec spec) {
        return plant.vessel(spec.id()).orElseThrow();
    }

    // ---- ports and instruments ---------------------------------------------------------------------------

    private Optional<PortSpec> port(ConfigNode.Mapping item) {
        String what = "port '" + new SettingsReader(item, "port").text("id", false).orElse("?") + "'";
        SettingsReader r = new SettingsReader(item, what);
        r.allowOnly("id", "tcp", "pty", "baud", "bits_per_byte", "pace", "instruments", "description");
        Optional<String> id = id(r, "port");
        int tcp = r.integer("tcp", 0, 65535, false).orElse(0);
        boolean pty = r.flag("pty", false).orElse(false);
        int baud = r.integer("baud", 300, 1_000_000, false).orElse(9600);
        int bits = r.integer("bits_per_byte", 7, 12, false).orElse(10);
        boolean pace = r.flag("pace", false).orElse(true);
        List<String> members = new ArrayList<>();
        Protocol protocol = null;
        for (ConfigNode.Mapping instrument : items(r, "instruments", true)) {
            Optional<InstrumentDef> def = instrument(instrument, id.orElse("?"));
            if (def.isPresent()) {
                if (protocol != null && def.get().protocol() != protocol) {
                    problems.add(new ConfigProblem(instrument.position(), "instrument '" + def.get().id() + "' speaks "
                            + label(def.get().protocol()) + " but " + what + " already carries " + label(protocol)
                            + "; one line carries one protocol"));
                    continue;
                }
                protocol = def.get().protocol();
                members.add(def.get().id());
            }
        }
        absorb(r);
        return id.map(portId -> new PortSpec(portId, tcp, pty, baud, bits, pace, members));
    }

    private static String label(Protocol protocol) {
        return switch (protocol) {
            case MODBUS_RTU -> "Modbus RTU";
            case SCPI -> "SCPI";
            case LINE -> "a line protocol";
        };
    }

    private Optional<InstrumentDef> instrument(ConfigNode.Mapping item, String portId) {
        String what = "instrument '" + new SettingsReader(item, "instrument").text("id", false).orElse("?") + "'";
        SettingsReader r = new SettingsReader(item, what);
        Optional<String> id = id(r, "instrument");
        Optional<String> kind = r.choice("kind", Map.of("analog-input-module", "analog-input-module",
                "oxygen-monitor", "oxygen-monitor", "relay-module", "relay-module", "level-meter", "level-meter",
                "temperature-monitor", "temperature-monitor", "streaming", "streaming"), true);
        Optional<InstrumentDef> result = Optional.empty();
        if (kind.isPresent() && id.isPresent()) {
            String iid = id.get();
            result = switch (kind.get()) {
                case "analog-input-module" -> analogModule(r, iid).map(f -> def(iid, kind.get(), Protocol.MODBUS_RTU,
                        portId, item, f));
                case "oxygen-monitor" -> oxygenMonitor(r, iid).map(f -> def(iid, kind.get(), Protocol.MODBUS_RTU,
                        portId, item, f));
                case "relay-module" -> relayModule(r, iid, what).map(f -> def(iid, kind.get(), Protocol.MODBUS_RTU,
                        portId, item, f));
                case "level-meter", "temperature-monitor" -> scpiInstrument(r, iid, kind.get()).map(f -> def(iid,
                        kind.get(), Protocol.SCPI, portId, item, f));
                default -> streaming(r, iid).map(f -> def(iid, kind.get(), Protocol.LINE, portId, item, f));
            };
        }
        absorb(r);
        result.ifPresent(def -> instruments.put(def.id(), def));
        return result;
    }

    private static InstrumentDef def(String id, String kind, Protocol protocol, String portId, ConfigNode.Mapping item,
            InstrumentDef.Factory factory) {
        return new InstrumentDef(id, kind, protocol, portId, item.position(), factory);
    }

    private Optional<InstrumentDef.Factory> analogModule(SettingsReader r, String id) {
        r.allowOnly("id", "kind", "unit", "inputs", "description");
        OptionalInt unit = r.integer("unit", 1, 247, true);
        List<AnalogInput> inputs = new ArrayList<>();
        for (ConfigNode.Mapping m : items(r, "inputs", true)) {
            SettingsReader ir = new SettingsReader(m, "an input of instrument '" + id + "'");
            ir.allowOnly("address", "sensor", "range", "type", "word_order", "scale", "description");
            OptionalInt address = ir.integer("address", 0, 65534, true);
            Optional<SensorDef> sensor = ref(ir, "sensor", sensors, "sensor", true);
            RegisterType type = ir.choice("type", choices(RegisterType.values()), false).orElse(RegisterType.UINT16);
            WordOrder order = ir.choice("word_order", Map.of("big", WordOrder.BIG, "little", WordOrder.LITTLE), false)
                    .orElse(WordOrder.BIG);
            double scale = ir.number("scale", false).orElse(type == RegisterType.FLOAT32 ? 1 : 0.001);
            Optional<CurrentLoop> loop = range(ir);
            absorb(ir);
            if (address.isPresent() && sensor.isPresent() && loop.isPresent() && scale > 0) {
                inputs.add(new AnalogInput(address.getAsInt(), sensor.get().id(), loop.get(), type, order, scale));
            }
        }
        if (unit.isEmpty()) {
            return Optional.empty();
        }
        return Optional.of((plant, seed) -> new AnalogInputModule(id, unit.getAsInt(), inputs, seed));
    }

    private static <E extends Enum<E>> Map<String, E> choices(E[] values) {
        Map<String, E> map = new TreeMap<>();
        for (E value : values) {
            map.put(value.name().toLowerCase(java.util.Locale.ROOT), value);
        }
        return map;
    }

    private Optional<CurrentLoop> range(SettingsReader r) {
        Optional<ConfigNode.Sequence> range = r.sequence("range", true);
        if (range.isEmpty()) {
            return Optional.empty();
        }
        if (range.get().items().size() != 2) {
            r.problem(range.get().position(), "range must be [value at 4 mA, value at 20 mA], got "
                    + range.get().items().size() + " values");
            return Optional.empty();
        }
        OptionalDouble low = r.number("range", range.get().items().get(0));
        OptionalDouble high = r.number("range", range.get().items().get(1));
        if (low.isEmpty() || high.isEmpty()) {
            return Optional.empty();
        }
        if (low.getAsDouble() == high.getAsDouble()) {
            r.problem(range.get().position(), "range needs two different ends");
            return Optional.empty();
        }
        return Optional.of(new CurrentLoop(low.getAsDouble(), high.getAsDouble()));
    }

    private Optional<InstrumentDef.Factory> oxygenMonitor(SettingsReader r, String id) {
        r.allowOnly("id", "kind", "unit", "sensor", "description");
        OptionalInt unit = r.integer("unit", 1, 247, true);
        Optional<SensorDef> sensor = ref(r, "sensor", sensors, "sensor", true);
        if (unit.isEmpty() || sensor.isEmpty()) {
            return Optional.empty();
        }
        return Optional.of((plant, seed) -> new OxygenMonitor(id, unit.getAsInt(), sensor.get().id(), seed));
    }

    private Optional<InstrumentDef.Factory> relayModule(SettingsReader r, String id, String what) {
        r.allowOnly("id", "kind", "unit", "coils", "discrete_inputs", "description");
        OptionalInt unit = r.integer("unit", 1, 247, true);
        List<RelayModule.Coil> coils = new ArrayList<>();
        Map<String, Double> fillRates = new LinkedHashMap<>();
        for (ConfigNode.Mapping m : items(r, "coils", true)) {
            SettingsReader cr = new SettingsReader(m, "a coil of " + what);
            cr.allowOnly("address", "action", "target", "initial", "rate", "description");
            OptionalInt address = cr.integer("address", 0, 2000, true);
            String action = cr.choice("action", Map.of("exhaust-fan", "exhaust-fan", "fill-valve", "fill-valve",
                    "heater", "heater", "none", "none"), false).orElse("none");
            Optional<String> key = actuator(cr, action);
            boolean initial = cr.choice("initial", Map.of("on", true, "off", false), false).orElse(false);
            if (action.equals("fill-valve") && key.isPresent()) {
                double rate = quantityIn(cr, "rate", Unit.CUBIC_METRE_PER_SECOND, true).orElse(0);
                fillRates.put(cr.text("target", false).orElse(""), rate);
            }
            absorb(cr);
            if (address.isPresent() && (action.equals("none") || key.isPresent())) {
                coils.add(new RelayModule.Coil(address.getAsInt(), key, initial));
            }
        }
        List<RelayModule.DiscreteInput> inputs = new ArrayList<>();
        for (ConfigNode.Mapping m : items(r, "discrete_inputs", false)) {
            SettingsReader dr = new SettingsReader(m, "a discrete input of " + what);
            dr.allowOnly("address", "source", "target", "value", "description");
            OptionalInt address = dr.integer("address", 0, 2000, true);
            String source = dr.choice("source", Map.of("exhaust-fan", "exhaust-fan", "fill-valve", "fill-valve",
                    "heater", "heater", "constant", "constant"), true).orElse("constant");
            Optional<String> key = source.equals("constant") ? Optional.empty() : actuator(dr, source);
            boolean value = dr.choice("value", Map.of("on", true, "off", false), false).orElse(false);
            absorb(dr);
            if (address.isPresent() && (source.equals("constant") || key.isPresent())) {
                inputs.add(new RelayModule.DiscreteInput(address.getAsInt(), key, value));
            }
        }
        if (unit.isEmpty()) {
            return Optional.empty();
        }
        return Optional.of((plant, seed) -> {
            fillRates.forEach((vessel, rate) -> plant.vessel(vessel).ifPresent(v -> v.setFillValveRate(
                    rate * v.spec().fluid().liquidDensityKgPerCubicMetre())));
            return new RelayModule(id, unit.getAsInt(), coils, inputs, plant.actuators(), seed);
        });
    }

    /** The actuator key of an action with its target (a room for a fan, a vessel for a valve or heater). */
    private Optional<String> actuator(SettingsReader r, String action) {
        if (action.equals("none")) {
            return Optional.empty();
        }
        if (action.equals("exhaust-fan")) {
            return ref(r, "target", rooms, "room", true).map(room -> Actuators.exhaustFan(room.id()));
        }
        Optional<VesselSpec> vessel = ref(r, "target", vessels, "vessel", true);
        return vessel.map(v -> action.equals("heater") ? Actuators.heater(v.id()) : Actuators.fillValve(v.id()));
    }

    private Optional<InstrumentDef.Factory> scpiInstrument(SettingsReader r, String id, String kind) {
        r.allowOnly("id", "kind", "identity", "terminator", "channels", "description");
        Terminator terminator = r.choice("terminator", Map.of("lf", Terminator.LF, "crlf", Terminator.CRLF), false)
                .orElse(Terminator.LF);
        String model = kind.equals("level-meter") ? "SIM-LEVEL-4" : "SIM-TEMP-8";
        Identity identity = r.text("identity", false).map(text -> {
            Optional<Identity> parsed = Identity.parse(text);
            if (parsed.isEmpty()) {
                r.problem(r.position("identity"), "identity of instrument '" + id + "' must have four comma-separated "
                        + "fields: manufacturer, model, serial number, firmware");
            }
            return parsed.orElse(null);
        }).orElse(new Identity("Cryowarden Simulator", model, id, "1.0"));
        Map<Integer, String> channels = new TreeMap<>();
        for (ConfigNode.Mapping m : items(r, "channels", true)) {
            SettingsReader cr = new SettingsReader(m, "a channel of instrument '" + id + "'");
            cr.allowOnly("channel", "sensor", "description");
            OptionalInt channel = cr.integer("channel", 1, 64, true);
            Optional<SensorDef> sensor = ref(cr, "sensor", sensors, "sensor", true);
            if (sensor.isPresent()) {
                boolean fits = kind.equals("level-meter") ? sensor.get().kind().equals("level")
                        : sensor.get().kind().equals("calibrated") || sensor.get().kind().equals("prt");
                if (!fits) {
                    cr.problem(cr.position("sensor"), "sensor '" + sensor.get().id() + "' is a " + sensor.get().kind()
                            + " sensor; a " + kind + " reads " + (kind.equals("level-meter") ? "level sensors"
                            : "prt or calibrated thermometers"));
                    sensor = Optional.empty();
                }
            }
            absorb(cr);
            if (channel.isPresent() && sensor.isPresent()) {
                channels.put(channel.getAsInt(), sensor.get().id());
            }
        }
        if (identity == null) {
            return Optional.empty();
        }
        Identity id2 = identity;
        return Optional.of((plant, seed) -> kind.equals("level-meter")
                ? new LevelMeter(id, id2, terminator, channels, seed)
                : new TemperatureMonitor(id, id2, terminator, channels, seed));
    }

    private Optional<InstrumentDef.Factory> streaming(SettingsReader r, String id) {
        r.allowOnly("id", "kind", "sensor", "prefix", "suffix", "period", "terminator", "description");
        Optional<SensorDef> sensor = ref(r, "sensor", sensors, "sensor", true);
        String prefix = r.text("prefix", false).orElse("");
        String suffix = r.text("suffix", false).orElse("");
        double period = seconds(r, "period").orElse(1);
        Terminator terminator = r.choice("terminator", Map.of("lf", Terminator.LF, "crlf", Terminator.CRLF), false)
                .orElse(Terminator.CRLF);
        return sensor.map(s -> (plant, seed) -> new StreamingDevice(id, s.id(), prefix, suffix, period, terminator,
                seed));
    }

    // ---- timeline ----------------------------------------------------------------------------------------

    private List<TimelineEvent> event(ConfigNode.Mapping item, int number) {
        String what = "timeline entry " + number;
        SettingsReader r = new SettingsReader(item, what);
        Optional<Duration> at = r.text("at", true).flatMap(text -> at(r, text, what));
        Optional<String> action = r.choice("do", Map.ofEntries(
                Map.entry("quench", "quench"), Map.entry("block-vent", "block-vent"),
                Map.entry("clear-vent", "clear-vent"), Map.entry("loss-of-vacuum", "loss-of-vacuum"),
                Map.entry("fill", "fill"), Map.entry("stop-fill", "stop-fill"), Map.entry("leak", "leak"),
                Map.entry("stop-leak", "stop-leak"), Map.entry("heat-load", "heat-load"), Map.entry("coil", "coil"),
                Map.entry("fault", "fault"), Map.entry("clear-fault", "clear-fault")), true);
        Optional<String> target = r.text("target", true);
        boolean standalone = r.choice("when", Map.of("standalone", true, "always", false), false).orElse(false);
        List<TimelineEvent> events = new ArrayList<>();
        if (action.isEmpty() || target.isEmpty()) {
            r.allowOnly("at", "do", "target", "when", "note", "energy", "duration", "heat_flux", "rise", "rate",
                    "until", "fraction", "power", "address", "value", "kind", "amount", "delay", "channel", "for");
            absorb(r);
            return events;
        }
        String t = target.get();
        Duration when = at.orElse(Duration.ZERO);
        SourcePosition position = item.position();
        switch (action.get()) {
            case "quench" -> {
                r.allowOnly("at", "do", "target", "when", "note", "energy", "duration");
                Optional<Double> energy = box(quantityIn(r, "energy", Unit.JOULE, false));
                Optional<Double> seconds = box(seconds(r, "duration"));
                if (checkTarget(r, t, magnetVessel.keySet(), "magnet", what)) {
                    String vessel = magnetVessel.get(t);
                    events.add(new TimelineEvent(when, "quench", t, standalone, position, c -> c.plant()
                            .vessel(vessel).orElseThrow().quench(t, c.now(), energy, seconds)));
                }
            }
            case "block-vent", "clear-vent" -> {
                r.allowOnly("at", "do", "target", "when", "note");
                boolean block = action.get().equals("block-vent");
                if (checkTarget(r, t, vessels.keySet(), "vessel", what)) {
                    events.add(new TimelineEvent(when, action.get(), t, standalone, position,
                            c -> c.plant().vessel(t).orElseThrow().setVentBlocked(block)));
                }
            }
            case "loss-of-vacuum" -> {
                r.allowOnly("at", "do", "target", "when", "note", "heat_flux", "rise");
                // 0.6 W/cm2 into liquid helium through multilayer insulation on loss of vacuum to air: from memory
                // (W. Lehmann and G. Zahn, Safety aspects for LHe cryostats and LHe transport containers, ICEC 7,
                // 1978, which gives about 3.8 W/cm2 for a bare surface).
                double flux = quantityIn(r, "heat_flux", Unit.WATT_PER_SQUARE_METRE, false).orElse(6000);
                double rise = seconds(r, "rise").orElse(30);
                if (checkTarget(r, t, vessels.keySet(), "vessel", what)) {
                    events.add(new TimelineEvent(when, "loss-of-vacuum", t, standalone, position,
                            c -> c.plant().vessel(t).orElseThrow().loseVacuum(c.now(), flux, rise)));
                }
            }
            case "fill" -> {
                r.allowOnly("at", "do", "target", "when", "note", "rate", "until");
                OptionalDouble rate = quantityIn(r, "rate", Unit.CUBIC_METRE_PER_SECOND, true);
                OptionalDouble until = quantityIn(r, "until", Unit.PERCENT, false);
                if (checkTarget(r, t, vessels.keySet(), "vessel", what) && rate.isPresent()) {
                    VesselSpec spec = vessels.get(t);
                    double density = spec.fluid().liquidDensityKgPerCubicMetre();
                    double untilKg = until.isPresent()
                            ? until.getAsDouble() / 100 * spec.geometry().capacityCubicMetres() * density
                            : Double.POSITIVE_INFINITY;
                    double kgPerSecond = rate.getAsDouble() * density;
                    events.add(new TimelineEvent(when, "fill", t, standalone, position,
                            c -> c.plant().vessel(t).orElseThrow().startFill(kgPerSecond, untilKg)));
                }
            }
            case "stop-fill" -> {
                r.allowOnly("at", "do", "target", "when", "note");
                if (checkTarget(r, t, vessels.keySet(), "vessel", what)) {
                    events.add(new TimelineEvent(when, "stop-fill", t, standalone, position,
                            c -> c.plant().vessel(t).orElseThrow().stopFill()));
                }
            }
            case "leak", "stop-leak" -> {
                r.allowOnly("at", "do", "target", "when", "note", "fraction");
                double fraction = action.get().equals("leak")
                        ? quantityIn(r, "fraction", Unit.PERCENT, true).orElse(0) / 100 : 0;
                if (fraction < 0 || fraction > 1) {
                    r.problem(r.position("fraction"), "fraction in " + what + " must be 0 % to 100 %");
                }
                if (checkTarget(r, t, vessels.keySet(), "vessel", what)) {
                    events.add(new TimelineEvent(when, action.get(), t, standalone, position,
                            c -> c.plant().vessel(t).orElseThrow().setLeakFraction(fraction)));
                }
            }
            case "heat-load" -> {
                r.allowOnly("at", "do", "target", "when", "note", "power");
                double power = quantityIn(r, "power", Unit.WATT, true).orElse(0);
                if (checkTarget(r, t, vessels.keySet(), "vessel", what)) {
                    events.add(new TimelineEvent(when, "heat-load", t, standalone, position,
                            c -> c.plant().vessel(t).orElseThrow().setExtraHeat(power)));
                }
            }
            case "coil" -> {
                r.allowOnly("at", "do", "target", "when", "note", "address", "value");
                OptionalInt address = r.integer("address", 0, 2000, true);
                Optional<Boolean> value = r.choice("value", Map.of("on", true, "off", false), true);
                if (checkTarget(r, t, instruments.keySet(), "instrument", what)) {
                    if (!instruments.get(t).kind().equals("relay-module")) {
                        r.problem(r.position("target"), "target '" + t + "' of " + what
                                + " is not a relay module; only relay modules have coils to set");
                    } else if (address.isPresent() && value.isPresent()) {
                        int a = address.getAsInt();
                        boolean on = value.get();
                        events.add(new TimelineEvent(when, "coil", t, standalone, position, c -> ((RelayModule) c
                                .instrument(t).orElseThrow()).setCoil(a, on)));
                    }
                }
            }
            case "fault" -> events.addAll(fault(r, t, when, standalone, position, what));
            default -> {
                r.allowOnly("at", "do", "target", "when", "note", "kind");
                Optional<FaultKind> kind = r.text("kind", false).flatMap(k -> faultKind(r, k, what));
                if (checkTarget(r, t, instruments.keySet(), "instrument", what)) {
                    events.add(new TimelineEvent(when, "clear-fault", t, standalone, position, c -> {
                        c.instrument(t).orElseThrow().clearFault(kind);
                        if (kind.isEmpty() || kind.get() == FaultKind.DISCONNECT) {
                            c.setPortDisconnected(t, false);
                        }
                    }));
                }
            }
        }
        absorb(r);
        return events;
    }

    private List<TimelineEvent> fault(SettingsReader r, String t, Duration when, boolean standalone,
            SourcePosition position, String what) {
        r.allowOnly("at", "do", "target", "when", "note", "kind", "amount", "delay", "channel", "for");
        Optional<FaultKind> kind = r.text("kind", true).flatMap(k -> faultKind(r, k, what));
        double amount = r.number("amount", false).orElse(0);
        Duration delay = r.duration("delay", Duration.ZERO, Duration.ofMinutes(5), false).orElse(Duration.ofSeconds(2));
        OptionalInt channel = r.integer("channel", 0, 65535, false);
        Optional<Duration> lasting = r.duration("for", Duration.ofSeconds(1), Duration.ofDays(7), false);
        List<TimelineEvent> events = new ArrayList<>();
        if (!checkTarget(r, t, instruments.keySet(), "instrument", what) || kind.isEmpty()) {
            return events;
        }
        FaultKind k = kind.get();
        InstrumentDef instrument = instruments.get(t);
        if (k == FaultKind.BAD_CRC && instrument.protocol() != Protocol.MODBUS_RTU) {
            r.problem(r.position("kind"), "kind bad-crc in " + what + " needs a Modbus instrument; '" + t
                    + "' speaks " + label(instrument.protocol()));
            return events;
        }
        if (k == FaultKind.WIRE_BREAK && !instrument.kind().equals("analog-input-module")) {
            r.problem(r.position("kind"), "kind wire-break in " + what + " needs an analog input module; '" + t
                    + "' is a " + instrument.kind());
            return events;
        }
        events.add(new TimelineEvent(when, "fault " + k.configName(), t, standalone, position, c -> {
            c.instrument(t).orElseThrow().startFault(new Fault(k, amount, delay, channel, c.now()));
            if (k == FaultKind.DISCONNECT) {
                c.setPortDisconnected(t, true);
            }
        }));
        lasting.ifPresent(d -> events.add(new TimelineEvent(when.plus(d), "clear-fault " + k.configName(), t,
                standalone, position, c -> {
                    c.instrument(t).orElseThrow().clearFault(Optional.of(k));
                    if (k == FaultKind.DISCONNECT) {
                        c.setPortDisconnected(t, false);
                    }
                })));
        return events;
    }

    private Optional<FaultKind> faultKind(SettingsReader r, String text, String what) {
        Optional<FaultKind> kind = FaultKind.fromConfig(text.strip());
        if (kind.isEmpty()) {
            List<String> names = java.util.Arrays.stream(FaultKind.values()).map(FaultKind::configName).toList();
            r.problem(r.position("kind"), "kind in " + what + " must be one of " + String.join(", ", names)
                    + ", got '" + text + "'" + NameMatch.closest(text.strip(), names).map(c -> "; did you mean '" + c
                    + "'?").orElse(""));
        }
        return kind;
    }

    private Optional<Duration> at(SettingsReader r, String text, String what) {
        Matcher clock = CLOCK.matcher(text.strip());
        if (clock.matches()) {
            long seconds = Long.parseLong(clock.group(1)) * 3600 + Long.parseLong(clock.group(2)) * 60
                    + (clock.group(3) == null ? 0 : Long.parseLong(clock.group(3)));
            return Optional.of(Duration.ofSeconds(seconds));
        }
        try {
            return Optional.of(DurationSyntax.parse(text));
        } catch (IllegalArgumentException e) {
            r.problem(r.position("at"), "at in " + what + " must be a time since the start as HH:MM or HH:MM:SS "
                    + "(e.g. 02:10) or a duration (e.g. 2h10min), got '" + text + "'");
            return Optional.empty();
        }
    }

    private boolean checkTarget(SettingsReader r, String target, java.util.Collection<String> known, String kind,
            String what) {
        if (known.contains(target)) {
            return true;
        }
        r.problem(r.position("target"), "target '" + target + "' of " + what + " is not " + (kind.startsWith("i") ? "an " : "a ") + kind
                + " of this scenario" + hint(target, known));
        return false;
    }

    // ---- helpers -----------------------------------------------------------------------------------------

    private SettingsReader reader(ConfigNode.Mapping item, String what) {
        return new SettingsReader(item, what);
    }

    private Optional<String> id(SettingsReader r, String kind) {
        Optional<String> id = r.text("id", true);
        if (id.isEmpty()) {
            return id;
        }
        String value = id.get().strip();
        if (!value.matches("[A-Za-z0-9][A-Za-z0-9._-]*")) {
            r.problem(r.position("id"), kind + " id '" + value + "' must be letters, digits, '.', '_' or '-'");
            return Optional.empty();
        }
        SourcePosition earlier = ids.putIfAbsent(kind + ":" + value, r.position("id"));
        if (earlier != null) {
            r.problem(r.position("id"), "duplicate " + kind + " id '" + value + "': already used at line "
                    + earlier.line() + ", column " + earlier.column());
            return Optional.empty();
        }
        return Optional.of(value);
    }

    private <T> Optional<T> ref(SettingsReader r, String key, Map<String, T> known, String kind, boolean required) {
        Optional<String> name = r.text(key, required);
        if (name.isEmpty()) {
            return Optional.empty();
        }
        T value = known.get(name.get().strip());
        if (value == null) {
            r.problem(r.position(key), kind + " '" + name.get() + "' is not defined" + hint(name.get(), known.keySet()));
        }
        return Optional.ofNullable(value);
    }

    private static String hint(String typed, java.util.Collection<String> known) {
        Optional<String> close = NameMatch.closest(typed.strip(), known);
        if (close.isPresent()) {
            return "; did you mean '" + close.get() + "'?";
        }
        return known.isEmpty() ? "" : "; known: " + String.join(", ", known);
    }

    private List<ConfigNode.Mapping> items(SettingsReader r, String key, boolean required) {
        Optional<ConfigNode.Sequence> list = r.sequence(key, required);
        List<ConfigNode.Mapping> result = new ArrayList<>();
        if (list.isEmpty()) {
            return result;
        }
        int n = 0;
        for (ConfigNode item : list.get().items()) {
            n++;
            if (item instanceof ConfigNode.Mapping mapping) {
                result.add(mapping);
            } else {
                problems.add(new ConfigProblem(item.position(), "entry " + n + " of '" + key + "' must be a mapping, got "
                        + item.kind()));
            }
        }
        return result;
    }

    /** A quantity converted to {@code target} (gauge pressures against the ambient pressure). */
    private OptionalDouble quantityIn(SettingsReader r, String key, Unit target, boolean required) {
        Optional<String> text = r.text(key, required);
        if (text.isEmpty()) {
            return OptionalDouble.empty();
        }
        try {
            Quantity quantity = Quantity.parse(text.get(), target.dimension());
            return OptionalDouble.of(quantity.in(target, ambient));
        } catch (IllegalArgumentException e) {
            r.problem(r.position(key), key + ": " + e.getMessage());
            return OptionalDouble.empty();
        }
    }

    /** A pressure difference (a cracking pressure, a noise figure) in {@code target}; gauge or not is the same. */
    private OptionalDouble differenceIn(SettingsReader r, String key, Unit target) {
        Optional<String> text = r.text(key, false);
        if (text.isEmpty()) {
            return OptionalDouble.empty();
        }
        try {
            Quantity quantity = Quantity.parse(text.get(), target.dimension());
            return OptionalDouble.of(quantity.unit().differenceTo(target, quantity.value()));
        } catch (IllegalArgumentException e) {
            r.problem(r.position(key), key + ": " + e.getMessage());
            return OptionalDouble.empty();
        }
    }

    private OptionalDouble seconds(SettingsReader r, String key) {
        return r.duration(key, Duration.ZERO, Duration.ofDays(7), false)
                .map(d -> OptionalDouble.of(d.toNanos() / 1e9)).orElse(OptionalDouble.empty());
    }

    private static Optional<Double> box(OptionalDouble value) {
        return value.isPresent() ? Optional.of(value.getAsDouble()) : Optional.empty();
    }

    private Optional<Instant> instant(SettingsReader r, String text) {
        try {
            return Optional.of(Instant.parse(text.strip()));
        } catch (DateTimeParseException e) {
            r.problem(r.position("start"), "start in 'scenario' must be a UTC time like 2025-11-14T22:00:00Z, got '"
                    + text + "'");
            return Optional.empty();
        }
    }

    private void absorb(SettingsReader... readers) {
        for (SettingsReader reader : readers) {
            problems.addAll(reader.problems());
        }
    }
}
