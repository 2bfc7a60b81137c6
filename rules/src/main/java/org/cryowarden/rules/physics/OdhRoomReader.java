package org.cryowarden.rules.physics;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.Dimension;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.config.YamlReader;

/**
 * Reads an ODH room file. The room states its free volume and normal ventilation; each failure mode states
 * its rate per hour and either the oxygen fraction it leads to, a steady release of gas (rate, optional
 * duration, optional ventilation during the event) or an instantaneous spill of liquid. Oxygen minima come
 * from {@link OxygenDilution}; spilled liquid is expanded with {@link GasExpansion} at the room's air
 * conditions. A room with a ventilation rate and no {@code fan} is taken as exhausted, the more conservative of
 * the two fan solutions. Every problem in the file is reported at once with {@code FILE:LINE:COLUMN}.
 *
 * <pre>
 * room:
 *   name: Magnet test bay (invented)
 *   volume: 420 m3
 *   ventilation: 1.5 m3/s
 *   fan: exhaust              # supply | exhaust | none
 *   air_temperature: 20C      # default 20 °C
 *   air_pressure: 101.325kPa  # default 101.325 kPa
 * modes:
 *   - name: dewar loss of vacuum
 *     rate_per_h: 1.0e-6
 *     release_rate: 0.4 m3/s  # gas at room conditions
 *     duration: 10min         # omitted: the release goes on
 *     fan: none               # ventilation during this event, if not the room's
 *   - name: dropped dewar
 *     rate_per_h: 1.0e-5
 *     spill: 250 L
 *     fluid: helium
 *   - name: a figure from elsewhere
 *     rate_per_h: 1.0e-6
 *     oxygen: 17 %vol
 * </pre>
 */
public final class OdhRoomReader {

    private static final Set<String> TOP_KEYS = new LinkedHashSet<>(List.of("room", "modes", "notes"));
    private static final Set<String> ROOM_KEYS = new LinkedHashSet<>(
            List.of("name", "volume", "ventilation", "fan", "air_temperature", "air_pressure"));
    private static final Set<String> MODE_KEYS = new LinkedHashSet<>(List.of(
            "name", "rate_per_h", "source", "oxygen", "release_rate", "duration", "spill", "fluid", "fan",
            "ventilation"));

    private OdhRoomReader() {
    }

    public static OdhRoom read(Path file) throws ConfigException {
        return read(YamlReader.read(file));
    }

    /**
     * Interprets a room file's tree.
     *
     * @throws ConfigException with every problem found
     */
    public static OdhRoom read(ConfigNode root) throws ConfigException {
        NodeProblems problems = new NodeProblems();
        Optional<ConfigNode.Mapping> top = problems.mapping(root, "an ODH room file");
        if (top.isEmpty()) {
            problems.throwIfAny();
        }
        problems.allowOnly(top.get(), TOP_KEYS, "an ODH room file");
        Optional<ConfigNode.Mapping> room = problems.required(top.get(), "room", "an ODH room file")
                .flatMap(node -> problems.mapping(node, "room"));
        Optional<ConfigNode.Sequence> modeList = problems.required(top.get(), "modes", "an ODH room file")
                .flatMap(node -> problems.sequence(node, "modes"));
        problems.throwIfAny();

        ConfigNode.Mapping r = room.get();
        problems.allowOnly(r, ROOM_KEYS, "room");
        String name = problems.required(r, "name", "room").flatMap(n -> problems.text(n, "room name")).orElse("");
        double volume = problems.required(r, "volume", "room")
                .flatMap(n -> problems.quantity(n, Dimension.VOLUME, "room volume")).map(Quantity::toBase).orElse(1.0);
        if (volume <= 0) {
            problems.add(r.get("volume").get().position(), "room volume must be greater than 0 m3");
            volume = 1;
        }
        double ventilationRate = r.get("ventilation")
                .flatMap(n -> problems.quantity(n, Dimension.FLOW, "room ventilation")).map(Quantity::toBase).orElse(0.0);
        Ventilation fan = r.get("fan").flatMap(n -> fan(n, problems))
                .orElse(ventilationRate > 0 ? Ventilation.EXHAUST : Ventilation.NONE);
        if (fan == Ventilation.NONE && ventilationRate > 0) {
            problems.add(r.get("fan").get().position(), "fan none contradicts a ventilation of "
                    + RangeCheck.format(ventilationRate) + " m3/s; say supply or exhaust, or drop the ventilation");
        }
        double airKelvin = r.get("air_temperature")
                .flatMap(n -> problems.quantity(n, Dimension.TEMPERATURE, "air temperature"))
                .map(Quantity::toBase).orElse(293.15);
        double airPascal = r.get("air_pressure")
                .flatMap(n -> problems.quantity(n, Dimension.PRESSURE, "air pressure"))
                .map(Quantity::toBase).orElse(Quantity.STANDARD_ATMOSPHERE_PA);

        List<FailureMode> modes = new ArrayList<>();
        for (ConfigNode item : modeList.get().items()) {
            mode(item, volume, fan, ventilationRate, airKelvin, airPascal, problems).ifPresent(modes::add);
        }
        if (modeList.get().items().isEmpty()) {
            problems.add(modeList.get().position(), "modes is empty: an ODH assessment needs at least one failure mode");
        }
        problems.throwIfAny();
        return new OdhRoom(name, volume, fan, ventilationRate, modes);
    }

    private static Optional<FailureMode> mode(ConfigNode item, double volume, Ventilation roomFan, double roomRate,
            double airKelvin, double airPascal, NodeProblems problems) {
        Optional<ConfigNode.Mapping> maybe = problems.mapping(item, "a failure mode");
        if (maybe.isEmpty()) {
            return Optional.empty();
        }
        ConfigNode.Mapping m = maybe.get();
        problems.allowOnly(m, MODE_KEYS, "a failure mode");
        Optional<String> name = problems.required(m, "name", "a failure mode").flatMap(n -> problems.text(n, "mode name"));
        Optional<Double> rate = problems.required(m, "rate_per_h", "a failure mode")
                .flatMap(n -> problems.number(n, "rate_per_h"));
        if (rate.isPresent() && rate.get() < 0) {
            problems.add(m.get("rate_per_h").get().position(), "rate_per_h must not be negative, got " + rate.get());
            return Optional.empty();
        }
        int ways = (m.get("oxygen").isPresent() ? 1 : 0) + (m.get("release_rate").isPresent() ? 1 : 0)
                + (m.get("spill").isPresent() ? 1 : 0);
        if (ways != 1) {
            problems.add(m.position(), "a failure mode needs exactly one of oxygen, release_rate or spill, got " + ways);
            return Optional.empty();
        }
        Ventilation fan = m.get("fan").flatMap(n -> fan(n, problems)).orElse(roomFan);
        double q = m.get("ventilation").flatMap(n -> problems.quantity(n, Dimension.FLOW, "mode ventilation"))
                .map(Quantity::toBase).orElse(fan == Ventilation.NONE ? 0.0 : roomRate);
        if (fan == Ventilation.NONE) {
            q = 0;
        }
        Optional<Double> oxygen = Optional.empty();
        try {
            if (m.get("oxygen").isPresent()) {
                oxygen = problems.quantity(m.get("oxygen").get(), Dimension.GAS_FRACTION, "oxygen")
                        .map(quantity -> quantity.in(Unit.PERCENT_VOLUME) / 100);
            } else if (m.get("release_rate").isPresent()) {
                Optional<Double> r = problems.quantity(m.get("release_rate").get(), Dimension.FLOW, "release_rate")
                        .map(Quantity::toBase);
                double seconds = m.get("duration")
                        .flatMap(n -> problems.quantity(n, Dimension.TIME, "duration"))
                        .map(Quantity::toBase).orElse(Double.POSITIVE_INFINITY);
                if (r.isPresent()) {
                    oxygen = Optional.of(OxygenDilution.release(volume, r.get(), fan, q, seconds).minimumFraction());
                }
            } else {
                Optional<Double> liquid = problems.quantity(m.get("spill").get(), Dimension.VOLUME, "spill")
                        .map(Quantity::toBase);
                Optional<Cryogen> fluid = problems.required(m, "fluid", "a spill")
                        .flatMap(n -> problems.text(n, "fluid").flatMap(text -> {
                            Optional<Cryogen> known = Cryogen.byLabel(text);
                            if (known.isEmpty()) {
                                problems.add(n.position(), "unknown fluid '" + text + "'; expected helium or nitrogen");
                            }
                            return known;
                        }));
                if (liquid.isPresent() && fluid.isPresent()) {
                    double gas = GasExpansion.gasCubicMetres(fluid.get(), liquid.get(), airKelvin, airPascal);
                    oxygen = Optional.of(OxygenDilution.spill(volume, gas, fan, q).minimumFraction());
                }
            }
        } catch (OutOfRangeException e) {
            problems.add(m.position(), name.orElse("failure mode") + ": " + e.getMessage());
            return Optional.empty();
        }
        if (oxygen.isPresent() && (oxygen.get() < 0 || oxygen.get() > 1)) {
            problems.add(m.get("oxygen").get().position(), "oxygen must be between 0 %vol and 100 %vol");
            return Optional.empty();
        }
        if (name.isEmpty() || rate.isEmpty() || oxygen.isEmpty()) {
            return Optional.empty();
        }
        return Optional.of(new FailureMode(name.get(), rate.get(), oxygen.get()));
    }

    private static Optional<Ventilation> fan(ConfigNode node, NodeProblems problems) {
        return problems.text(node, "fan").flatMap(text -> {
            Optional<Ventilation> known = Ventilation.byLabel(text);
            if (known.isEmpty()) {
                problems.add(node.position(), "unknown fan '" + text + "'; expected supply, exhaust or none");
            }
            return known;
        });
    }
}
