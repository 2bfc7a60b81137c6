package org.cryowarden.drivers.builtin;

import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.drivers.line.LinePattern;
import org.cryowarden.drivers.settings.SettingsReader;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.text.Terminator;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.PointDef;

/**
 * The settings of the two text drivers, read and checked in one pass:
 * <pre>
 * scpi  settings: {terminator: lf|crlf, timeout: 1s, error_queue: false}
 *       point:    {query: "MEAS:TEMP? A"}      output: {command: "OUTP {value}", readback: "OUTP?"}
 * line  settings: {mode: query|stream, terminator: lf|crlf, timeout: 1s, max_line: 256}
 *       point:    {query: "O2?", pattern: "O2=(?&lt;value&gt;[0-9.]+)"}   (no query in stream mode)
 * </pre>
 */
record TextConfig(Terminator terminator, Duration timeout, boolean stream, boolean errorQueue, int maxLine,
        Map<String, TextPoint> points) {

    static final Duration DEFAULT_TIMEOUT = Duration.ofSeconds(1);
    static final int DEFAULT_MAX_LINE = 256;

    record Parsed(Optional<TextConfig> config, List<ConfigProblem> problems) {
    }

    static Parsed readScpi(InstrumentDef instrument, DriverContext context) {
        List<ConfigProblem> problems = new ArrayList<>();
        SettingsReader settings = reader(instrument);
        settings.allowOnly("terminator", "timeout", "error_queue");
        Terminator terminator = terminator(settings);
        Duration timeout = timeout(settings);
        boolean errorQueue = settings.flag("error_queue", false).orElse(false);
        problems.addAll(settings.problems());
        Map<String, TextPoint> points = new LinkedHashMap<>();
        for (PointDef point : instrument.points()) {
            String where = where(point, instrument);
            SettingsReader reader = new SettingsReader(point.settings(), where);
            if (point.output()) {
                PointTargets.output(point, instrument, context, problems);
                reader.allowOnly("command", "readback");
                Optional<String> command = message(reader, "command", true, where);
                if (command.isPresent() && !command.get().contains("{value}")) {
                    reader.problem(reader.position("command"), "command in " + where
                            + " must contain {value} where the value goes, e.g. \"OUTP {value}\"");
                }
                Optional<String> readback = message(reader, "readback", false, where);
                problems.addAll(reader.problems());
                if (reader.problems().isEmpty()) {
                    points.put(point.channel(), new TextPoint(point.channel(), true, Optional.empty(),
                            Optional.empty(), command, readback));
                }
            } else {
                PointTargets.channel(point, instrument, context, problems);
                reader.allowOnly("query");
                Optional<String> query = message(reader, "query", true, where);
                if (query.isPresent() && !isQuery(query.get())) {
                    reader.problem(reader.position("query"), "query in " + where
                            + " must be a SCPI query (a header ending in '?', e.g. MEAS:TEMP? A), got '"
                            + query.get() + "'");
                }
                problems.addAll(reader.problems());
                if (reader.problems().isEmpty()) {
                    points.put(point.channel(), new TextPoint(point.channel(), false, query, Optional.empty(),
                            Optional.empty(), Optional.empty()));
                }
            }
        }
        return new Parsed(problems.isEmpty() ? Optional.of(new TextConfig(terminator, timeout, false, errorQueue,
                1024, points)) : Optional.empty(), problems);
    }

    static Parsed readLine(InstrumentDef instrument, DriverContext context) {
        List<ConfigProblem> problems = new ArrayList<>();
        SettingsReader settings = reader(instrument);
        settings.allowOnly("mode", "terminator", "timeout", "max_line");
        boolean stream = settings.choice("mode", Map.of("query", false, "stream", true), false).orElse(false);
        Terminator terminator = terminator(settings);
        Duration timeout = timeout(settings);
        int maxLine = settings.integer("max_line", 16, 4096, false).orElse(DEFAULT_MAX_LINE);
        problems.addAll(settings.problems());
        Map<String, TextPoint> points = new LinkedHashMap<>();
        for (PointDef point : instrument.points()) {
            String where = where(point, instrument);
            if (point.output()) {
                problems.add(new ConfigProblem(point.position(), "the line driver reads only; " + where
                        + " cannot be driven (use modbus-rtu or scpi for outputs)"));
                continue;
            }
            PointTargets.channel(point, instrument, context, problems);
            SettingsReader reader = new SettingsReader(point.settings(), where);
            reader.allowOnly("query", "pattern");
            Optional<String> query = message(reader, "query", !stream, where);
            if (stream && query.isPresent()) {
                reader.problem(reader.position("query"), "query in " + where
                        + " is not used in stream mode (the device prints lines by itself); remove it or set mode: query");
            }
            Optional<LinePattern> pattern = Optional.empty();
            Optional<String> regex = reader.text("pattern", true);
            if (regex.isPresent()) {
                LinePattern.Result compiled = LinePattern.compile(regex.get());
                if (compiled.pattern().isEmpty()) {
                    reader.problem(reader.position("pattern"), "pattern in " + where + " " + compiled.problem());
                }
                pattern = compiled.pattern();
            }
            problems.addAll(reader.problems());
            if (reader.problems().isEmpty()) {
                points.put(point.channel(), new TextPoint(point.channel(), false, stream ? Optional.empty() : query,
                        pattern, Optional.empty(), Optional.empty()));
            }
        }
        return new Parsed(problems.isEmpty() ? Optional.of(new TextConfig(terminator, timeout, stream, false, maxLine,
                points)) : Optional.empty(), problems);
    }

    /** True when the last program message unit's header ends in '?' ("MEAS:TEMP? A", "*IDN?"). */
    private static boolean isQuery(String message) {
        String[] units = message.strip().split(";");
        String last = units[units.length - 1].strip();
        return !last.isEmpty() && last.split("\\s+")[0].endsWith("?");
    }

    private static SettingsReader reader(InstrumentDef instrument) {
        return new SettingsReader(instrument.settings(), "settings of instrument '" + instrument.id() + "'");
    }

    private static Terminator terminator(SettingsReader settings) {
        return settings.choice("terminator", Map.of("lf", Terminator.LF, "crlf", Terminator.CRLF), false)
                .orElse(Terminator.LF);
    }

    private static Duration timeout(SettingsReader settings) {
        return settings.duration("timeout", Duration.ofMillis(10), Duration.ofSeconds(30), false)
                .orElse(DEFAULT_TIMEOUT);
    }

    private static String where(PointDef point, InstrumentDef instrument) {
        return (point.output() ? "output" : "channel") + " '" + point.channel() + "' of instrument '"
                + instrument.id() + "'";
    }

    private static Optional<String> message(SettingsReader reader, String key, boolean required, String where) {
        Optional<String> text = reader.text(key, required);
        if (text.isPresent() && (text.get().isBlank() || text.get().contains("\n") || text.get().contains("\r"))) {
            reader.problem(reader.position(key), key + " in " + where + " must be one line of text, got '"
                    + text.get().replace("\n", "\\n").replace("\r", "\\r") + "'");
            return Optional.empty();
        }
        return text;
    }
}
