package org.cryowarden.drivers.builtin;

import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalDouble;
import org.cryowarden.drivers.analog.CurrentLoop;
import org.cryowarden.drivers.modbus.ModbusTable;
import org.cryowarden.drivers.modbus.RegisterType;
import org.cryowarden.drivers.modbus.WordOrder;
import org.cryowarden.drivers.settings.SettingsReader;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.PointDef;

/**
 * The {@code modbus-rtu} settings, read and checked in one pass:
 * <pre>
 * settings: {unit: 1-247, timeout: 500ms, retries: 0-5}
 * point:    {table: coil|discrete|holding|input, address: 0-65535, type: uint16|int16|uint32|int32|float32,
 *            word_order: big|little, scale: 1, offset: 0, current_loop: {range: [low, high]}}
 * </pre>
 */
record ModbusRtuConfig(int unit, Duration timeout, int retries, Map<String, ModbusPoint> points) {

    static final Duration DEFAULT_TIMEOUT = Duration.ofMillis(500);

    record Parsed(Optional<ModbusRtuConfig> config, List<ConfigProblem> problems) {
    }

    static Parsed read(InstrumentDef instrument, DriverContext context) {
        List<ConfigProblem> problems = new ArrayList<>();
        SettingsReader settings = new SettingsReader(instrument.settings(),
                "settings of instrument '" + instrument.id() + "'");
        settings.allowOnly("unit", "timeout", "retries");
        int unit = settings.integer("unit", 1, 247, true).orElse(1);
        Duration timeout = settings.duration("timeout", Duration.ofMillis(10), Duration.ofSeconds(10), false)
                .orElse(DEFAULT_TIMEOUT);
        int retries = settings.integer("retries", 0, 5, false).orElse(0);
        problems.addAll(settings.problems());
        Map<String, ModbusPoint> points = new LinkedHashMap<>();
        for (PointDef point : instrument.points()) {
            readPoint(point, instrument, context, problems).ifPresent(p -> points.put(p.id(), p));
        }
        return new Parsed(problems.isEmpty() ? Optional.of(new ModbusRtuConfig(unit, timeout, retries, points))
                : Optional.empty(), problems);
    }

    private static Optional<ModbusPoint> readPoint(PointDef point, InstrumentDef instrument, DriverContext context,
            List<ConfigProblem> problems) {
        String where = (point.output() ? "output" : "channel") + " '" + point.channel() + "' of instrument '"
                + instrument.id() + "'";
        if (point.output()) {
            PointTargets.output(point, instrument, context, problems);
        } else {
            PointTargets.channel(point, instrument, context, problems);
        }
        SettingsReader reader = new SettingsReader(point.settings(), where);
        reader.allowOnly("table", "address", "type", "word_order", "scale", "offset", "current_loop");
        Map<String, ModbusTable> tables = new LinkedHashMap<>();
        for (ModbusTable table : ModbusTable.values()) {
            tables.put(table.configName(), table);
        }
        Optional<ModbusTable> table = reader.choice("table", tables, true);
        int address = reader.integer("address", 0, 65535, true).orElse(0);
        Map<String, RegisterType> types = new LinkedHashMap<>();
        for (RegisterType type : RegisterType.values()) {
            types.put(type.configName(), type);
        }
        RegisterType type = reader.choice("type", types, false).orElse(RegisterType.UINT16);
        WordOrder order = reader.choice("word_order", Map.of("big", WordOrder.BIG, "little", WordOrder.LITTLE), false)
                .orElse(WordOrder.BIG);
        double scale = reader.number("scale", false).orElse(1.0);
        double offset = reader.number("offset", false).orElse(0.0);
        if (reader.has("scale") && scale == 0.0) {
            reader.problem(reader.position("scale"), "scale in " + where + " must not be 0");
        }
        Optional<CurrentLoop> loop = readLoop(reader, where);
        if (table.isPresent()) {
            ModbusTable t = table.get();
            if (t.holdsBits()) {
                for (String key : List.of("type", "word_order", "scale", "offset", "current_loop")) {
                    if (reader.has(key)) {
                        reader.problem(reader.position(key), key + " in " + where + " does not apply to a "
                                + t.configName() + " (a single bit)");
                    }
                }
            }
            if (point.output() && !t.writable()) {
                reader.problem(reader.position("table"), "output " + where.substring(where.indexOf('\''))
                        + " must use table coil or holding; " + t.configName() + " is read-only");
            }
            if (point.output() && loop.isPresent()) {
                reader.problem(reader.position("current_loop"), "current_loop in " + where
                        + " applies to inputs only");
            }
            if (!t.holdsBits() && address + type.registers() > 65536) {
                reader.problem(reader.position("address"), "a " + type.configName() + " at address " + address
                        + " in " + where + " runs past register 65535");
            }
        }
        if (type.registers() == 1 && reader.has("word_order")) {
            reader.problem(reader.position("word_order"), "word_order in " + where + " applies to 32-bit types only, "
                    + "not " + type.configName());
        }
        problems.addAll(reader.problems());
        if (table.isEmpty() || !reader.problems().isEmpty()) {
            return Optional.empty();
        }
        return Optional.of(new ModbusPoint(point.channel(), point.output(), table.get(), address, type, order,
                scale, offset, loop));
    }

    private static Optional<CurrentLoop> readLoop(SettingsReader reader, String where) {
        Optional<ConfigNode.Mapping> loop = reader.mapping("current_loop", false);
        if (loop.isEmpty()) {
            return Optional.empty();
        }
        SettingsReader loopReader = new SettingsReader(loop.get(), "current_loop of " + where);
        loopReader.allowOnly("range");
        Optional<ConfigNode.Sequence> range = loopReader.sequence("range", true);
        Optional<CurrentLoop> result = Optional.empty();
        if (range.isPresent()) {
            List<ConfigNode> items = range.get().items();
            if (items.size() != 2) {
                loopReader.problem(range.get().position(), "range in current_loop of " + where
                        + " must be [value at 4 mA, value at 20 mA], got " + items.size() + " values");
            } else {
                OptionalDouble low = loopReader.number("range", items.get(0));
                OptionalDouble high = loopReader.number("range", items.get(1));
                if (low.isPresent() && high.isPresent()) {
                    if (low.getAsDouble() == high.getAsDouble()) {
                        loopReader.problem(range.get().position(), "range in current_loop of " + where
                                + " needs two different values, got [" + low.getAsDouble() + ", "
                                + high.getAsDouble() + "]");
                    } else {
                        result = Optional.of(new CurrentLoop(low.getAsDouble(), high.getAsDouble()));
                    }
                }
            }
        }
        for (ConfigProblem problem : loopReader.problems()) {
            reader.problem(problem.position(), problem.message());
        }
        return result;
    }
}
