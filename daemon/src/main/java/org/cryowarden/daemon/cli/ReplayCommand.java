package org.cryowarden.daemon.cli;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.cryowarden.daemon.history.CorruptBlockException;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.daemon.replay.AlarmAnalysis;
import org.cryowarden.daemon.replay.AlarmDifference;
import org.cryowarden.daemon.replay.AlarmStatistics;
import org.cryowarden.daemon.replay.AnalysisSettings;
import org.cryowarden.daemon.replay.FloodPeriod;
import org.cryowarden.daemon.replay.JournalHistory;
import org.cryowarden.daemon.replay.JournalReplay;
import org.cryowarden.daemon.replay.RateInterval;
import org.cryowarden.daemon.run.SiteSetup;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.config.Configuration;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code cryowarden replay --journal FILE [--site FILE] --rules FILE... [--since TIME] [--until TIME] [--json]}: runs
 * a journaled period again through the given rule set and shows what would have alarmed, and when, against what
 * did; with the nuisance-alarm measures of the replayed rules.
 */
@Command(
        name = "replay",
        description = {
            "Replay the raw history and operator commands of a journal through a rule set: alarms that would be new,",
            "gone or moved; per alarm activations, time active, chattering and fleeting; alarm rate and floods.",
            "Exit codes: 0 done, 2 bad arguments or files, 1 internal failure."
        },
        mixinStandardHelpOptions = true)
final class ReplayCommand implements Callable<Integer> {

    static final int BAD_INPUT = 2;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--journal", required = true, paramLabel = "FILE", description = "the daemon's journal")
    Path journalFile;

    @Option(names = "--site", paramLabel = "FILE",
            description = "the site file (default: the one the recorded run was started with)")
    Path site;

    @Option(names = "--rules", required = true, arity = "1..*", paramLabel = "FILE",
            description = "the rule sets to replay with")
    List<Path> rules = new ArrayList<>();

    @Option(names = "--since", paramLabel = "TIME", description = "start, UTC, e.g. 2025-01-15T22:00:00Z"
            + " (default: the start of the history; a replay from the middle of a run starts with every alarm normal)")
    String since;

    @Option(names = "--until", paramLabel = "TIME", description = "end, UTC (default: the end of the history)")
    String until;

    @Option(names = "--tick", paramLabel = "DURATION",
            description = "the engine's tick period (default: the one the recorded run journaled)")
    String tick;

    @Option(names = "--fleeting", paramLabel = "DURATION", defaultValue = "5s",
            description = "an activation shorter than this is fleeting (default: ${DEFAULT-VALUE})")
    String fleeting;

    @Option(names = "--json", description = "print one JSON object instead of the text report")
    boolean json;

    @Override
    public Integer call() throws Exception {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        Optional<Instant> from;
        Optional<Instant> to;
        Optional<Duration> tickPeriod;
        Duration fleetingBelow;
        try {
            from = TimeArgument.parse("--since", since);
            to = TimeArgument.parse("--until", until);
            tickPeriod = tick == null ? Optional.empty() : Optional.of(TimeArgument.duration("--tick", tick));
            fleetingBelow = TimeArgument.duration("--fleeting", fleeting);
        } catch (IllegalArgumentException e) {
            return fail(err, e.getMessage());
        }
        if (!Files.isRegularFile(journalFile)) {
            return fail(err, "no journal at " + journalFile + ": name the daemon's journal file (journal: path: in the"
                    + " site file)");
        }
        try (Journal journal = Journal.open(journalFile, JournalSettings.defaults())) {
            Path siteFile = site;
            if (siteFile == null) {
                Optional<String> recorded = new JournalHistory(journal).runAt(from.orElse(Instant.EPOCH))
                        .flatMap(JournalHistory.Run::siteFile);
                if (recorded.isEmpty() || !Files.isRegularFile(Path.of(recorded.get()))) {
                    return fail(err, "the journal names no site file that still exists"
                            + recorded.map(p -> " (it recorded " + p + ")").orElse("") + "; give one with --site");
                }
                siteFile = Path.of(recorded.get());
            }
            Configuration configuration;
            try {
                DriverCatalog catalog = DriverCatalog.discover(ReplayCommand.class.getClassLoader(), Optional.empty());
                configuration = SiteSetup.load(siteFile, rules, catalog, TimeSource.system());
            } catch (ConfigException e) {
                for (ConfigProblem problem : e.problems()) {
                    err.println(problem);
                }
                return fail(err, e.problems().size() + (e.problems().size() == 1 ? " error" : " errors")
                        + " in the site or rule files; nothing was replayed");
            }
            JournalReplay.Report report;
            try {
                report = JournalReplay.run(journal, configuration.site(), configuration.rules(),
                        new JournalReplay.Request(from, to, tickPeriod,
                                AnalysisSettings.defaults().withFleetingBelow(fleetingBelow)));
            } catch (IllegalArgumentException | CorruptBlockException e) {
                return fail(err, e.getMessage());
            }
            if (json) {
                ObjectMapper mapper = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);
                out.println(mapper.writeValueAsString(json(report, journalFile, rules)));
            } else {
                text(out, report, journalFile, rules);
            }
            out.flush();
            return 0;
        } catch (JournalException e) {
            return fail(err, e.getMessage());
        }
    }

    private static int fail(PrintWriter err, String message) {
        err.println("replay: " + message);
        err.flush();
        return BAD_INPUT;
    }

    static void text(PrintWriter out, JournalReplay.Report r, Path journal, List<Path> rules) {
        long readings = r.result().readings();
        out.printf(Locale.ROOT, "replay of %s from %s to %s (%s), tick %s, rules %s%n", journal, r.from(), r.until(),
                DurationSyntax.format(Duration.between(r.from(), r.until())), DurationSyntax.format(r.tick()),
                String.join(" ", rules.stream().map(Path::toString).toList()));
        out.printf(Locale.ROOT, "%d readings, %d operator commands, %d ticks in %.2f s (%.0f readings/s)%n", readings,
                r.recordedActions(), r.result().ticks(), seconds(r.elapsed()),
                readings / Math.max(1e-9, seconds(r.elapsed())));
        out.println();
        out.println("ALARMS: RECORDED AGAINST REPLAYED");
        if (r.identical()) {
            out.printf(Locale.ROOT, "  identical: the replay reproduces all %d recorded alarm transitions, in order"
                    + " and at the same instants%n", r.recorded().size());
        } else if (r.comparison().identical()) {
            out.printf(Locale.ROOT, "  every activation starts as recorded (%d); the transitions after them differ"
                    + " (%d recorded, %d replayed)%n", r.comparison().unchanged(), r.recorded().size(),
                    r.replayed().size());
        }
        for (AlarmDifference d : r.comparison().differences()) {
            out.printf(Locale.ROOT, "  %-6s %-32s recorded %-22s replayed %-22s %s%n",
                    d.kind().name().toLowerCase(Locale.ROOT), d.alarmId(),
                    d.recordedStart().map(Instant::toString).orElse("-"),
                    d.replayedStart().map(Instant::toString).orElse("-"),
                    d.shift().map(ReplayCommand::signed).orElse(""));
        }
        if (!r.comparison().identical()) {
            out.printf(Locale.ROOT, "  %d activations start as recorded%n", r.comparison().unchanged());
        }
        out.println();
        AlarmAnalysis a = r.analysis();
        out.println("PER ALARM (replayed rules; fleeting below " + DurationSyntax.format(a.settings().fleetingBelow())
                + ", chattering: " + a.settings().chatterCount() + " activations within "
                + DurationSyntax.format(a.settings().chatterWindow()) + ")");
        if (a.alarms().isEmpty()) {
            out.println("  no alarm was active");
        } else {
            out.printf(Locale.ROOT, "  %-32s %-8s %11s %9s %14s %10s %8s%n", "ALARM", "PRIORITY", "ACTIVATIONS",
                    "RECORDED", "TIME ACTIVE", "CHATTERING", "FLEETING");
            for (AlarmStatistics s : a.alarms()) {
                int recorded = r.recordedAnalysis().alarm(s.alarmId()).map(AlarmStatistics::activationCount).orElse(0);
                out.printf(Locale.ROOT, "  %-32s %-8s %11d %9d %14s %10s %8d%n", s.alarmId(), s.priority().word(),
                        s.activationCount(), recorded, DurationSyntax.format(s.totalActive().withNanos(0)),
                        s.chattering() ? "yes" : "no", s.fleeting());
            }
        }
        out.println();
        int peak = a.rate().stream().mapToInt(RateInterval::activations).max().orElse(0);
        double mean = a.rate().stream().mapToInt(RateInterval::activations).average().orElse(0);
        out.printf(Locale.ROOT, "ALARM RATE per %s: mean %.2f, peak %d%s%n",
                DurationSyntax.format(a.settings().rateInterval()), mean, peak, peak == 0 ? "" : " (" + a.rate()
                        .stream().filter(i -> i.activations() == peak).findFirst().orElseThrow().start() + ")");
        for (RateInterval interval : a.rate()) {
            if (interval.activations() > 0) {
                out.printf(Locale.ROOT, "  %s  %3d %s%n", interval.start(), interval.activations(),
                        "#".repeat(Math.min(60, interval.activations())));
            }
        }
        if (a.floods().isEmpty()) {
            out.println("FLOODS (more than " + a.settings().floodAbove() + " in "
                    + DurationSyntax.format(a.settings().rateInterval()) + "): none");
        } else {
            out.println("FLOODS (more than " + a.settings().floodAbove() + " in "
                    + DurationSyntax.format(a.settings().rateInterval()) + "):");
            for (FloodPeriod flood : a.floods()) {
                out.printf(Locale.ROOT, "  %s to %s: %d activations%n", flood.start(), flood.end(),
                        flood.activations());
            }
        }
        if (!r.result().refusals().isEmpty()) {
            out.println();
            out.println("OPERATOR COMMANDS THE REPLAYED RULES REFUSED");
            r.result().refusals().forEach(line -> out.println("  " + line));
        }
    }

    static ObjectNode json(JournalReplay.Report r, Path journal, List<Path> rules) {
        ObjectMapper mapper = new ObjectMapper();
        ObjectNode root = mapper.createObjectNode();
        root.put("journal", journal.toString());
        ArrayNode ruleFiles = root.putArray("rules");
        rules.forEach(p -> ruleFiles.add(p.toString()));
        root.put("from", r.from().toString());
        root.put("until", r.until().toString());
        root.put("tick", r.tick().toString());
        root.put("readings", r.result().readings());
        root.put("operator_commands", r.recordedActions());
        root.put("replay_seconds", seconds(r.elapsed()));
        root.put("identical", r.identical());
        root.put("recorded_transitions", r.recorded().size());
        root.put("replayed_transitions", r.replayed().size());
        root.put("unchanged_activations", r.comparison().unchanged());
        ArrayNode differences = root.putArray("differences");
        for (AlarmDifference d : r.comparison().differences()) {
            ObjectNode node = differences.addObject();
            node.put("kind", d.kind().name().toLowerCase(Locale.ROOT));
            node.put("alarm", d.alarmId());
            d.recordedStart().ifPresent(i -> node.put("recorded_start", i.toString()));
            d.replayedStart().ifPresent(i -> node.put("replayed_start", i.toString()));
            d.shift().ifPresent(s -> node.put("shift_seconds", s.toNanos() / 1e9));
        }
        AlarmAnalysis a = r.analysis();
        ArrayNode alarms = root.putArray("alarms");
        for (AlarmStatistics s : a.alarms()) {
            ObjectNode node = alarms.addObject();
            node.put("alarm", s.alarmId());
            node.put("priority", s.priority().word());
            node.put("activations", s.activationCount());
            node.put("recorded_activations",
                    r.recordedAnalysis().alarm(s.alarmId()).map(AlarmStatistics::activationCount).orElse(0));
            node.put("active_seconds", s.totalActive().toNanos() / 1e9);
            node.put("chattering", s.chattering());
            node.put("fleeting", s.fleeting());
        }
        ArrayNode rate = root.putArray("rate");
        for (RateInterval interval : a.rate()) {
            ObjectNode node = rate.addObject();
            node.put("start", interval.start().toString());
            node.put("activations", interval.activations());
        }
        ArrayNode floods = root.putArray("floods");
        for (FloodPeriod flood : a.floods()) {
            ObjectNode node = floods.addObject();
            node.put("start", flood.start().toString());
            node.put("end", flood.end().toString());
            node.put("activations", flood.activations());
        }
        ArrayNode refusals = root.putArray("refused_commands");
        r.result().refusals().forEach(refusals::add);
        return root;
    }

    private static double seconds(Duration duration) {
        return duration.toNanos() / 1e9;
    }

    private static String signed(Duration shift) {
        return (shift.isNegative() ? "-" : "+") + DurationSyntax.format(shift.abs());
    }
}
