package org.cryowarden.rules.physics;

import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.config.ConfigNode;

/**
 * Reads calibration tables from the two forms cryowarden accepts, reporting every problem with
 * {@code FILE:LINE:COLUMN}:
 * <ul>
 *   <li>CSV: one {@code raw,value} pair per line; blank lines and lines starting with {@code #} are ignored,
 *       and a first line that is not numeric is taken as a header;</li>
 *   <li>YAML (already read into a {@link ConfigNode}): {@code interpolation: monotone-cubic | log-log},
 *       {@code raw_unit}, {@code value_unit} and {@code points: [[raw, value], ...]}.</li>
 * </ul>
 */
public final class CalibrationTableReader {

    private static final Set<String> YAML_KEYS = new LinkedHashSet<>(
            List.of("interpolation", "raw_unit", "value_unit", "points", "description"));

    private CalibrationTableReader() {
    }

    /**
     * Parses CSV text named {@code label} in messages.
     *
     * @throws ConfigException with every bad line, repeated raw value or too-short table
     */
    public static CalibrationTable readCsv(String text, String label, Interpolation interpolation, Unit rawUnit,
            Unit valueUnit) throws ConfigException {
        NodeProblems problems = new NodeProblems();
        List<CalibrationPoint> points = new ArrayList<>();
        String[] lines = text.split("\r?\n", -1);
        boolean seenData = false;
        for (int i = 0; i < lines.length; i++) {
            String line = lines[i].strip();
            if (line.isEmpty() || line.startsWith("#")) {
                continue;
            }
            SourcePosition position = new SourcePosition(label, i + 1, 1);
            String[] fields = line.split("[,;\\t]");
            Optional<CalibrationPoint> point = fields.length == 2 ? parsePair(fields[0], fields[1]) : Optional.empty();
            if (point.isEmpty()) {
                if (!seenData && points.isEmpty() && fields.length == 2) {
                    seenData = true;
                    continue;
                }
                problems.add(position, "expected 'raw,value' with two numbers, got '" + line + "'");
                continue;
            }
            seenData = true;
            points.add(point.get());
        }
        return build(points, interpolation, rawUnit, valueUnit, new SourcePosition(label, 0, 0), problems);
    }

    /**
     * Interprets a YAML calibration table.
     *
     * @throws ConfigException with every problem found
     */
    public static CalibrationTable readYaml(ConfigNode root) throws ConfigException {
        NodeProblems problems = new NodeProblems();
        Optional<ConfigNode.Mapping> mapping = problems.mapping(root, "a calibration table");
        if (mapping.isEmpty()) {
            problems.throwIfAny();
        }
        ConfigNode.Mapping table = mapping.get();
        problems.allowOnly(table, YAML_KEYS, "a calibration table");
        Interpolation interpolation = Interpolation.MONOTONE_CUBIC;
        Optional<ConfigNode> interpolationNode = table.get("interpolation");
        if (interpolationNode.isPresent()) {
            Optional<String> name = problems.text(interpolationNode.get(), "interpolation");
            if (name.isPresent()) {
                Optional<Interpolation> known = Interpolation.byLabel(name.get());
                if (known.isEmpty()) {
                    problems.add(interpolationNode.get().position(), "unknown interpolation '" + name.get()
                            + "'; expected monotone-cubic or log-log");
                } else {
                    interpolation = known.get();
                }
            }
        }
        Unit rawUnit = unit(table, "raw_unit", problems);
        Unit valueUnit = unit(table, "value_unit", problems);
        List<CalibrationPoint> points = new ArrayList<>();
        Optional<ConfigNode> pointsNode = problems.required(table, "points", "a calibration table");
        if (pointsNode.isPresent()) {
            Optional<ConfigNode.Sequence> rows = problems.sequence(pointsNode.get(), "points");
            for (ConfigNode row : rows.map(ConfigNode.Sequence::items).orElse(List.of())) {
                if (row instanceof ConfigNode.Sequence pair && pair.items().size() == 2) {
                    Optional<Double> raw = problems.number(pair.items().get(0), "raw value");
                    Optional<Double> value = problems.number(pair.items().get(1), "calibrated value");
                    if (raw.isPresent() && value.isPresent()) {
                        points.add(new CalibrationPoint(raw.get(), value.get()));
                    }
                } else {
                    problems.add(row.position(), "a calibration point must be a pair [raw, value], got " + row.kind());
                }
            }
        }
        return build(points, interpolation, rawUnit, valueUnit, table.position(), problems);
    }

    private static Unit unit(ConfigNode.Mapping table, String key, NodeProblems problems) {
        Optional<ConfigNode> node = table.get(key);
        if (node.isEmpty()) {
            return Unit.ONE;
        }
        Optional<String> symbol = problems.text(node.get(), key);
        if (symbol.isEmpty()) {
            return Unit.ONE;
        }
        Optional<Unit> unit = Unit.bySymbol(symbol.get());
        if (unit.isEmpty()) {
            problems.add(node.get().position(), "unknown unit '" + symbol.get() + "' for " + key);
            return Unit.ONE;
        }
        return unit.get();
    }

    private static CalibrationTable build(List<CalibrationPoint> points, Interpolation interpolation, Unit rawUnit,
            Unit valueUnit, SourcePosition where, NodeProblems problems) throws ConfigException {
        problems.throwIfAny();
        try {
            return new CalibrationTable(points, interpolation, rawUnit, valueUnit);
        } catch (IllegalArgumentException e) {
            problems.add(where, e.getMessage());
            problems.throwIfAny();
            throw e;
        }
    }

    private static Optional<CalibrationPoint> parsePair(String raw, String value) {
        try {
            double r = Double.parseDouble(raw.strip());
            double v = Double.parseDouble(value.strip());
            if (Double.isFinite(r) && Double.isFinite(v)) {
                return Optional.of(new CalibrationPoint(r, v));
            }
        } catch (NumberFormatException e) {
            // not a data line
        }
        return Optional.empty();
    }
}
